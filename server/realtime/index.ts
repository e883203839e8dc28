import type { Server as HttpServer, IncomingMessage, ServerResponse } from 'node:http';
import { Server, type Socket } from 'socket.io';
import { createAdapter } from '@socket.io/postgres-adapter';
import type { RequestHandler } from 'express';
import type pg from 'pg';
import { eq } from 'drizzle-orm';
import type { SessionUser } from '../auth/passport.ts';
import type { AppContext } from '../context.ts';
import { walkthroughs, users } from '../db/schema.ts';
import { roleAtLeast, type Role } from '../../shared/model/roles.ts';
import { normalizeDocument } from '../../shared/model/sketch.ts';
import {
  clientMessageSchema,
  MAX_REPLAY_EDITS,
  PING_INTERVAL_MS,
  PING_TIMEOUT_MS,
  PEOPLE_REFRESH_MS,
  PROTOCOL_VERSION,
  type ClientMessage,
  type ClientToServerEvents,
  type Person,
  type ServerMessage,
  type ServerToClientEvents,
  type WalkthroughState,
} from '../../shared/protocol/messages.ts';
import { editsSince } from './editLog.ts';
import { ACCESS_RECHECK_MS, ACCESS_SWEEP_MS, checkSockets, judge, matches, type AccessFilter, type GuardedSocket, type RoomAccess, type Verdict } from './access.ts';
import { checkAccess, findSketchState, roleInSketchTeam } from './repository.ts';
import { originMatches, requestHost, type TrustFn } from '../http/forwarded.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';

interface SocketData {
  user: SessionUser;
  /** Sketches this connection has joined: team, role and when the role was last checked. */
  rooms: Map<string, RoomAccess>;
  /** Presence card per joined sketch (role may differ per team). */
  people: Record<string, Person>;
}
/** Between server instances (through the adapter): re-check the sockets an access change concerns. */
interface InterServerEvents {
  accessChanged: (filter: AccessFilter) => void;
}
type IoServer = Server<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;
type IoSocket = Socket<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;

/**
 * Per-socket state that must never leave this process (socket.data travels to other instances
 * in fetchSockets answers): the session id it was opened with and its message lane.
 */
interface Private {
  sessionId: string;
  /** Messages and access re-checks of one socket run one at a time, in order. */
  lane: Promise<void>;
}

/** Messages that get a fresh database check; the frequent others reuse one younger than ACCESS_RECHECK_MS. */
const CHECKED_NOW = new Set<ClientMessage['type']>(['resync', 'walkthroughStart', 'walkthroughStop', 'walkthroughHandOver']);
type EngineMiddleware = (req: IncomingMessage & { _query?: Record<string, string> }, res: ServerResponse, next: (err?: unknown) => void) => void;

const room = (sketchId: string) => `sketch:${sketchId}`;

/** Eight colours that stay distinct on the canvas background; a person keeps theirs everywhere. */
const PERSON_COLOURS = ['#e4572e', '#17bebb', '#ffc914', '#a855f7', '#76b041', '#f472b6', '#3b82f6', '#f97316'];
export function personColour(userId: string): string {
  let h = 0;
  for (const c of userId) h = (h * 31 + c.charCodeAt(0)) >>> 0;
  return itemAt(PERSON_COLOURS, h % PERSON_COLOURS.length);
}

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

export interface RealtimeOptions {
  /** Pool for the cross-instance adapter; without it rooms live in this process only. */
  adapterPool?: pg.Pool;
  /** The app's compiled TRUST_PROXY rule (`app.get('trust proxy fn')`); default: trust no proxy. */
  trustProxy?: TrustFn;
}

/**
 * socket.io on the HTTP server: the collaboration channel of the sketch editor.
 *
 * The handshake reuses the Express session and passport: a socket without a signed-in user is
 * refused with 401 before any event is handled, and a handshake from another site's page (Origin
 * mismatch) with 403 — WebSockets are not covered by CORS. Rooms span server processes through
 * @socket.io/postgres-adapter; edit order across processes comes from the row lock taken in
 * applyEditBatch. Each connection's messages are handled one at a time, in arrival order.
 */
