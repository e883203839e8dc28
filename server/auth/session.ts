import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type { Database } from '../db/client.ts';
import type { RequestHandler } from 'express';

export const SESSION_COOKIE = 'sw.sid';
export const SESSION_MAX_AGE_MS = 14 * 24 * 60 * 60 * 1000;

export interface SessionSetup {
  middleware: RequestHandler;
  /** Stops the store's expired-session pruning timer. */
  close(): void;
}

/**
 * express-session stored in PostgreSQL (the `session` table declared in db/schema.ts). The
 * cookie is HttpOnly and SameSite=Lax; `secure: 'auto'` marks it Secure whenever the request
 * arrived over TLS (directly or via a trusted proxy). The same middleware authenticates the
 * socket.io handshake.
 */
export function createSession(pool: Database['pool'], secret: string): SessionSetup {
  const PgStore = connectPgSimple(session);
  const store = new PgStore({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 });
  const middleware = session({
    name: SESSION_COOKIE,
    secret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: SESSION_MAX_AGE_MS },
  });
  return { middleware, close: () => store.close() };
}
