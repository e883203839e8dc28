import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import { api, ApiError } from '@/api/client';
import { sketchSchema, type Sketch } from '@shared/model/sketchApi';
import type { SketchDocument } from '@shared/model/sketch';
import {
  applyOp,
  invertOp,
  remapVertexIndex,
  withOpId,
  type ApplyOpResult,
  type SketchOp,
  type SketchOpDraft,
} from '@shared/model/ops';
import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import { newId } from '@shared/model/ids';
import { createSyncEngine, type SyncEngine } from '@shared/protocol/syncEngine';
import { transformOp } from '@shared/protocol/transform';
import type { ClientMessage, EditOp, ServerMessage } from '@shared/protocol/messages';
import { AUTOSAVE_DEBOUNCE_MS, AUTOSAVE_RETRY_MS, SERVER_RESULT_REFRESH_MS } from '@/timing';

/** One local edit in the history: the op as applied and the op that takes it back. */
interface HistoryEntry {
  op: SketchOp;
  inverse: SketchOp;
}

export type SaveState = 'saved' | 'unsaved' | 'saving' | 'error';

export interface SketchNotice {
  kind: 'conflict' | 'error' | 'info';
  message: string;
}

/**
 * The open sketch: its document and revision, local undo/redo of ops, the saved/unsaved state
 * and autosave, and the result the server stored on its last save. Invariants:
 *
 * - Every change to the document goes through `dispatch` (or undo/redo), which applies one op
 *   with `applyOp`; a rejected op changes nothing and is not recorded.
 * - Undo and redo apply recorded ops with fresh op ids; a new edit clears the redo stack.
 * - Autosave PUTs the whole document with the revision it was based on; on a 409 the store
 *   reloads the server's document, re-applies the edits not yet saved on top of it, and says
 *   so in `notice`.
 * - The store never imports Konva or the socket (tools call `dispatch`).
 * - With a realtime channel attached (`attachChannel`, done by useSketchChannel), edits go to
 *   the shared sync engine instead of autosave: the document shown is the server's confirmed
 *   state plus our pending edits; remote edits rebase the undo/redo history and never enter it.
 */
