import { io as connect, type Socket } from 'socket.io-client';
import { createSyncEngine, type SyncEngine } from '../../shared/protocol/syncEngine.ts';
import type { ClientMessage, ClientToServerEvents, EditOp, ServerMessage, ServerToClientEvents } from '../../shared/protocol/messages.ts';
import { newId } from '../../shared/model/ids.ts';
import type { SketchDocument } from '../../shared/model/sketch.ts';
import { itemAt } from '../../shared/util/invariant.ts';

/**
 * A simulated editor: socket.io-client + the same sync engine the browser uses. Records every
 * server message so tests can count acks per op id.
 */
export interface SimClient {
  socket: Socket<ServerToClientEvents, ClientToServerEvents>;
  engine: SyncEngine;
  received: ServerMessage[];
  acks: Map<string, number>;
  rejected: Map<string, string>;
  submitted: string[];
  /** Op ids sent to the server at least once. */
  sent: Set<string>;
  /** Op ids the engine dropped before sending (they no longer applied after a rebase). */
  dropped: Map<string, string>;
  send(msg: ClientMessage): void;
  close(): void;
  /**
   * Resolves with the first message from index `from` on (default: any so far) for which
   * `predicate` holds, waiting for new ones up to `timeoutMs`.
   */
  waitFor(predicate: (m: ServerMessage) => boolean, timeoutMs?: number, from?: number): Promise<ServerMessage>;
}

export async function signInCookie(baseUrl: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-shockwright-request': '1' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('sw.sid='));
  if (!cookie) throw new Error('no session cookie in the sign-in answer');
  return cookie.replace(/;.*$/s, '');
}

export function simClient(baseUrl: string, cookie: string, options: { reconnect?: boolean } = {}): SimClient {
  const socket: Socket<ServerToClientEvents, ClientToServerEvents> = connect(baseUrl, {
    transports: ['websocket'],
    extraHeaders: { cookie },
    reconnection: options.reconnect ?? true,
    reconnectionDelay: 100,
    reconnectionDelayMax: 500,
    forceNew: true,
  });
  const received: ServerMessage[] = [];
  const acks = new Map<string, number>();
  const rejected = new Map<string, string>();
  const waiters: { predicate: (m: ServerMessage) => boolean; resolve: (m: ServerMessage) => void }[] = [];
  const sent = new Set<string>();
  const dropped = new Map<string, string>();
  const send = (msg: ClientMessage) => {
    if (msg.type === 'edit') sent.add(msg.op.opId);
    socket.emit('message', msg);
  };
  const engine = createSyncEngine({
    send,
    onRejected: (op, reason) => {
      if (!sent.has(op.opId)) dropped.set(op.opId, reason);
    },
  });
  socket.on('connect', () => engine.connectionOpened());
  socket.on('disconnect', () => engine.connectionLost());
  socket.on('message', (msg) => {
    received.push(msg);
    if (msg.type === 'ack') {
      acks.set(msg.opId, (acks.get(msg.opId) ?? 0) + 1);
      if (msg.status === 'rejected') rejected.set(msg.opId, msg.reason);
    }
    engine.receive(msg);
    for (const w of [...waiters]) {
      if (w.predicate(msg)) {
        waiters.splice(waiters.indexOf(w), 1);
        w.resolve(msg);
      }
    }
  });
  const timer = setInterval(() => engine.tick(), 100);
  return {
    socket,
    engine,
    received,
    acks,
    rejected,
    submitted: [],
    sent,
    dropped,
    send,
    close() {
      clearInterval(timer);
      socket.close();
    },
    waitFor(predicate, timeoutMs = 30_000, from = 0) {
      const hit = received.slice(from).find(predicate);
      if (hit) return Promise.resolve(hit);
      return new Promise((resolve, reject) => {
        const t = setTimeout(() => reject(new Error('timed out waiting for a server message')), timeoutMs);
        waiters.push({ predicate, resolve: (m) => (clearTimeout(t), resolve(m)) });
      });
    },
  };
}

/** Waits until `check` returns true, polling every 25 ms, failing after `timeoutMs`. */
export async function until(check: () => boolean | Promise<boolean>, timeoutMs = 30_000, what = 'condition'): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`timed out waiting for ${what}`);
}

/** Names random design point edits draw from: few, so concurrent adds and renames collide. */
const POINT_NAMES = ['Cruise', 'Pull-up', 'Max q', 'Dash', 'Design point 2'];

/** A random edit that usually applies to `doc` (the engine refuses the ones that do not). */
export function randomEdit(doc: SketchDocument, rand: () => number, opId: string): EditOp {
  const pts = doc.section.points;
  const n = pts.length;
  const k = Math.floor(rand() * n);
  const pick = rand();
  if (pick < 0.5) {
    const [x, y] = itemAt(pts, k);
    return { type: 'moveVertices', opId, indices: [k], to: [[x + (rand() - 0.5) * 0.02, y + (rand() - 0.5) * 0.02]] };
  }
  if (pick < 0.6 && n < 40) {
    const a = itemAt(pts, k);
    const b = itemAt(pts, (k + 1) % n);
    return { type: 'insertVertex', opId, index: k + 1, at: [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2] };
  }
  if (pick < 0.68 && n > 12) return { type: 'deleteVertex', opId, index: k };
  if (pick < 0.8) return randomPointEdit(doc, rand, opId);
  if (pick < 0.95) {
    const point = itemAt(doc.designPoints, Math.floor(rand() * doc.designPoints.length));
    return { type: 'setCondition', opId, pointId: point.id, field: 'mach', value: Math.round((1.5 + rand() * 3) * 100) / 100 };
  }
  return { type: 'rename', opId, title: `Random title ${Math.floor(rand() * 1000)}` };
}

/** A random design point edit: add, remove, rename, reorder, select or change one. */
export function randomPointEdit(doc: SketchDocument, rand: () => number, opId: string): EditOp {
  const points = doc.designPoints;
  const point = itemAt(points, Math.floor(rand() * points.length));
  const name = itemAt(POINT_NAMES, Math.floor(rand() * POINT_NAMES.length));
  const pick = rand();
  if (pick < 0.25 && points.length < 6) {
    return {
      type: 'addDesignPoint',
      opId,
      point: { id: newId('point'), name, condition: { ...point.condition, alphaDeg: Math.round(rand() * 80) / 10 }, flapDeflectionDeg: 0 },
      index: Math.floor(rand() * (points.length + 1)),
      select: rand() < 0.3,
    };
  }
  if (pick < 0.4 && points.length > 1) return { type: 'removeDesignPoint', opId, pointId: point.id };
  if (pick < 0.55) return { type: 'renameDesignPoint', opId, pointId: point.id, name };
  if (pick < 0.7) return { type: 'moveDesignPoint', opId, pointId: point.id, index: Math.floor(rand() * points.length) };
  if (pick < 0.85) return { type: 'selectDesignPoint', opId, pointId: point.id };
  return { type: 'setCondition', opId, pointId: point.id, field: 'alphaDeg', value: Math.round((rand() * 16 - 8) * 10) / 10 };
}

/** Deterministic PRNG (mulberry32) so a failing run can be replayed from its seed. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