export function attachRealtime(httpServer: HttpServer, session: RequestHandler, passportMiddleware: RequestHandler[], ctx: AppContext, options: RealtimeOptions = {}): IoServer {
  const io: IoServer = new Server(httpServer, {
    serveClient: false,
    maxHttpBufferSize: 1e6,
    pingInterval: PING_INTERVAL_MS,
    pingTimeout: PING_TIMEOUT_MS,
    connectionStateRecovery: undefined,
  });
  if (options.adapterPool) {
    io.adapter(createAdapter(options.adapterPool, { errorHandler: (err) => ctx.log(`[realtime] adapter: ${err.message}`), heartbeatInterval: 1000, heartbeatTimeout: 4000 }));
  }

  // WebSockets are not covered by CORS: a handshake from another site's page is refused. Behind a
  // proxy the expected host is the one REST uses (X-Forwarded-Host from a trusted proxy only).
  const trust: TrustFn = options.trustProxy ?? (() => false);
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

  const send = (target: { emit: IoSocket['emit'] } | ReturnType<IoServer['to']>, msg: ServerMessage): void => {
    target.emit('message', msg);
  };

  async function peopleIn(sketchId: string): Promise<Person[]> {
    const sockets = await io.in(room(sketchId)).fetchSockets();
    return sockets.map((s) => s.data.people?.[sketchId]).filter((p): p is Person => Boolean(p));
  }

  async function broadcastPeople(sketchId: string): Promise<void> {
    try {
      send(io.to(room(sketchId)), { type: 'people', sketchId, people: await peopleIn(sketchId) });
    } catch (err) {
      ctx.log(`[realtime] people list for ${sketchId}: ${(err as Error).message}`);
    }
  }

  async function walkthroughState(sketchId: string): Promise<WalkthroughState> {
    const rows = await ctx.db
      .select({ leadUserId: walkthroughs.leadUserId, leadName: users.name, startedAt: walkthroughs.startedAt })
      .from(walkthroughs)
      .innerJoin(users, eq(users.id, walkthroughs.leadUserId))
      .where(eq(walkthroughs.sketchId, sketchId));
    const row = rows[0];
    return row ? { leadUserId: row.leadUserId, leadName: row.leadName, startedAt: row.startedAt.toISOString() } : null;
  }

  async function setWalkthrough(sketchId: string, leadUserId: string | null): Promise<void> {
    if (leadUserId) {
      await ctx.db
        .insert(walkthroughs)
        .values({ sketchId, leadUserId })
        .onConflictDoUpdate({ target: walkthroughs.sketchId, set: { leadUserId, startedAt: new Date() } });
    } else {
      await ctx.db.delete(walkthroughs).where(eq(walkthroughs.sketchId, sketchId));
    }
    send(io.to(room(sketchId)), { type: 'walkthrough', sketchId, state: await walkthroughState(sketchId) });
  }

  /** When the lead's last connection leaves a sketch, the walkthrough ends. */
  async function endWalkthroughIfLeadGone(sketchId: string, userId: string): Promise<void> {
    const state = await walkthroughState(sketchId);
    if (!state || state.leadUserId !== userId) return;
    const stillHere = (await peopleIn(sketchId)).some((p) => p.userId === userId);
    if (!stillHere) await setWalkthrough(sketchId, null);
  }

  // Edits saved outside the socket channel (REST) reach every editor of the sketch.
  ctx.events.on('sketchEdited', (sketchId, edit) => send(io.to(room(sketchId)), { type: 'edit', sketchId, ...edit }));
  // Pins, snapshots, status: clients refetch what the notice names.
  ctx.events.on('sketchNotice', (sketchId, topic) => send(io.to(room(sketchId)), { type: 'notice', sketchId, topic }));

  // ── Access: a session owns its channel; membership and role are checked when things happen ──
  const privates = new WeakMap<IoSocket, Private>();
  const guarded = (socket: IoSocket): GuardedSocket => ({ userId: socket.data.user.id, sessionId: privates.get(socket)!.sessionId, rooms: socket.data.rooms });

  /** Runs `task` in the socket's lane (after the messages before it); errors are logged. */
  function inLane(socket: IoSocket, what: string, task: () => Promise<void>): Promise<void> {
    const p = privates.get(socket)!;
    const next = p.lane.then(task).catch((err) => ctx.log(`[realtime] ${what} failed: ${(err as Error).message}`));
    p.lane = next;
    return next;
  }

  /** The session ended (signed out, password reset, expired): tell the client, then hang up. */
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
    await broadcastPeople(sketchId);
    await endWalkthroughIfLeadGone(sketchId, socket.data.user.id);
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
      await broadcastPeople(sketchId);
    }
    return verdict.role;
  }

  /** The role this socket holds in `sketchId` now (null: it was evicted or signed out). */
  async function roleNow(socket: IoSocket, sketchId: string, fresh: boolean): Promise<Role | null> {
    const access = socket.data.rooms.get(sketchId);
    if (!access) return null;
    if (!fresh && performance.now() - access.checkedAt < ACCESS_RECHECK_MS) return access.role;
    const result = firstItem(await checkAccess(ctx.db, [{ sessionId: privates.get(socket)!.sessionId, userId: socket.data.user.id, sketchId }]));
    return apply(socket, sketchId, judge(result, access));
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
        return inLane(socket, 'access re-check', async () => {
          if (!verdict.sessionLive) return endSession(socket);
          for (const [sketchId, v] of verdict.rooms) await apply(socket, sketchId, v);
        });
      }),
    );
  }

  // Services announce access changes; every instance re-checks its own sockets.
  ctx.events.on('accessChanged', (filter) => {
    io.serverSideEmit('accessChanged', filter);
    void recheckLocal(filter).catch((err) => ctx.log(`[realtime] access re-check failed: ${(err as Error).message}`));
  });
  io.on('accessChanged', (filter) => {
    void recheckLocal(filter).catch((err) => ctx.log(`[realtime] access re-check failed: ${(err as Error).message}`));
  });
  // The sweep heals an announcement missed while the adapter was away, and expired sessions.
  const sweep = setInterval(() => {
    void recheckLocal({}).catch((err) => ctx.log(`[realtime] access sweep failed: ${(err as Error).message}`));
  }, ACCESS_SWEEP_MS);
  sweep.unref();

  async function handle(socket: IoSocket, msg: ClientMessage): Promise<void> {
    const user = socket.data.user;
    const fail = (code: string, reason: string): void => send(socket, { type: 'error', code, reason, about: msg.type });
    if (msg.type !== 'join' && !socket.data.rooms.has(msg.sketchId)) return fail('not_joined', 'Join the sketch before sending to it.');
    // Membership and role at the time of the message, not of the join [A2].
    if (msg.type !== 'join' && msg.type !== 'leave' && !(await roleNow(socket, msg.sketchId, CHECKED_NOW.has(msg.type)))) return;

    switch (msg.type) {
      case 'join': {
        if (msg.protocol !== PROTOCOL_VERSION) return fail('protocol_mismatch', `This page speaks protocol ${msg.protocol}, the server ${PROTOCOL_VERSION}: reload the page.`);
        const access = firstItem(await checkAccess(ctx.db, [{ sessionId: privates.get(socket)!.sessionId, userId: user.id, sketchId: msg.sketchId }]));
        if (!access.sessionLive) return endSession(socket);
        const row = access.role ? await findSketchState(ctx.db, msg.sketchId) : null;
        const role = access.role;
        if (!row || !role) return fail('not_found', 'No such sketch, or you are not a member of its team.');
        const you: Person = { connectionId: socket.id, userId: user.id, name: user.name, role, colour: personColour(user.id) };
        socket.data.rooms.set(msg.sketchId, { teamId: row.teamId, role, checkedAt: performance.now() });
        socket.data.people[msg.sketchId] = you;
        await socket.join(room(msg.sketchId));
        const people = await peopleIn(msg.sketchId);
        const walkthrough = await walkthroughState(msg.sketchId);
        const replay = msg.lastRevision === undefined ? null : await editsSince(ctx.db, msg.sketchId, msg.lastRevision, row.revision, MAX_REPLAY_EDITS);
        send(socket, { type: 'joined', sketchId: msg.sketchId, title: row.title, document: normalizeDocument(row.document), revision: row.revision, people, walkthrough, you });
        // A rejoining client keeps its own state and gets what it missed: the edits when the
        // log bridges the gap, else the whole state.
        if (msg.lastRevision !== undefined) {
          if (replay) send(socket, { type: 'replay', sketchId: msg.sketchId, edits: replay, revision: row.revision });
          else send(socket, { type: 'snapshot', sketchId: msg.sketchId, title: row.title, document: normalizeDocument(row.document), revision: row.revision });
        }
        send(socket.to(room(msg.sketchId)), { type: 'people', sketchId: msg.sketchId, people });
        return;
      }
      case 'leave': {
        await socket.leave(room(msg.sketchId));
        socket.data.rooms.delete(msg.sketchId);
        delete socket.data.people[msg.sketchId];
        await broadcastPeople(msg.sketchId);
        await endWalkthroughIfLeadGone(msg.sketchId, user.id);
        return;
      }
      case 'edit': {
        const outcome = await ctx.edits.submit({ sketchId: msg.sketchId, userId: user.id, baseRevision: msg.baseRevision, op: msg.op });
        if (outcome.status === 'rejected') {
          send(socket, { type: 'ack', sketchId: msg.sketchId, opId: msg.op.opId, status: 'rejected', reason: outcome.reason });
          return;
        }
        send(socket, { type: 'ack', sketchId: msg.sketchId, opId: msg.op.opId, status: outcome.status, revision: outcome.revision, op: outcome.op });
        if (!outcome.duplicate) {
          send(socket.to(room(msg.sketchId)), { type: 'edit', sketchId: msg.sketchId, revision: outcome.revision, op: outcome.op, userId: user.id });
        }
        return;
      }
      case 'resync': {
        const row = await findSketchState(ctx.db, msg.sketchId);
        if (!row) return fail('not_found', 'This sketch no longer exists.');
        const replay = msg.lastRevision === undefined ? null : await editsSince(ctx.db, msg.sketchId, msg.lastRevision, row.revision, MAX_REPLAY_EDITS);
        if (replay) send(socket, { type: 'replay', sketchId: msg.sketchId, edits: replay, revision: row.revision });
        else send(socket, { type: 'snapshot', sketchId: msg.sketchId, title: row.title, document: normalizeDocument(row.document), revision: row.revision });
        return;
      }
      case 'presence': {
        // Volatile: dropped rather than queued when a peer is slow [R4].
        socket.to(room(msg.sketchId)).volatile.emit('message', {
          type: 'presence',
          sketchId: msg.sketchId,
          connectionId: socket.id,
          userId: user.id,
          cursor: msg.cursor,
          selection: msg.selection,
        });
        return;
      }
      case 'walkthroughStart': {
        const role = await currentRole(msg.sketchId, user.id);
        if (!roleAtLeast(role, 'editor')) return fail('forbidden', 'Leading a walkthrough needs the editor role or higher.');
        const state = await walkthroughState(msg.sketchId);
        if (state && state.leadUserId !== user.id && (await peopleIn(msg.sketchId)).some((p) => p.userId === state.leadUserId)) {
          return fail('walkthrough_running', `${state.leadName} is leading a walkthrough; ask them to hand over.`);
        }
        await setWalkthrough(msg.sketchId, user.id);
        return;
      }
      case 'walkthroughStop': {
        const state = await walkthroughState(msg.sketchId);
        if (!state) return;
        if (state.leadUserId !== user.id && !roleAtLeast(await currentRole(msg.sketchId, user.id), 'owner')) {
          return fail('forbidden', 'Only the lead (or a team owner) can end the walkthrough.');
        }
        await setWalkthrough(msg.sketchId, null);
        return;
      }
      case 'walkthroughHandOver': {
        const state = await walkthroughState(msg.sketchId);
        if (!state || state.leadUserId !== user.id) return fail('forbidden', 'Only the lead can hand the walkthrough over.');
        const target = (await peopleIn(msg.sketchId)).find((p) => p.userId === msg.toUserId);
        if (!target) return fail('not_present', 'That person is not in this sketch right now.');
        if (!roleAtLeast(await currentRole(msg.sketchId, target.userId), 'editor')) return fail('forbidden', `${target.name} needs the editor role or higher to lead.`);
        await setWalkthrough(msg.sketchId, target.userId);
        return;
      }
      case 'walkthroughView': {
        const state = await walkthroughState(msg.sketchId);
        if (!state || state.leadUserId !== user.id) return fail('forbidden', 'Only the lead steers the walkthrough.');
        socket.to(room(msg.sketchId)).volatile.emit('message', { type: 'walkthroughView', sketchId: msg.sketchId, view: msg.view, highlight: msg.highlight, leadUserId: user.id });
        return;
      }
    }
  }

  const currentRole = (sketchId: string, userId: string): Promise<Role | null> => roleInSketchTeam(ctx.db, userId, sketchId);

  // Heal people lists: a join seen before two instances discovered each other, or a broadcast
  // lost with a crashed instance, is corrected within PEOPLE_REFRESH_MS.
  const refresh = setInterval(() => {
    for (const name of io.of('/').adapter.rooms.keys()) {
      if (name.startsWith('sketch:')) void broadcastPeople(name.slice('sketch:'.length));
    }
  }, PEOPLE_REFRESH_MS);
  refresh.unref();
  const closeIo = io.close.bind(io);
  io.close = (fn) => {
    clearInterval(refresh);
    clearInterval(sweep);
    return closeIo(fn);
  };

  io.on('connection', (socket: IoSocket) => {
    socket.data.user = (socket.request as IncomingMessage & { user?: SessionUser }).user!;
    socket.data.rooms = new Map();
    socket.data.people = {};
    const own: Private = { sessionId: (socket.request as IncomingMessage & { sessionID?: string }).sessionID ?? '', lane: Promise.resolve() };
    privates.set(socket, own);

    socket.on('message', (raw: unknown) => {
      const parsed = clientMessageSchema.safeParse(raw);
      if (!parsed.success) {
        const issue = itemAt(parsed.error.issues, 0);
        send(socket, { type: 'error', code: 'invalid_message', reason: `The message was refused: ${issue.path.join('.') || 'message'} ${issue.message}.`, about: (raw as { type?: string })?.type });
        return;
      }
      own.lane = own.lane
        .then(() => handle(socket, parsed.data))
        .catch((err) => {
          ctx.log(`[realtime] ${parsed.data.type} failed: ${(err as Error).stack ?? err}`);
          if (parsed.data.type === 'edit') {
            // Not acked: the client keeps the op pending and re-sends it (same id) after a resync.
            send(socket, { type: 'error', code: 'internal', reason: 'The server could not process that edit; it will be retried.', about: 'edit' });
          } else {
            send(socket, { type: 'error', code: 'internal', reason: 'The server could not process that message.', about: parsed.data.type });
          }
        });
    });

    socket.on('disconnect', () => {
      const left = [...socket.data.rooms.keys()];
      void own.lane.then(async () => {
        for (const sketchId of left) {
          await broadcastPeople(sketchId);
          await endWalkthroughIfLeadGone(sketchId, socket.data.user.id).catch(() => {});
        }
      });
    });
  });
  return io;
}
