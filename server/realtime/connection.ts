import type { IncomingMessage, ServerResponse } from 'node:http';
import type { RequestHandler } from 'express';
import type { SessionUser } from '../auth/passport.ts';
import type { Role } from '../../shared/model/roles.ts';
import { originMatches, requestHost, type TrustFn } from '../http/forwarded.ts';
import { ACCESS_RECHECK_MS, ACCESS_SWEEP_MS, checkSockets, judge, matches, type AccessFilter, type GuardedSocket, type Verdict } from './access.ts';
import { checkAccess, type AccessResult } from './repository.ts';
import { logged, room, send, type Hub, type IoServer, type IoSocket } from './hub.ts';

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
 * The handshake reuses the Express session and passport: a socket without a signed-in user is
 * refused with 401 before any event is handled, and a handshake from another site's page (Origin
 * mismatch) with 403 — WebSockets are not covered by CORS. Behind a proxy the expected host is
 * the one REST uses (X-Forwarded-Host from a trusted proxy only).
 */
export function guardHandshake(io: IoServer, session: RequestHandler, passportMiddleware: RequestHandler[], trust: TrustFn): void {
  io.engine.use(((req, res, next) => {
    if (req._query?.sid === undefined && !originMatches(req.headers.origin, requestHost(req, trust))) {
      return refuse(res, 403, 'csrf', 'Connection refused: it came from another site.');
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
}

/**
 * Per-socket state that must never leave this process (socket.data travels to other instances
 * in fetchSockets answers): the session id it was opened with and its message lane.
 */
interface Private {
  sessionId: string;
  /** Messages and access re-checks of one socket run one at a time, in order. */
  lane: Promise<void>;
}

/** What the access guard tells the rest when a socket leaves a sketch or its role changes. */
export interface AccessHooks {
  /** The socket was taken out of the sketch's room (removed from the team, sketch deleted). */
  left(socket: IoSocket, sketchId: string): void;
  /** Someone's role in the sketch changed (the people list shows roles). */
  roleChanged(sketchId: string): void;
}

export interface AccessGuard {
  /** A new connection: remembers its session (in this process only) and opens its lane. */
  register(socket: IoSocket): void;
  /** The session the socket was opened with (kept in this process only). */
  sessionOf(socket: IoSocket): string;
  /** Runs `task` in the socket's lane (after the messages before it). */
  inLane(socket: IoSocket, task: () => Promise<void>): Promise<void>;
  /** The session ended (signed out, password reset, expired): tell the client, then hang up. */
  endSession(socket: IoSocket): void;
  /** Session and role for a sketch the socket wants to join, from the database now. */
  checkJoin(socket: IoSocket, sketchId: string): Promise<AccessResult>;
  /** The role this socket holds in `sketchId` now (null: it was evicted or signed out). */
  roleNow(socket: IoSocket, sketchId: string, fresh: boolean): Promise<Role | null>;
  stop(): void;
}

/**
 * A session owns its channel; membership and role are checked when things happen [A1]–[A4]:
 * on messages (`roleNow`), when a service announces a change (`accessChanged`, relayed to every
 * instance), and in a periodic sweep of all this instance's sockets.
 */
export function createAccessGuard(hub: Hub, hooks: AccessHooks): AccessGuard {
  const { io, ctx } = hub;
  const privates = new WeakMap<IoSocket, Private>();
  const guarded = (socket: IoSocket): GuardedSocket => ({ userId: socket.data.user.id, sessionId: privates.get(socket)!.sessionId, rooms: socket.data.rooms });

  function inLane(socket: IoSocket, task: () => Promise<void>): Promise<void> {
    const p = privates.get(socket)!;
    const next = p.lane.then(task);
    p.lane = next.catch(() => {});
    return next;
  }

  function endSession(socket: IoSocket): void {
    send(socket, { type: 'error', code: 'signed_out', reason: 'Your session has ended (signed out, or the password was changed). Sign in again to continue.' });
    socket.disconnect(true);
  }

  /** The socket may no longer see `sketchId`: out of the room at once, then tell it why. */
  async function evict(socket: IoSocket, sketchId: string, reason: string): Promise<void> {
    if (!socket.data.rooms.has(sketchId)) return;
    socket.data.rooms.delete(sketchId);
    delete socket.data.people[sketchId];
    await socket.leave(room(sketchId));
    send(socket, { type: 'access', sketchId, role: null, reason });
    hooks.left(socket, sketchId);
  }

  /** Applies a verdict for one joined sketch; returns the role the socket may use, or null. */
  async function apply(socket: IoSocket, sketchId: string, verdict: Verdict): Promise<Role | null> {
    if (verdict.kind === 'signedOut') {
      endSession(socket);
      return null;
    }
    if (verdict.kind === 'removed') {
      await evict(socket, sketchId, verdict.reason);
      return null;
    }
    const access = socket.data.rooms.get(sketchId);
    if (!access) return null;
    access.checkedAt = performance.now();
    if (verdict.changed) {
      access.role = verdict.role;
      const person = socket.data.people[sketchId];
      if (person) socket.data.people[sketchId] = { ...person, role: verdict.role };
      send(socket, { type: 'access', sketchId, role: verdict.role, reason: `Your role in this team is now ${verdict.role}.` });
      hooks.roleChanged(sketchId);
    }
    return verdict.role;
  }

  /** Re-checks this instance's sockets that match `filter` (all of them for the sweep). */
  async function recheckLocal(filter: AccessFilter): Promise<void> {
    const sockets = [...io.of('/').sockets.values()].filter((s) => privates.has(s) && matches(guarded(s), filter));
    if (sockets.length === 0) return;
    const bySocket = new Map(sockets.map((s) => [guarded(s), s] as const));
    const verdicts = await checkSockets(ctx.db, [...bySocket.keys()], filter.sketchId ? (id) => id === filter.sketchId : undefined);
    await Promise.all(
      [...verdicts].map(([g, verdict]) => {
        const socket = bySocket.get(g)!;
        return inLane(socket, async () => {
          if (!verdict.sessionLive) return endSession(socket);
          for (const [sketchId, v] of verdict.rooms) await apply(socket, sketchId, v);
        }).catch(logged(hub, 'access re-check failed'));
      }),
    );
  }

  // Services announce access changes; every instance re-checks its own sockets.
  const onAccessChanged = (filter: AccessFilter) => {
    io.serverSideEmit('accessChanged', filter);
    void recheckLocal(filter).catch(logged(hub, 'access re-check failed'));
  };
  ctx.events.on('accessChanged', onAccessChanged);
  io.on('accessChanged', (filter) => {
    void recheckLocal(filter).catch(logged(hub, 'access re-check failed'));
  });
  // The sweep heals an announcement missed while the adapter was away, and expired sessions.
  const sweep = setInterval(() => {
    void recheckLocal({}).catch(logged(hub, 'access sweep failed'));
  }, ACCESS_SWEEP_MS);
  sweep.unref();

  return {
    register(socket) {
      privates.set(socket, { sessionId: (socket.request as IncomingMessage & { sessionID?: string }).sessionID ?? '', lane: Promise.resolve() });
    },
    sessionOf: (socket) => privates.get(socket)?.sessionId ?? '',
    inLane,
    endSession,
    async checkJoin(socket, sketchId) {
      const [result] = await checkAccess(ctx.db, [{ sessionId: privates.get(socket)!.sessionId, userId: socket.data.user.id, sketchId }]);
      return result!;
    },
    async roleNow(socket, sketchId, fresh) {
      const access = socket.data.rooms.get(sketchId);
      if (!access) return null;
      if (!fresh && performance.now() - access.checkedAt < ACCESS_RECHECK_MS) return access.role;
      const [result] = await checkAccess(ctx.db, [{ sessionId: privates.get(socket)!.sessionId, userId: socket.data.user.id, sketchId }]);
      return apply(socket, sketchId, judge(result!, access));
    },
    stop() {
      clearInterval(sweep);
      ctx.events.off('accessChanged', onAccessChanged);
    },
  };
}
