import type { SketchDocument } from '../model/sketch.ts';
import { applyEdit, transformOp, type SketchState } from './transform.ts';
import { GAP_RESYNC_AFTER_MS, REJOIN_RETRY_MS, PROTOCOL_VERSION, type ClientMessage, type EditOp, type ServerMessage } from './messages.ts';

/**
 * The client half of the edit protocol, as a pure state machine with no socket in it: the
 * browser store drives it from socket.io, the realtime tests drive twenty of them at once.
 *
 * Model (one edit in flight, the rest buffered, like a classic OT client):
 * - `server` is the last state the server confirmed, at `revision`; edits from the server are
 *   applied to it strictly in revision order (out-of-order arrivals wait; a gap that stays open
 *   for GAP_RESYNC_AFTER_MS triggers a `resync`).
 * - `pending` = the in-flight edit (sent, not yet acked) followed by buffered local edits. The
 *   local view is always `server` + `pending`, so once pending drains every client shows exactly
 *   the server's state [R6].
 * - A remote edit rebases pending edits past it; our in-flight edit is sent with the revision it
 *   was made on and the server rebases it the same way [R5].
 * - After a reconnect the engine rejoins with its revision; the server replays what it missed
 *   (or sends a snapshot) and the in-flight edit is re-sent with its original id [R3].
 * - Remote edits are reported through `onRemoteEdit` so an undo stack can rebase past them
 *   (remote edits never enter local undo), with who made them and the edit as it changed the
 *   local view (rebased past our pending edits), so open form fields can tell what moved.
 * - The server repeats each sketch's latest revision now and then (`revision` messages): a
 *   client that is behind (an edit whose broadcast died with a server instance) treats it like
 *   a gap and resyncs [R7].
 */
export interface RemoteEditInfo {
  /** Who made the edit (null: unknown, e.g. a deleted account). */
  userId: string | null;
  /** The edit as it applied to the local view (confirmed + pending); null when it could not be expressed there. */
  local: EditOp | null;
}

export interface SyncEngineOptions {
  send(msg: ClientMessage): void;
  /** The local view changed (re-render). */
  onChange?(): void;
  /** A remote edit was applied to the server state (rebase undo entries past it). */
  onRemoteEdit?(op: EditOp, info: RemoteEditInfo): void;
  /** The server refused one of our edits, or it could no longer apply after a rebase. */
  onRejected?(op: EditOp, reason: string): void;
  /** One of our edits was confirmed at `revision`. */
  onAcked?(op: EditOp, revision: number): void;
  now?(): number;
}

interface Pending {
  /** The edit as it now applies (rebased past remote edits seen since it was made). */
  op: EditOp;
  /** Set once sent: the edit and revision as first sent (re-sent as is after a snapshot). */
  sent?: { op: EditOp; base: number };
}

export interface SyncEngine {
  readonly sketchId: string | null;
  /** Local view: confirmed state + pending edits. Null before the first join answer. */
  readonly state: SketchState | null;
  readonly revision: number;
  readonly pendingCount: number;
  readonly connected: boolean;
  join(sketchId: string): void;
  /** Applies an edit locally and queues it for the server; refuses it if it does not apply. */
  submit(op: EditOp): { ok: true } | { ok: false; reason: string };
  receive(msg: ServerMessage): void;
  connectionOpened(): void;
  connectionLost(): void;
  /** Call periodically (e.g. every 250 ms): resyncs a gap that stayed open. */
  tick(): void;
}

