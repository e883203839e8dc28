import { normalizeDocument } from '../../shared/model/sketch.ts';
import { MAX_REPLAY_EDITS, REVISION_HEARTBEAT_MS, type ClientMessage } from '../../shared/protocol/messages.ts';
import { editsSince, sketchRevisions } from './repository.ts';
import { localSketches, logged, room, send, type Hub, type IoSocket } from './hub.ts';

export interface EditChannelOptions {
  /** Tests only (FAULT_DIE_AFTER_COMMIT): die right after committing an edit whose op id starts with this. */
  dieAfterCommit?: string;
}

export interface EditChannel {
  /** Sends what a rejoining client missed: the edits when the log bridges the gap, else the whole state. */
  catchUp(socket: IoSocket, sketchId: string, lastRevision: number | undefined, row: { title: string; document: unknown; revision: number }): Promise<void>;
  /** An edit: through the edit log, acked to its author, broadcast to the others [R2][R3]. */
  edit(socket: IoSocket, msg: Extract<ClientMessage, { type: 'edit' }>): Promise<void>;
  stop(): void;
}

/**
 * The document half of the channel: edits, replays, and the per-sketch revision heartbeat [R7].
 * Edits saved outside the socket (REST) and notices (pins, snapshots, status…) are relayed to
 * the sketch's room from here too.
 */
export function createEditChannel(hub: Hub, options: EditChannelOptions): EditChannel {
  const { io, ctx } = hub;

  // Edits saved outside the socket channel (REST) reach every editor of the sketch.
  ctx.events.on('sketchEdited', (sketchId, edit) => send(io.to(room(sketchId)), { type: 'edit', sketchId, ...edit }));
  // Pins, snapshots, status: clients refetch what the notice names.
  ctx.events.on('sketchNotice', (sketchId, topic) => send(io.to(room(sketchId)), { type: 'notice', sketchId, topic }));

  // Revision heartbeat [R7]: every instance tells its own sockets each open sketch's latest
  // revision. A client behind it (an edit whose broadcast died with the instance that
  // committed it) resyncs after GAP_RESYNC_AFTER_MS, without anyone editing again.
  const heartbeat = setInterval(() => {
    const ids = localSketches(io);
    if (ids.length === 0) return;
    sketchRevisions(ctx.db, ids).then((revisions) => {
      for (const [sketchId, revision] of revisions) io.local.to(room(sketchId)).emit('message', { type: 'revision', sketchId, revision });
    }, logged(hub, 'revision heartbeat'));
  }, REVISION_HEARTBEAT_MS);
  heartbeat.unref();

  return {
    async catchUp(socket, sketchId, lastRevision, row) {
      const replay = lastRevision === undefined ? null : await editsSince(ctx.db, sketchId, lastRevision, row.revision, MAX_REPLAY_EDITS);
      if (replay) send(socket, { type: 'replay', sketchId, edits: replay, revision: row.revision });
      else send(socket, { type: 'snapshot', sketchId, title: row.title, document: normalizeDocument(row.document), revision: row.revision });
    },
    async edit(socket, msg) {
      const outcome = await ctx.edits.submit({ sketchId: msg.sketchId, userId: socket.data.user.id, baseRevision: msg.baseRevision, op: msg.op });
      if (options.dieAfterCommit && msg.op.opId.startsWith(options.dieAfterCommit)) process.kill(process.pid, 'SIGKILL');
      if (outcome.status === 'rejected') {
        send(socket, { type: 'ack', sketchId: msg.sketchId, opId: msg.op.opId, status: 'rejected', reason: outcome.reason });
        return;
      }
      send(socket, { type: 'ack', sketchId: msg.sketchId, opId: msg.op.opId, status: outcome.status, revision: outcome.revision, op: outcome.op });
      // A duplicate is broadcast again too: its first broadcast may have died with the instance
      // that committed it [R7]. Clients ignore revisions they already hold.
      send(socket.to(room(msg.sketchId)), { type: 'edit', sketchId: msg.sketchId, revision: outcome.revision, op: outcome.op, userId: socket.data.user.id });
    },
    stop() {
      clearInterval(heartbeat);
    },
  };
}
