import type { Server as HttpServer, IncomingMessage, ServerResponse } from 'node:http';
import { Server } from 'socket.io';
import type { RequestHandler } from 'express';
import type { SessionUser } from '../auth/passport.ts';

type EngineMiddleware = (req: IncomingMessage & { _query?: Record<string, string> }, res: ServerResponse, next: (err?: unknown) => void) => void;

/** Runs an Express middleware on the socket.io handshake request only (not every poll). */
function onHandshake(middleware: RequestHandler): EngineMiddleware {
  return (req, res, next) => {
    if (req._query?.sid === undefined) (middleware as unknown as EngineMiddleware)(req, res, next);
    else next();
  };
}

function refuse(res: ServerResponse, status: number, code: string, message: string): void {
  res.writeHead(status, { 'content-type': 'application/json' });
  res.end(JSON.stringify({ error: { code, message } }));
}

/**
 * socket.io on the HTTP server. The handshake reuses the Express session and passport: a socket
 * without a signed-in user is refused with 401 before any event is handled, and a handshake from
 * another site's page (Origin mismatch) is refused with 403 — WebSockets are not covered by CORS.
 */
export function attachRealtime(httpServer: HttpServer, session: RequestHandler, passportMiddleware: RequestHandler[]): Server {
  const io = new Server(httpServer, { serveClient: false, maxHttpBufferSize: 1e6 });
  io.engine.use(((req, res, next) => {
    const origin = req.headers.origin;
    if (origin && req._query?.sid === undefined) {
      let host = '';
      try {
        host = new URL(origin).host;
      } catch {
        host = '';
      }
      if (host !== req.headers.host) return refuse(res, 403, 'csrf', 'Connection refused: it came from another site.');
    }
    next();
  }) as EngineMiddleware);
  io.engine.use(onHandshake(session));
  for (const mw of passportMiddleware) io.engine.use(onHandshake(mw));
  io.engine.use(((req, res, next) => {
    if (req._query?.sid !== undefined) return next();
    if (!(req as IncomingMessage & { user?: SessionUser }).user) return refuse(res, 401, 'signed_out', 'Sign in to connect.');
    next();
  }) as EngineMiddleware);
  io.on('connection', (socket) => {
    const user = (socket.request as IncomingMessage & { user?: SessionUser }).user!;
    socket.data.user = user;
  });
  return io;
}
