import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';

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
    log(`[error] ${req.method} ${req.originalUrl}: ${(err as Error)?.stack ?? String(err)}`);
    res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server; it has been logged.' } });
  };
}