export const useSketchStore = defineStore('sketch', () => {
  const sketchId = ref<string | null>(null);
  const teamId = ref<string | null>(null);
  const title = ref('');
  const document = shallowRef<SketchDocument | null>(null);
  const revision = ref(0);
  const updatedAt = ref<string | null>(null);
  const updatedByName = ref<string | null>(null);
  /** What the server analysed and stored on its last save (the authoritative result). */
  const serverAnalysis = shallowRef<SketchAnalysis | null>(null);
  const serverStatus = ref<string | null>(null);
  /** Review status as loaded with the sketch (the review store keeps it current). */
  const reviewStatus = ref<Sketch['reviewStatus']>('draft');
  const isLoading = ref(false);
  const loadError = ref<string | null>(null);
  const saveState = ref<SaveState>('saved');
  const saveError = ref<string | null>(null);
  const notice = ref<SketchNotice | null>(null);
  /** Why the last edit was refused (shown near the canvas), cleared by the next good edit. */
  const lastRejection = ref<string | null>(null);
  const readOnly = ref(false);
  const selection = ref<number[]>([]);
  const undoStack = shallowRef<HistoryEntry[]>([]);
  const redoStack = shallowRef<HistoryEntry[]>([]);

  /** The document the server holds at `revision`. */
  let savedDocument: SketchDocument | null = null;
  /** Ops applied locally since `savedDocument`, oldest first (re-applied after a conflict). */
  let unsavedOps: SketchOp[] = [];
  let saveTimer: ReturnType<typeof setTimeout> | null = null;
  let saving: Promise<void> | null = null;
  /** The realtime sync engine while a channel is attached; edits go through it. */
  let engine: SyncEngine | null = null;
  /** True while edits travel over the realtime channel. */
  const live = ref(false);
  let refreshTimer: ReturnType<typeof setTimeout> | null = null;

  const canUndo = computed(() => !readOnly.value && undoStack.value.length > 0);
  const canRedo = computed(() => !readOnly.value && redoStack.value.length > 0);
  const isDirty = computed(() => saveState.value !== 'saved');

  function accept(sketch: Sketch) {
    sketchId.value = sketch.id;
    teamId.value = sketch.teamId;
    title.value = sketch.title;
    revision.value = sketch.revision;
    updatedAt.value = sketch.updatedAt;
    updatedByName.value = sketch.updatedByName;
    serverAnalysis.value = asAnalysis(sketch.lastResult);
    serverStatus.value = sketch.lastSolveStatus;
    reviewStatus.value = sketch.reviewStatus;
  }

  /** Opens a sketch, dropping whatever was open (and its history). */
  async function open(id: string): Promise<void> {
    cancelTimer();
    isLoading.value = true;
    loadError.value = null;
    try {
      const sketch = await api.get(`/api/sketches/${id}`, sketchSchema);
      accept(sketch);
      document.value = sketch.document;
      savedDocument = sketch.document;
      unsavedOps = [];
      undoStack.value = [];
      redoStack.value = [];
      selection.value = [];
      saveState.value = 'saved';
      saveError.value = null;
      notice.value = null;
      lastRejection.value = null;
    } catch (err) {
      loadError.value = err instanceof ApiError ? err.message : 'The sketch could not be opened.';
      document.value = null;
    } finally {
      isLoading.value = false;
    }
  }

  /** Applies an op to the open document; records it for undo and schedules a save. */
  function dispatch(input: SketchOp | SketchOpDraft): ApplyOpResult {
    const op: SketchOp = 'opId' in input ? input : withOpId(input);
    const r = applyLocal(op);
    if (!r.ok) return r;
    undoStack.value = [...undoStack.value, { op, inverse: r.inverse }];
    redoStack.value = [];
    return { ok: true, doc: r.doc };
  }

  function undo(): boolean {
    const entry = undoStack.value.at(-1);
    if (!entry || readOnly.value) return false;
    const r = applyLocal(withOpId(stripId(entry.inverse)));
    if (!r.ok) return false;
    undoStack.value = undoStack.value.slice(0, -1);
    redoStack.value = [...redoStack.value, entry];
    return true;
  }

  function redo(): boolean {
    const entry = redoStack.value.at(-1);
    if (!entry || readOnly.value) return false;
    const r = applyLocal(withOpId(stripId(entry.op)));
    if (!r.ok) return false;
    redoStack.value = redoStack.value.slice(0, -1);
    undoStack.value = [...undoStack.value, { op: entry.op, inverse: r.inverse }];
    return true;
  }

  function applyLocal(op: SketchOp): { ok: true; doc: SketchDocument; inverse: SketchOp } | { ok: false; reason: string } {
    const before = document.value;
    if (!before) return { ok: false, reason: 'No sketch is open.' };
    if (readOnly.value) return { ok: false, reason: 'Your role on this team can read this sketch but not edit it.' };
    const r = applyOp(before, op);
    if (!r.ok) {
      lastRejection.value = r.reason;
      return r;
    }
    lastRejection.value = null;
    const inverse = invertOp(before, op);
    selection.value = selection.value.map((i) => remapVertexIndex(i, op)).filter((i): i is number => i !== null && i < r.doc.section.points.length);
    if (engine) {
      const sent = engine.submit(op);
      if (!sent.ok) {
        lastRejection.value = sent.reason;
        return sent;
      }
      return { ok: true, doc: engine.state?.document ?? r.doc, inverse };
    }
    document.value = r.doc;
    unsavedOps.push(op);
    markUnsaved();
    return { ok: true, doc: r.doc, inverse };
  }

  // ---- realtime channel ----

  /** Mirrors the engine's view (confirmed state + pending edits) into the store. */
  function syncFromEngine() {
    const state = engine?.state;
    if (!engine || !state) return;
    document.value = state.document;
    title.value = state.title;
    revision.value = engine.revision;
    const n = state.document.section.points.length;
    if (selection.value.some((i) => i >= n)) selection.value = selection.value.filter((i) => i < n);
    syncSaveState();
  }

  function syncSaveState() {
    if (!engine) return;
    if (engine.pendingCount === 0) {
      saveState.value = 'saved';
      saveError.value = null;
    } else if (engine.connected) {
      saveState.value = 'saving';
    } else {
      saveState.value = 'unsaved';
      saveError.value = 'Offline: your edits are kept here and sent when the connection returns.';
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
    undoStack.value = fix(undoStack.value);
    redoStack.value = fix(redoStack.value);
  }

  /** The server stores its own solve of every revision; fetch it once edits settle. */
  function scheduleServerRefresh() {
    if (refreshTimer) clearTimeout(refreshTimer);
    refreshTimer = setTimeout(async () => {
      refreshTimer = null;
      const id = sketchId.value;
      if (!id || (engine && engine.pendingCount > 0)) return;
      try {
        const sketch = await api.get(`/api/sketches/${id}`, sketchSchema);
        if (sketchId.value !== id) return;
        serverAnalysis.value = asAnalysis(sketch.lastResult);
        serverStatus.value = sketch.lastSolveStatus;
        updatedAt.value = sketch.updatedAt;
        updatedByName.value = sketch.updatedByName;
      } catch {
        // The next settle tries again; the live result is on screen meanwhile.
      }
    }, SERVER_RESULT_REFRESH_MS);
  }

  /**
   * Connects the store to a realtime channel: `send` delivers client messages; the returned
   * handlers take what the socket reports. Edits made while offline wait and are sent on
   * reconnect with their original ids.
   */
  function attachChannel(send: (msg: ClientMessage) => void) {
    cancelTimer();
    engine = createSyncEngine({
      send,
      onChange: syncFromEngine,
      onRemoteEdit: (op) => {
        rebaseHistory(op);
        scheduleServerRefresh();
      },
      onRejected: (_op, reason) => {
        lastRejection.value = reason;
        notice.value = { kind: 'error', message: `An edit was not applied: ${reason}` };
      },
      onAcked: () => scheduleServerRefresh(),
    });
    live.value = true;
    const own = engine;
    return {
      join: (id: string) => own.join(id),
      receive: (msg: ServerMessage) => {
        own.receive(msg);
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

  function detachChannel() {
    engine = null;
    live.value = false;
    if (refreshTimer) clearTimeout(refreshTimer);
    refreshTimer = null;
  }

  function markUnsaved() {
    if (saveState.value !== 'saving') saveState.value = 'unsaved';
    scheduleSave(AUTOSAVE_DEBOUNCE_MS);
  }

  function cancelTimer() {
    if (saveTimer) clearTimeout(saveTimer);
    saveTimer = null;
  }

  function scheduleSave(delayMs: number) {
    cancelTimer();
    saveTimer = setTimeout(() => {
      saveTimer = null;
      void save();
    }, delayMs);
  }

  /** Saves now (also what the autosave timer calls). Resolves when the document is stored. */
  async function save(): Promise<void> {
    cancelTimer();
    if (engine) {
      // Realtime: edits are already on their way; wait (a while) for them to be confirmed.
      const deadline = Date.now() + 10_000;
      while (engine && engine.pendingCount > 0 && engine.connected && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
      return;
    }
    if (saving) {
      await saving;
      if (document.value !== savedDocument) return save();
      return;
    }
    const doc = document.value;
    const id = sketchId.value;
    if (!doc || !id || doc === savedDocument) {
      if (doc === savedDocument && saveState.value !== 'error') saveState.value = 'saved';
      return;
    }
    const sentOps = unsavedOps.length;
    saveState.value = 'saving';
    saveError.value = null;
    saving = (async () => {
      try {
        const sketch = await api.put(`/api/sketches/${id}/document`, { document: doc, baseRevision: revision.value }, sketchSchema);
        if (sketchId.value !== id) return;
        accept(sketch);
        savedDocument = doc;
        unsavedOps = unsavedOps.slice(sentOps);
        saveState.value = document.value === doc ? 'saved' : 'unsaved';
      } catch (err) {
        if (sketchId.value !== id) return;
        if (err instanceof ApiError && err.status === 409) await rebaseAfterConflict(id);
        else if (err instanceof ApiError && err.status === 403) {
          readOnly.value = true;
          saveState.value = 'error';
          saveError.value = err.message;
          notice.value = { kind: 'error', message: `Not saved: ${err.message}` };
        } else {
          saveState.value = 'error';
          saveError.value = err instanceof ApiError ? err.message : 'The sketch could not be saved.';
          scheduleSave(AUTOSAVE_RETRY_MS);
        }
      }
    })();
    try {
      await saving;
    } finally {
      saving = null;
    }
    // The request above may have changed the state (TS cannot see through the await).
    if ((saveState.value as SaveState) === 'unsaved') scheduleSave(AUTOSAVE_DEBOUNCE_MS);
  }

  /**
   * Someone else saved first: take their document and revision, re-apply our unsaved edits on
   * top (those that still make sense), and tell the user what happened.
   */
  async function rebaseAfterConflict(id: string) {
    let server: Sketch;
    try {
      server = await api.get(`/api/sketches/${id}`, sketchSchema);
    } catch (err) {
      saveState.value = 'error';
      saveError.value = err instanceof ApiError ? err.message : 'The sketch could not be reloaded.';
      scheduleSave(AUTOSAVE_RETRY_MS);
      return;
    }
    accept(server);
    savedDocument = server.document;
    let doc = server.document;
    const kept: SketchOp[] = [];
    for (const op of unsavedOps) {
      const r = applyOp(doc, op);
      if (r.ok) {
        doc = r.doc;
        kept.push(op);
      }
    }
    const dropped = unsavedOps.length - kept.length;
    unsavedOps = kept;
    document.value = doc;
    undoStack.value = [];
    redoStack.value = [];
    selection.value = selection.value.filter((i) => i < doc.section.points.length);
    const who = server.updatedByName ? `${server.updatedByName} saved` : 'Someone saved';
    const mine =
      kept.length === 0 && dropped === 0
        ? ''
        : dropped === 0
          ? ` Your ${kept.length} unsaved edit${kept.length === 1 ? ' was' : 's were'} re-applied on top.`
          : ` ${kept.length} of your unsaved edits were re-applied on top; ${dropped} no longer fit and ${dropped === 1 ? 'was' : 'were'} dropped.`;
    notice.value = { kind: 'conflict', message: `${who} this sketch while you were editing (now revision ${server.revision}); it was reloaded.${mine} Undo history was cleared.` };
    saveState.value = kept.length > 0 ? 'unsaved' : 'saved';
  }

  async function rename(next: string): Promise<void> {
    const id = sketchId.value;
    if (!id) return;
    if (engine) {
      const r = engine.submit({ type: 'rename', opId: newId('op'), title: next.trim() });
      if (!r.ok) throw new Error(r.reason);
      return;
    }
    const sketch = await api.patch(`/api/sketches/${id}`, { title: next }, sketchSchema);
    title.value = sketch.title;
    updatedAt.value = sketch.updatedAt;
  }

  function setSelection(indices: number[]) {
    const n = document.value?.section.points.length ?? 0;
    selection.value = [...new Set(indices)].filter((i) => i >= 0 && i < n).sort((a, b) => a - b);
  }

  function dismissNotice() {
    notice.value = null;
  }

  /** Forgets the open sketch (leaving the editor). Does not save: call `save()` first. */
  function close() {
    cancelTimer();
    detachChannel();
    sketchId.value = null;
    document.value = null;
    savedDocument = null;
    unsavedOps = [];
    undoStack.value = [];
    redoStack.value = [];
    selection.value = [];
    serverAnalysis.value = null;
    saveState.value = 'saved';
    notice.value = null;
  }

  return {
    sketchId,
    teamId,
    title,
    document,
    revision,
    updatedAt,
    updatedByName,
    serverAnalysis,
    serverStatus,
    reviewStatus,
    isLoading,
    loadError,
    saveState,
    saveError,
    notice,
    lastRejection,
    readOnly,
    selection,
    undoStack,
    redoStack,
    canUndo,
    canRedo,
    isDirty,
    live,
    attachChannel,
    detachChannel,
    open,
    dispatch,
    undo,
    redo,
    save,
    rename,
    setSelection,
    dismissNotice,
    close,
  };
});

/** The stored analysis, if the server stored one in the current shape (older rows may not). */
function asAnalysis(raw: unknown): SketchAnalysis | null {
  if (!raw || typeof raw !== 'object') return null;
  const r = raw as Partial<SketchAnalysis>;
  return typeof r.status === 'string' && 'result' in r ? (raw as SketchAnalysis) : null;
}

function stripId(op: SketchOp): SketchOpDraft {
  const { opId: _opId, ...rest } = op;
  return rest as SketchOpDraft;
}
