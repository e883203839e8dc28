import type { Db } from '../db/client.ts';
import type { Role } from '../../shared/model/roles.ts';
import { checkAccess, type AccessCheck, type AccessResult } from './repository.ts';
import { itemAt } from '../../shared/util/invariant.ts';

/**
 * A socket's right to a sketch is checked when things happen, not only when it joins [A1–A4 in
 * server/realtime/README.md]:
 *
 * - join, resync and the walkthrough controls look the session and the role up in the database;
 * - edits, presence and walkthrough views (many a second) reuse a check younger than
 *   ACCESS_RECHECK_MS, else look up again (edits are checked once more inside their batch);
 * - a sign-out, password reset, membership or role change, team or sketch deletion emits
 *   `accessChanged`; every instance re-checks its matching sockets at once;
 * - every ACCESS_SWEEP_MS each instance re-checks all its sockets (heals a missed event).
 *
 * A database error is never taken as "no access": the check fails and nothing is evicted.
 */
export const ACCESS_RECHECK_MS = 1_000;
export const ACCESS_SWEEP_MS = 10_000;

/** Which sockets an access change concerns (all given fields must match). */
export interface AccessFilter {
  userId?: string;
  teamId?: string;
  sketchId?: string;
}

export interface RoomAccess {
  teamId: string;
  role: Role;
  /** performance.now() of the last database check. */
  checkedAt: number;
}

/** What the guard needs to know about one socket (kept outside socket.data: never serialised). */
export interface GuardedSocket {
  userId: string;
  sessionId: string;
  rooms: Map<string, RoomAccess>;
}

/** The outcome of a check for one socket and sketch. */
export type Verdict =
  | { kind: 'ok'; role: Role; teamId: string; changed: boolean }
  | { kind: 'signedOut' }
  | { kind: 'removed'; reason: string };

export function matches(socket: GuardedSocket, filter: AccessFilter): boolean {
  if (filter.userId && socket.userId !== filter.userId) return false;
  if (filter.sketchId && !socket.rooms.has(filter.sketchId)) return false;
  if (filter.teamId && ![...socket.rooms.values()].some((r) => r.teamId === filter.teamId)) return false;
  return true;
}

/** Turns the database's answer into a verdict, comparing with what the socket had. */
export function judge(result: AccessResult, before: RoomAccess | undefined): Verdict {
  if (!result.sessionLive) return { kind: 'signedOut' };
  if (!result.teamId) return { kind: 'removed', reason: 'This sketch was deleted.' };
  if (!result.role) return { kind: 'removed', reason: 'You are no longer a member of this sketch’s team.' };
  return { kind: 'ok', role: result.role, teamId: result.teamId, changed: before !== undefined && before.role !== result.role };
}

/** One socket's answer: is its session alive, and its verdict for each sketch checked. */
export interface SocketVerdict {
  sessionLive: boolean;
  rooms: Map<string, Verdict>;
}

/**
 * Checks many sockets at once, in one statement: a row per (socket, joined sketch), plus a
 * session-only row for a socket in no sketch. `only` limits which of its sketches are checked.
 */
export async function checkSockets<S extends GuardedSocket>(db: Db, sockets: readonly S[], only?: (sketchId: string) => boolean): Promise<Map<S, SocketVerdict>> {
  const checks: AccessCheck[] = [];
  const owners: { socket: S; sketchId: string | null }[] = [];
  for (const socket of sockets) {
    const ids = [...socket.rooms.keys()].filter((id) => !only || only(id));
    const rows = ids.length ? ids : [null];
    for (const sketchId of rows) {
      checks.push({ sessionId: socket.sessionId, userId: socket.userId, sketchId });
      owners.push({ socket, sketchId });
    }
  }
  const results = await checkAccess(db, checks);
  const out = new Map<S, SocketVerdict>();
  results.forEach((result, i) => {
    const { socket, sketchId } = itemAt(owners, i); // checkAccess answers each check, in order
    let verdict = out.get(socket);
    if (!verdict) {
      verdict = { sessionLive: result.sessionLive, rooms: new Map() };
      out.set(socket, verdict);
    }
    if (sketchId !== null) verdict.rooms.set(sketchId, judge(result, socket.rooms.get(sketchId)));
  });
  return out;
}
