import type { Server as HttpServer, IncomingMessage } from 'node:http';
import { Server } from 'socket.io';
import { createAdapter } from '@socket.io/postgres-adapter';
import type { RequestHandler } from 'express';
import type { Database } from '../db/client.ts';
import type { SessionUser } from '../auth/passport.ts';
import type { AppContext } from '../context.ts';
import { normalizeDocument } from '../../shared/model/sketch.ts';
import { firstItem } from '../../shared/util/invariant.ts';
import { clientMessageSchema, PING_INTERVAL_MS, PING_TIMEOUT_MS, PROTOCOL_VERSION, type ClientMessage, type Person } from '../../shared/protocol/messages.ts';
import type { TrustFn } from '../http/forwarded.ts';
import { findSketchState } from './repository.ts';
import { logged, room, send, type Hub, type IoServer, type IoSocket } from './hub.ts';
import { createAccessGuard, guardHandshake } from './connection.ts';
import { createPresence, personColour } from './presence.ts';
import { createEditChannel } from './edits.ts';
import { createWalkthroughs } from './walkthrough.ts';
import { createTeamWatch } from './teamWatch.ts';
import { errorForLog } from '../log.ts';

/** Messages that get a fresh database check; the frequent others reuse one younger than ACCESS_RECHECK_MS. */
const CHECKED_NOW = new Set<ClientMessage['type']>(['resync', 'walkthroughStart', 'walkthroughStop', 'walkthroughHandOver']);

export interface RealtimeOptions {
  /** Pool for the cross-instance adapter; without it rooms live in this process only. */
  adapterPool?: Database['pool'];
  /** The app's compiled TRUST_PROXY rule (`app.get('trust proxy fn')`); default: trust no proxy. */
  trustProxy?: TrustFn;
  /** Tests only (FAULT_DIE_AFTER_COMMIT): die right after committing an edit whose op id starts with this. */
  dieAfterCommit?: string;
  /** Tests only (FAULT_JOIN_PAUSE_MS): a join's pause between its first check and the room [A5]. */
  joinPauseMs?: number;
}

