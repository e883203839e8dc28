import type { Server, Socket } from 'socket.io';
import type { SessionUser } from '../auth/passport.ts';
import type { Role } from '../../shared/model/roles.ts';
import type { AppContext } from '../context.ts';
import type { ClientToServerEvents, Person, ServerMessage, ServerToClientEvents } from '../../shared/protocol/messages.ts';
import type { AccessFilter, RoomAccess } from './access.ts';
import { errorForLog } from '../log.ts';

/** What a socket carries (travels to other instances in fetchSockets answers: nothing secret). */
export interface SocketData {
  user: SessionUser;
  /** Sketches this connection has joined: team, role and when the role was last checked. */
  rooms: Map<string, RoomAccess>;
  /** Presence card per joined sketch (role may differ per team). */
  people: Record<string, Person>;
  /** Teams whose sketch list this connection watches (the home table), with the role last checked [T1]. */
  teams: Map<string, { role: Role }>;
}
/** Between server instances (through the adapter): re-check the sockets an access change concerns. */
export interface InterServerEvents {
  accessChanged: (filter: AccessFilter) => void;
}
export type IoServer = Server<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;
export type IoSocket = Socket<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;

/** What the parts of the realtime layer share: the socket.io server and the app's context. */
export interface Hub {
  io: IoServer;
  ctx: AppContext;
}

/** The socket.io room of a sketch (spans instances through the adapter). */
export const room = (sketchId: string) => `sketch:${sketchId}`;

/** The sketches this instance has sockets in. */
export function localSketches(io: IoServer): string[] {
  return [...io.of('/').adapter.rooms.keys()].filter((name) => name.startsWith('sketch:')).map((name) => name.slice('sketch:'.length));
}

export function send(target: { emit: IoSocket['emit'] } | ReturnType<IoServer['to']>, msg: ServerMessage): void {
  target.emit('message', msg);
}

/** A failed background task is logged, never thrown at the process. */
export const logged = (hub: Hub, what: string) => (err: unknown) => hub.ctx.log(`[realtime] ${what}: ${errorForLog(err, false)}`);
