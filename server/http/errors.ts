import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { isDatabaseUnavailable, sqlState, violatedConstraint } from '../db/errors.ts';
import { errorForLog } from '../log.ts';

/** An error meant for the client: status, a stable machine code and a human sentence. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

/** Formats zod issues as one sentence that names each bad field: "title: must not be empty". */
export function describeZodError(error: ZodError): string {
  return error.issues
    .slice(0, 5)
    .map((issue) => {
      const path = issue.path.length ? formatPath(issue.path) : 'body';
      return `${path}: ${issue.message}`;
    })
    .join('; ');
}

export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const part of path) {
    if (typeof part === 'number') out += `[${part}]`;
    else out += out ? `.${String(part)}` : String(part);
  }
  return out;
}

export const notFoundApi: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'not_found', `No API route for ${req.method} ${req.originalUrl.split('?')[0]}.`));
};

/**
 * The one error middleware. Known errors become `{ error: { code, message } }`; anything else is
 * logged with its stack and answered with a generic 500 so no internals reach the client.
 */
export function errorMiddleware(log: (msg: string) => void): ErrorRequestHandler {
  return (err, req, res, _next) => {
    if (res.headersSent) return;
    if (err instanceof HttpError) {
      const retry = (err.details as { retryAfterSeconds?: unknown } | undefined)?.retryAfterSeconds;
      if (err.status === 429 && typeof retry === 'number') res.setHeader('Retry-After', String(retry));
      res.status(err.status).json({ error: { code: err.code, message: err.message, ...(err.details ? { details: err.details } : {}) } });
      return;
    }
    if (err instanceof ZodError) {
      res.status(400).json({ error: { code: 'invalid_input', message: describeZodError(err) } });
      return;
    }
    // body-parser errors carry a status and a type.
    const e = err as { status?: number; type?: string; message?: string };
    if (e?.type === 'entity.parse.failed') {
      res.status(400).json({ error: { code: 'bad_json', message: 'The request body is not valid JSON.' } });
      return;
    }
    if (e?.type === 'entity.too.large') {
      res.status(413).json({ error: { code: 'payload_too_large', message: 'The request body is too large.' } });
      return;
    }
    if (typeof e?.status === 'number' && e.status >= 400 && e.status < 500) {
      res.status(e.status).json({ error: { code: 'bad_request', message: e.message ?? 'Bad request.' } });
      return;
    }
    // The database went away (restart, failover, dropped connection): an expected state with a
    // clear answer; the pool reconnects by itself.
    if (isDatabaseUnavailable(err)) {
      res.setHeader('Retry-After', '5');
      res.status(503).json({ error: { code: 'database_unavailable', message: 'The database (PostgreSQL) is not reachable right now. Try again in a few seconds.' } });
      return;
    }
    const refusal = databaseRefusal(err);
    if (refusal) {
      res.status(refusal.status).json({ error: { code: refusal.code, message: refusal.message } });
      return;
    }
    log(`[error] ${req.method} ${req.path}: ${errorForLog(err)}`);
    res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server; it has been logged.' } });
  };
}

/** Unique constraints a person can run into, and the field each one is about. */
const CONSTRAINT_FIELDS: Record<string, { field: string; message: string }> = {
  users_email_unique: { field: 'email', message: 'an account with this address already exists' },
};

/**
 * The database refused a value the edge should already have refused (the net under the
 * validation): a clear 4xx naming what is wrong instead of a 500. Null for anything else.
 */
export function databaseRefusal(err: unknown): { status: number; code: string; message: string } | null {
  const state = sqlState(err);
  if (!state) return null;
  if (state === '23505') {
    const known = CONSTRAINT_FIELDS[violatedConstraint(err) ?? ''];
    return known
      ? { status: 409, code: `${known.field}_taken`, message: `${known.field}: ${known.message}.` }
      : { status: 409, code: 'conflict', message: 'This conflicts with something saved at the same moment; reload and try again.' };
  }
  if (state === '23503') return { status: 409, code: 'conflict', message: 'This refers to something that was removed at the same moment; reload and try again.' };
  if (state === '40001' || state === '40P01') return { status: 409, code: 'retry', message: 'Another change to the same data happened at the same moment; try again.' };
  if (state.startsWith('22') || state === '54001') return { status: 400, code: 'invalid_input', message: 'The request contains a value that cannot be stored (for example a NUL character or an unpaired surrogate).' };
  return null;
}