/**
 * socket.io on the HTTP server: the collaboration channel of the sketch editor, put together
 * from its parts — the handshake and the access guard (`connection.ts`), who is in each sketch
 * (`presence.ts`), the document's edits (`edits.ts`) and walkthroughs (`walkthrough.ts`).
 * Rooms span server processes through @socket.io/postgres-adapter; edit order across processes
 * comes from the row lock the edit log takes. Each connection's messages are handled one at a
 * time, in arrival order (its lane).
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
    io.adapter(createAdapter(options.adapterPool, { errorHandler: (err) => ctx.log(`[realtime] adapter: ${errorForLog(err, false)}`), heartbeatInterval: 1000, heartbeatTimeout: 4000 }));
  }
  guardHandshake(io, session, passportMiddleware, options.trustProxy ?? (() => false));

  const hub: Hub = { io, ctx };
  const presence = createPresence(hub);
  const walkthroughs = createWalkthroughs(hub, presence);
  const edits = createEditChannel(hub, { dieAfterCommit: options.dieAfterCommit });
  /** Someone left a sketch (left, evicted, disconnected): the lists follow, a leaving lead's walkthrough ends. */
  const leftSketch = (sketchId: string, userId: string) => {
    presence.broadcastPeople(sketchId);
    void walkthroughs.endIfLeadGone(sketchId, userId).catch(logged(hub, 'walkthrough end'));
  };
  const access = createAccessGuard(hub, {
    left: (socket, sketchId) => leftSketch(sketchId, socket.data.user.id),
    roleChanged: (sketchId) => presence.broadcastPeople(sketchId),
  });
  const teamWatch = createTeamWatch(hub, access);

  async function join(socket: IoSocket, msg: Extract<ClientMessage, { type: 'join' }>, fail: (code: string, reason: string) => void): Promise<void> {
    const user = socket.data.user;
    if (msg.protocol !== PROTOCOL_VERSION) return fail('protocol_mismatch', `This page speaks protocol ${msg.protocol}, the server ${PROTOCOL_VERSION}: reload the page.`);
    const checked = await access.checkJoin(socket, msg.sketchId);
    if (!checked.sessionLive) return access.endSession(socket);
    const row = checked.role ? await findSketchState(ctx.db, msg.sketchId) : null;
    const role = checked.role;
    if (!row || !role) return fail('not_found', 'No such sketch, or you are not a member of its team.');
    const document = normalizeDocument(row.document);
    // A stored result behind the document (its instance died before solving): solve it now [E1].
    if (row.resultRevision === null || row.resultRevision < row.revision) ctx.edits.solveLater(msg.sketchId, row.revision, document);
    if (options.joinPauseMs) await new Promise((r) => setTimeout(r, options.joinPauseMs));
    const you: Person = { connectionId: socket.id, userId: user.id, name: user.name, role, colour: personColour(user.id) };
    socket.data.rooms.set(msg.sketchId, { teamId: row.teamId, role, checkedAt: performance.now() });
    socket.data.people[msg.sketchId] = you;
    await socket.join(room(msg.sketchId));
    // Checked once more now that the socket is in the room [A5]: a removal committed while the
    // first check ran is seen here (and evicts at once), and one committed later finds the socket
    // in the room when its re-check runs. Before, such a join stayed in the room until the sweep.
    if (!(await access.roleNow(socket, msg.sketchId, true))) return;
    const me = socket.data.people[msg.sketchId] ?? you;
    const walkthrough = await walkthroughs.state(msg.sketchId);
    send(socket, { type: 'joined', sketchId: msg.sketchId, title: row.title, document, revision: row.revision, people: presence.quickPeople(msg.sketchId), walkthrough, you: me });
    // A rejoining client keeps its own state and gets what it missed.
    if (msg.lastRevision !== undefined) await edits.catchUp(socket, msg.sketchId, msg.lastRevision, row);
    // Everyone (the joiner too) gets the full list once every instance has answered [E3].
    presence.broadcastPeople(msg.sketchId);
  }

  async function handle(socket: IoSocket, msg: ClientMessage): Promise<void> {
    const fail = (code: string, reason: string): void => send(socket, { type: 'error', code, reason, about: msg.type });
    if (msg.type === 'join') return join(socket, msg, fail);
    if (msg.type === 'watchTeam' || msg.type === 'unwatchTeam') return teamWatch.handle(socket, msg, fail);
    if (!socket.data.rooms.has(msg.sketchId)) return fail('not_joined', 'Join the sketch before sending to it.');
    if (msg.type === 'leave') {
      await socket.leave(room(msg.sketchId));
      socket.data.rooms.delete(msg.sketchId);
      delete socket.data.people[msg.sketchId];
      return leftSketch(msg.sketchId, socket.data.user.id);
    }
    // Membership and role at the time of the message, not of the join [A2].
    if (!(await access.roleNow(socket, msg.sketchId, CHECKED_NOW.has(msg.type)))) return;
    switch (msg.type) {
      case 'edit': {
        await edits.edit(socket, msg);
        // The home tables of the sketch's team show its title, section, editor and time [T2].
        const teamId = socket.data.rooms.get(msg.sketchId)?.teamId;
        if (teamId) teamWatch.changed(teamId);
        return;
      }
      case 'resync': {
        const row = await findSketchState(ctx.db, msg.sketchId);
        if (!row) return fail('not_found', 'This sketch no longer exists.');
        return edits.catchUp(socket, msg.sketchId, msg.lastRevision, row);
      }
      case 'presence':
        return presence.relay(socket, msg.sketchId, msg.cursor, msg.selection);
      default:
        return walkthroughs.handle(socket, msg, fail);
    }
  }

  const closeIo = io.close.bind(io);
  io.close = (fn) => {
    edits.stop();
    presence.stop();
    access.stop();
    teamWatch.stop();
    return closeIo(fn);
  };

  io.on('connection', (socket: IoSocket) => {
    socket.data.user = (socket.request as IncomingMessage & { user?: SessionUser }).user!;
    socket.data.rooms = new Map();
    socket.data.people = {};
    socket.data.teams = new Map();
    access.register(socket);
    void teamWatch.register(socket).catch(logged(hub, 'person room'));

    socket.on('message', (raw: unknown) => {
      const parsed = clientMessageSchema.safeParse(raw);
      if (!parsed.success) {
        const issue = firstItem(parsed.error.issues); // a failed parse has at least one issue
        send(socket, { type: 'error', code: 'invalid_message', reason: `The message was refused: ${issue.path.join('.') || 'message'} ${issue.message}.`, about: (raw as { type?: string })?.type });
        return;
      }
      void access.inLane(socket, () => handle(socket, parsed.data)).catch((err) => {
        ctx.log(`[realtime] ${parsed.data.type} failed: ${errorForLog(err)}`);
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
      void access.inLane(socket, async () => {
        for (const sketchId of left) leftSketch(sketchId, socket.data.user.id);
      });
    });
  });
  return io;
}
