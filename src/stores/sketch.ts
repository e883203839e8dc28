import { defineStore } from 'pinia';
import { computed } from 'vue';
import { api, ApiError } from '@/api/client';
import { sketchSchema } from '@shared/model/sketchApi';
import type { SketchDocument } from '@shared/model/sketch';
import { applyOp, invertOp, remapVertexIndex, withOpId, type ApplyOpResult, type SketchOp, type SketchOpDraft } from '@shared/model/ops';
import { newId } from '@shared/model/ids';
import type { ClientMessage } from '@shared/protocol/messages';
import { createSketchState } from './sketchState';
import { createAutosave } from './sketchAutosave';
import { createRealtimeLink } from './sketchRealtime';

export type { SaveState, SketchNotice, DocumentChange } from './sketchState';

/**
 * The open sketch: its document and revision, local undo/redo of ops, the saved/unsaved state
 * and the result the server stored. Invariants:
 *
 * - Every change to the document goes through `dispatch` (or undo/redo), which applies one op
 *   with `applyOp`; a rejected op changes nothing and is not recorded.
 * - Undo and redo apply recorded ops with fresh op ids; a new edit clears the redo stack.
 * - Without a realtime channel, edits are autosaved over REST (`sketchAutosave.ts`: whole
 *   document + base revision; a 409 reloads and re-applies what was unsaved, and says so).
 * - With a realtime channel attached (`attachChannel`, done by useSketchChannel), edits go to
 *   the shared sync engine instead (`sketchRealtime.ts`): the document shown is the server's
 *   confirmed state plus our pending edits; remote edits rebase the undo/redo history and never
 *   enter it.
 * - Every change to the shown document is announced to `onDocumentChange` listeners (local or
 *   remote, with the author), which is how open form fields know who changed what.
 * - The store never imports Konva or the socket (tools call `dispatch`).
 */
