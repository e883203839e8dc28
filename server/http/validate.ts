import type { z } from 'zod';
import { HttpError, describeZodError } from './errors.ts';

/**
 * Parses `value` with `schema`; on failure throws a 400 whose message names every bad field
 * ("email: must be an e-mail address"). `where` says which part of the request it was.
 */
export function parseOr400<S extends z.ZodType>(schema: S, value: unknown, where: 'body' | 'query' | 'params' = 'body'): z.infer<S> {
  const result = schema.safeParse(value ?? {});
  if (!result.success) {
    throw new HttpError(400, 'invalid_input', `Invalid ${where}: ${describeZodError(result.error)}.`);
  }
  return result.data;
}
