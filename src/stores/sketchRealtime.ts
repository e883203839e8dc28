import { api } from '@/api/client';
import { sketchSchema } from '@shared/model/sketchApi';
import type { SketchOp } from '@shared/model/ops';
import { createSyncEngine, type SyncEngine } from '@shared/protocol/syncEngine';
import { transformOp } from '@shared/protocol/transform';
import type { ClientMessage, EditOp, ServerMessage } from '@shared/protocol/messages';
import { SERVER_RESULT_REFRESH_MS } from '@/timing';
import { asAnalysis, type HistoryEntry, type SketchState } from './sketchState';

/** Longest `save()` waits for pending realtime edits to be confirmed. */
const SAVE_WAIT_MS = 10_000;

/**
 * Editing over the realtime channel: the shared sync engine holds the server's confirmed state
 * plus our pending edits, and the store mirrors it. Remote edits rebase the undo/redo history
 * (they never enter it) and are passed on to open form fields with their author. The socket
 * itself lives in useSketchChannel; this module only sees `send` and what it is handed.
 */
export function createRealtimeLink(s: SketchState) {
  let engine: SyncEngine | null = null;
  let refreshTimer: ReturnType<typeof setTimeout> | null = null;

  /** Mirrors the engine's view (confirmed state + pending edits) into the store. */
  function syncFromEngine() {
    const state = engine?.state;
    if (!engine || !state) return;
    s.document.value = state.document;
    s.title.value = state.title;
    s.revision.value = engine.revision;
    const n = state.document.section.points.length;
    if (s.selection.value.some((i) => i >= n)) s.selection.value = s.selection.value.filter((i) => i < n);
    syncSaveState();
  }

  function syncSaveState() {
    if (!engine) return;
    if (engine.pendingCount === 0) {
      s.saveState.value = 'saved';
      s.saveError.value = null;
    } else if (engine.connected) {
      s.saveState.value = 'saving';
    } else {
      s.saveState.value = 'unsaved';
      s.saveError.value = 'Offline: your edits are kept here and sent when the connection returns.';
    }
  }

  /** A remote edit was applied before our history's edits: rebase them past it (drop what no longer fits). */
  function rebaseHistory(remote: EditOp) {
    const fix = (entries: HistoryEntry[]) =>
      entries.flatMap((e) => {
        const op = transformOp(e.op, remote);
        const inverse = transformOp(e.inverse, remote);
        return op.ok && inverse.ok ? [{ op: op.op as SketchOp, inverse: inverse.op as SketchOp }] : [];
      });
    s.undoStack.value = fix(s.undoStack.value);
    s.redoStack.value = fix(s.redoStack.value);
  }

  /** The server stores its own solve of every revision; fetch it once edits settle. */
  function scheduleServerRefresh() {
    if (refreshTimer) clearTimeout(refreshTimer);
    refreshTimer = setTimeout(async () => {
      refreshTimer = null;
      const id = s.sketchId.value;
      if (!id || (engine && engine.pendingCount > 0)) return;
      try {
        const sketch = await api.get(`/api/sketches/${id}`, sketchSchema);
        if (s.sketchId.value !== id) return;
        s.serverAnalysis.value = asAnalysis(sketch.lastResult);
        s.serverStatus.value = sketch.lastSolveStatus;
        s.updatedAt.value = sketch.updatedAt;
        s.updatedByName.value = sketch.updatedByName;
      } catch {
        // The next settle tries again; the live result is on screen meanwhile.
      }
    }, SERVER_RESULT_REFRESH_MS);
  }

  /**
   * Connects to a realtime channel: `send` delivers client messages; the returned handlers take
   * what the socket reports. Edits made while offline wait and are sent on reconnect with their
   * original ids.
   */
  function attach(send: (msg: ClientMessage) => void) {
    engine = createSyncEngine({
      send,
      onChange: syncFromEngine,
      onRemoteEdit: (op, info) => {
        rebaseHistory(op);
        scheduleServerRefresh();
        s.emitChange({ op: info.local, origin: 'remote', userId: info.userId });
      },
      onRejected: (_op, reason) => {
        s.lastRejection.value = reason;
        s.notice.value = { kind: 'error', message: `An edit was not applied: ${reason}` };
      },
      onAcked: () => scheduleServerRefresh(),
    });
    s.live.value = true;
    const own = engine;
    return {
      join: (id: string) => own.join(id),
      receive: (msg: ServerMessage) => {
        const before = own.revision;
        own.receive(msg);
        // A whole state replaced ours: open fields cannot tell what moved.
        if (msg.type === 'snapshot' && own.revision !== before) s.emitChange({ op: null, origin: 'remote', userId: null });
        if (msg.type === 'ack' || msg.type === 'edit' || msg.type === 'replay' || msg.type === 'snapshot') syncSaveState();
      },
      connectionOpened: () => {
        own.connectionOpened();
        syncSaveState();
      },
      connectionLost: () => {
        own.connectionLost();
        syncSaveState();
      },
      tick: () => own.tick(),
    };
  }

  function detach() {
    engine = null;
    s.live.value = false;
    if (refreshTimer) clearTimeout(refreshTimer);
    refreshTimer = null;
  }

  /** Hands an edit to the engine (already applied locally by the store). */
  function submit(op: EditOp): { ok: true; document: SketchState['document']['value'] } | { ok: false; reason: string } {
    const sent = engine!.submit(op);
    if (!sent.ok) return sent;
    return { ok: true, document: engine!.state?.document ?? null };
  }

  /** Edits are already on their way; waits (a while) for them to be confirmed. */
  async function save(): Promise<void> {
    const deadline = Date.now() + SAVE_WAIT_MS;
    while (engine && engine.pendingCount > 0 && engine.connected && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
  }

  return {
    get attached() {
      return engine !== null;
    },
    attach,
    detach,
    submit,
    save,
  };
}