export const useSketchStore = defineStore('sketch', () => {
  const s = createSketchState();
  const autosave = createAutosave(s);
  const realtime = createRealtimeLink(s);

  const canUndo = computed(() => !s.readOnly.value && s.undoStack.value.length > 0);
  const canRedo = computed(() => !s.readOnly.value && s.redoStack.value.length > 0);

  /** Opens a sketch, dropping whatever was open (and its history). */
  async function open(id: string): Promise<void> {
    autosave.cancel();
    s.isLoading.value = true;
    s.loadError.value = null;
    try {
      const sketch = await api.get(`/api/sketches/${id}`, sketchSchema);
      s.accept(sketch);
      s.document.value = sketch.document;
      autosave.reset(sketch.document);
      s.undoStack.value = [];
      s.redoStack.value = [];
      s.selection.value = [];
      s.saveState.value = 'saved';
      s.saveError.value = null;
      s.notice.value = null;
      s.lastRejection.value = null;
    } catch (err) {
      s.loadError.value = err instanceof ApiError ? err.message : 'The sketch could not be opened.';
      s.document.value = null;
    } finally {
      s.isLoading.value = false;
    }
  }

  /** Applies an op to the open document; records it for undo and sends or schedules it. */
  function dispatch(input: SketchOp | SketchOpDraft): ApplyOpResult {
    const op: SketchOp = 'opId' in input ? input : withOpId(input);
    const r = applyLocal(op);
    if (!r.ok) return r;
    s.undoStack.value = [...s.undoStack.value, { op, inverse: r.inverse }];
    s.redoStack.value = [];
    return { ok: true, doc: r.doc };
  }

  function undo(): boolean {
    const entry = s.undoStack.value.at(-1);
    if (!entry || s.readOnly.value) return false;
    const r = applyLocal(withOpId(stripId(entry.inverse)));
    if (!r.ok) return false;
    s.undoStack.value = s.undoStack.value.slice(0, -1);
    s.redoStack.value = [...s.redoStack.value, entry];
    return true;
  }

  function redo(): boolean {
    const entry = s.redoStack.value.at(-1);
    if (!entry || s.readOnly.value) return false;
    const r = applyLocal(withOpId(stripId(entry.op)));
    if (!r.ok) return false;
    s.redoStack.value = s.redoStack.value.slice(0, -1);
    s.undoStack.value = [...s.undoStack.value, { op: entry.op, inverse: r.inverse }];
    return true;
  }

  function applyLocal(op: SketchOp): { ok: true; doc: SketchDocument; inverse: SketchOp } | { ok: false; reason: string } {
    const before = s.document.value;
    if (!before) return { ok: false, reason: 'No sketch is open.' };
    if (s.readOnly.value) return { ok: false, reason: 'Your role on this team can read this sketch but not edit it.' };
    const r = applyOp(before, op);
    if (!r.ok) {
      s.lastRejection.value = r.reason;
      return r;
    }
    s.lastRejection.value = null;
    const inverse = invertOp(before, op);
    s.selection.value = s.selection.value.map((i) => remapVertexIndex(i, op)).filter((i): i is number => i !== null && i < r.doc.section.points.length);
    if (realtime.attached) {
      const sent = realtime.submit(op);
      if (!sent.ok) {
        s.lastRejection.value = sent.reason;
        return sent;
      }
      s.emitChange({ op, origin: 'local', userId: null });
      return { ok: true, doc: sent.document ?? r.doc, inverse };
    }
    s.document.value = r.doc;
    s.emitChange({ op, origin: 'local', userId: null });
    autosave.recordEdit(op);
    return { ok: true, doc: r.doc, inverse };
  }

  /** Connects the store to a realtime channel (see sketchRealtime.ts); autosave stops. */
  function attachChannel(send: (msg: ClientMessage) => void) {
    autosave.cancel();
    return realtime.attach(send);
  }

  /** Saves now: over REST, or waits for the realtime channel to confirm pending edits. */
  async function save(): Promise<void> {
    autosave.cancel();
    if (realtime.attached) return realtime.save();
    return autosave.save();
  }

  async function rename(next: string): Promise<void> {
    const id = s.sketchId.value;
    if (!id) return;
    if (realtime.attached) {
      const op = { type: 'rename' as const, opId: newId('op'), title: next.trim() };
      const r = realtime.submit(op);
      if (!r.ok) throw new Error(r.reason);
      s.emitChange({ op, origin: 'local', userId: null });
      return;
    }
    const sketch = await api.patch(`/api/sketches/${id}`, { title: next }, sketchSchema);
    s.title.value = sketch.title;
    s.updatedAt.value = sketch.updatedAt;
  }

  /**
   * An edit the server made at our request (an import) enters our undo history as if we had made
   * it: one undo applies `inverse` as an ordinary edit, which reaches everyone. A replaceSection
   * is not index-based, so the realtime history rebase keeps it whether the server's broadcast of
   * the edit arrives before or after this call.
   */
  function recordServerEdit(op: SketchOp, inverse: SketchOp) {
    if (s.readOnly.value || !s.document.value) return;
    s.undoStack.value = [...s.undoStack.value, { op, inverse }];
    s.redoStack.value = [];
  }

  function setSelection(indices: number[]) {
    const n = s.document.value?.section.points.length ?? 0;
    s.selection.value = [...new Set(indices)].filter((i) => i >= 0 && i < n).sort((a, b) => a - b);
  }

  function dismissNotice() {
    s.notice.value = null;
  }

  /** Forgets the open sketch (leaving the editor). Does not save: call `save()` first. */
  function close() {
    autosave.reset(null);
    realtime.detach();
    s.sketchId.value = null;
    s.document.value = null;
    s.undoStack.value = [];
    s.redoStack.value = [];
    s.selection.value = [];
    s.serverAnalysis.value = null;
    s.saveState.value = 'saved';
    s.notice.value = null;
  }

  const { accept: _accept, emitChange: _emit, ...exposed } = s;
  return {
    ...exposed,
    canUndo,
    canRedo,
    attachChannel,
    detachChannel: realtime.detach,
    open,
    dispatch,
    undo,
    redo,
    save,
    rename,
    recordServerEdit,
    setSelection,
    dismissNotice,
    close,
  };
});

function stripId(op: SketchOp): SketchOpDraft {
  const { opId: _opId, ...rest } = op;
  return rest as SketchOpDraft;
}