export function createSyncEngine(options: SyncEngineOptions): SyncEngine {
  const now = options.now ?? (() => Date.now());
  let sketchId: string | null = null;
  let server: { state: SketchState; revision: number } | null = null;
  let pending: Pending[] = [];
  let local: SketchState | null = null;
  let connected = false;
  /** True between a reconnect's join and the replay/snapshot that brings us up to date. */
  let rejoining = false;
  /**
   * When the join or resync we are waiting on was sent (null: not waiting). Its answer can be
   * lost — the server could not read the database just then — so tick() asks again after
   * REJOIN_RETRY_MS rather than waiting forever.
   */
  let askedAt: number | null = null;
  const future = new Map<number, { op: EditOp; own: boolean; userId: string | null }>();
  let gapSince: number | null = null;
  /**
   * A revision the heartbeat said exists while we were behind it, and when it said so. We
   * resync only if that very revision has not arrived within GAP_RESYNC_AFTER_MS: under a steady
   * stream of edits a client is always a little behind the newest one, and chasing the newest
   * would resync it again and again while the broadcasts are simply on their way.
   */
  let heartbeat: { revision: number; at: number } | null = null;
  /**
   * Whether the in-flight edit may have been lost and must go again once the replay or snapshot
   * is in: after a reconnect, or when the server said it could not process it. A resync for a
   * gap on a live connection leaves it alone: the server has it and will ack it (once) [R3].
   */
  let resendInFlight = false;

  function recompute(): void {
    if (!server) {
      local = null;
      return;
    }
    let state = server.state;
    const kept: Pending[] = [];
    for (const [i, p] of pending.entries()) {
      const r = applyEdit(state, p.op);
      if (r.ok) {
        state = r.state;
        kept.push(p);
      } else if (i === 0 && p.sent) {
        // In flight: the server decides; keep waiting for its answer.
        kept.push(p);
      } else {
        options.onRejected?.(p.op, r.reason);
      }
    }
    pending = kept;
    local = state;
  }

  function sendInFlight(first: Pending, asFirstSent: boolean): void {
    if (!server || !sketchId) return;
    if (asFirstSent && first.sent) {
      options.send({ type: 'edit', sketchId, baseRevision: first.sent.base, op: first.sent.op });
    } else {
      first.sent = { op: first.op, base: server.revision };
      options.send({ type: 'edit', sketchId, baseRevision: server.revision, op: first.op });
    }
  }

  function flush(): void {
    const first = pending[0];
    if (!connected || rejoining || !server || first === undefined) return;
    if (!first.sent) sendInFlight(first, false);
  }

  /**
   * Rebases the pending edits past a remote edit the server ordered before them; returns the
   * remote edit as it applies on top of them (the change the local view sees), or null.
   */
  function rebasePending(remote: EditOp): EditOp | null {
    let r: EditOp | null = remote;
    const out: Pending[] = [];
    for (const p of pending) {
      if (r === null) {
        out.push(p);
        continue;
      }
      const moved = transformOp(p.op, r);
      if (moved.ok) {
        const rPast = transformOp(r, p.op, true);
        r = rPast.ok ? rPast.op : null;
        out.push({ ...p, op: moved.op });
      } else if (p.sent) {
        // The server will reach the same verdict and reject it; keep it until it says so.
        out.push(p);
      } else {
        options.onRejected?.(p.op, moved.reason);
      }
    }
    pending = out;
    return r;
  }

  function applyConfirmed(op: EditOp): void {
    // The server validated it against this same state: apply without re-checking the polygon.
    const r = applyEdit(server!.state, op, { trusted: true });
    if (r.ok) server!.state = r.state;
    server!.revision += 1;
  }

  function drainFuture(): void {
    if (!server) return;
    let changed = false;
    while (future.has(server.revision + 1)) {
      const entry = future.get(server.revision + 1)!;
      future.delete(server.revision + 1);
      changed = true;
      const first = pending[0];
      const ours = entry.own || (first?.sent && first.sent.op.opId === entry.op.opId);
      applyConfirmed(entry.op);
      if (ours && first) {
        pending.shift();
        options.onAcked?.(entry.op, server.revision);
      } else {
        const local = rebasePending(entry.op);
        options.onRemoteEdit?.(entry.op, { userId: entry.userId, local });
      }
    }
    updateGap();
    if (changed) {
      recompute();
      flush();
      options.onChange?.();
    }
  }

  /** A gap is open while edits wait for an earlier one, or a heartbeat's revision has not come. */
  function updateGap(): void {
    if (heartbeat && server && server.revision >= heartbeat.revision) heartbeat = null;
    if (future.size > 0) gapSince ??= now();
    else gapSince = heartbeat ? heartbeat.at : null;
  }

  function adopt(title: string, document: SketchDocument, revision: number): void {
    server = { state: { title, document }, revision };
    for (const r of [...future.keys()]) if (r <= revision) future.delete(r);
  }

  return {
    get sketchId() {
      return sketchId;
    },
    get state() {
      return local;
    },
    get revision() {
      return server?.revision ?? 0;
    },
    get pendingCount() {
      return pending.length;
    },
    get connected() {
      return connected;
    },

    join(id) {
      if (sketchId !== id) {
        sketchId = id;
        server = null;
        pending = [];
        local = null;
        future.clear();
        heartbeat = null;
      }
      if (connected) {
        rejoining = server !== null;
        resendInFlight = rejoining;
        askedAt = now();
        options.send({ type: 'join', protocol: PROTOCOL_VERSION, sketchId: id, ...(server ? { lastRevision: server.revision } : {}) });
      }
    },

    submit(op) {
      if (!local || !server) return { ok: false, reason: 'The sketch is still loading.' };
      const r = applyEdit(local, op);
      if (!r.ok) return r;
      pending.push({ op });
      local = r.state;
      flush();
      options.onChange?.();
      return { ok: true };
    },

    receive(msg) {
      if (msg.type === 'error') {
        if (msg.about === 'edit' && msg.code === 'internal' && pending[0]?.sent && sketchId) {
          // Not processed: ask for what we missed; the edit is re-sent after the replay.
          rejoining = true;
          resendInFlight = true;
          askedAt = now();
          options.send({ type: 'resync', sketchId, lastRevision: server?.revision });
        }
        // Refused for good (not a member, no such sketch, wrong protocol): stop asking.
        if (msg.about === 'join' && msg.code !== 'internal') askedAt = null;
        return;
      }
      // Messages about teams (the home table's channel) carry no sketch: not this engine's.
      if (!('sketchId' in msg) || msg.sketchId !== sketchId) return;
      switch (msg.type) {
        case 'joined':
          if (!server) {
            adopt(msg.title, msg.document, msg.revision);
            rejoining = false;
            askedAt = null;
            recompute();
            flush();
            options.onChange?.();
          }
          return;
        case 'replay':
          for (const e of msg.edits) if (!server || e.revision > server.revision) future.set(e.revision, { op: e.op, own: false, userId: e.userId });
          rejoining = false;
          askedAt = null;
          drainFuture();
          // Still unconfirmed after the replay of a reconnect: the server never applied it; send it again.
          if (resendInFlight && pending[0]?.sent) sendInFlight(pending[0], false);
          resendInFlight = false;
          flush();
          return;
        case 'snapshot': {
          adopt(msg.title, msg.document, msg.revision);
          rejoining = false;
          askedAt = null;
          updateGap();
          // We cannot tell which of our edits the snapshot holds: re-send the in-flight one as
          // first sent (same id, same base); the server answers a duplicate with its outcome.
          if (resendInFlight && pending[0]?.sent) sendInFlight(pending[0], true);
          resendInFlight = false;
          recompute();
          flush();
          options.onChange?.();
          return;
        }
        case 'edit':
          if (server && msg.revision > server.revision) future.set(msg.revision, { op: msg.op, own: false, userId: msg.userId });
          drainFuture();
          return;
        case 'revision':
          // Heartbeat [R7]: behind it, wait GAP_RESYNC_AFTER_MS for broadcasts in flight, then resync.
          if (server && msg.revision > server.revision && !heartbeat) heartbeat = { revision: msg.revision, at: now() };
          updateGap();
          return;
        case 'ack': {
          const first = pending[0];
          if (!first?.sent || first.sent.op.opId !== msg.opId) return;
          if (msg.status === 'rejected') {
            pending.shift();
            options.onRejected?.(first.op, msg.reason);
            recompute();
            flush();
            options.onChange?.();
            return;
          }
          if (server && msg.revision <= server.revision) {
            // Already part of the confirmed state (a snapshot included it).
            pending.shift();
            options.onAcked?.(msg.op, msg.revision);
            recompute();
            flush();
            options.onChange?.();
            return;
          }
          future.set(msg.revision, { op: msg.op, own: true, userId: null });
          drainFuture();
          return;
        }
        default:
          return;
      }
    },

    connectionOpened() {
      connected = true;
      if (sketchId) this.join(sketchId);
    },

    connectionLost() {
      connected = false;
    },

    tick() {
      if (connected && sketchId && askedAt !== null && (rejoining || !server) && now() - askedAt > REJOIN_RETRY_MS) {
        askedAt = now();
        if (server) options.send({ type: 'resync', sketchId, lastRevision: server.revision });
        else options.send({ type: 'join', protocol: PROTOCOL_VERSION, sketchId });
      }
      if (gapSince !== null && server && sketchId && connected && now() - gapSince > GAP_RESYNC_AFTER_MS) {
        // The heartbeat's target is forgotten: the next heartbeat sets a new one if still behind.
        heartbeat = null;
        gapSince = future.size > 0 ? now() : null;
        options.send({ type: 'resync', sketchId, lastRevision: server.revision });
      }
    },
  };
}
