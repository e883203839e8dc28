import { api, ApiError } from '@/api/client';
import { sketchSchema, type Sketch } from '@shared/model/sketchApi';
import type { SketchDocument } from '@shared/model/sketch';
import { applyOp, type SketchOp } from '@shared/model/ops';
import { AUTOSAVE_DEBOUNCE_MS, AUTOSAVE_RETRY_MS } from '@/timing';
import type { SaveState, SketchState } from './sketchState';

/**
 * Saving without a realtime channel: the whole document is PUT with the revision it was based
 * on, after AUTOSAVE_DEBOUNCE_MS of quiet. On a 409 the server's document is reloaded, the
 * edits not yet saved are re-applied on top (those that still apply) and the person is told.
 */
export function createAutosave(s: SketchState) {
  /** The document the server holds at `revision`. */
  let savedDocument: SketchDocument | null = null;
  /** Ops applied locally since `savedDocument`, oldest first (re-applied after a conflict). */
  let unsavedOps: SketchOp[] = [];
  let saveTimer: ReturnType<typeof setTimeout> | null = null;
  let saving: Promise<void> | null = null;

  function cancel() {
    if (saveTimer) clearTimeout(saveTimer);
    saveTimer = null;
  }

  function schedule(delayMs: number) {
    cancel();
    saveTimer = setTimeout(() => {
      saveTimer = null;
      void save();
    }, delayMs);
  }

  /** A freshly opened (or closed) document: nothing unsaved. */
  function reset(document: SketchDocument | null) {
    cancel();
    savedDocument = document;
    unsavedOps = [];
  }

  /** A local edit changed the document: remember it and save after a quiet moment. */
  function recordEdit(op: SketchOp) {
    unsavedOps.push(op);
    if (s.saveState.value !== 'saving') s.saveState.value = 'unsaved';
    schedule(AUTOSAVE_DEBOUNCE_MS);
  }

  /** Saves now (also what the timer calls). Resolves when the document is stored. */
  async function save(): Promise<void> {
    cancel();
    if (saving) {
      await saving;
      if (s.document.value !== savedDocument) return save();
      return;
    }
    const doc = s.document.value;
    const id = s.sketchId.value;
    if (!doc || !id || doc === savedDocument) {
      if (doc === savedDocument && s.saveState.value !== 'error') s.saveState.value = 'saved';
      return;
    }
    const sentOps = unsavedOps.length;
    s.saveState.value = 'saving';
    s.saveError.value = null;
    saving = (async () => {
      try {
        const sketch = await api.put(`/api/sketches/${id}/document`, { document: doc, baseRevision: s.revision.value }, sketchSchema);
        if (s.sketchId.value !== id) return;
        s.accept(sketch);
        savedDocument = doc;
        unsavedOps = unsavedOps.slice(sentOps);
        s.saveState.value = s.document.value === doc ? 'saved' : 'unsaved';
      } catch (err) {
        if (s.sketchId.value !== id) return;
        if (err instanceof ApiError && err.status === 409) await rebaseAfterConflict(id);
        else if (err instanceof ApiError && err.status === 403) {
          s.readOnly.value = true;
          s.saveState.value = 'error';
          s.saveError.value = err.message;
          s.notice.value = { kind: 'error', message: `Not saved: ${err.message}` };
        } else {
          s.saveState.value = 'error';
          s.saveError.value = err instanceof ApiError ? err.message : 'The sketch could not be saved.';
          schedule(AUTOSAVE_RETRY_MS);
        }
      }
    })();
    try {
      await saving;
    } finally {
      saving = null;
    }
    // The request above may have changed the state (TS cannot see through the await).
    if ((s.saveState.value as SaveState) === 'unsaved') schedule(AUTOSAVE_DEBOUNCE_MS);
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
      s.saveState.value = 'error';
      s.saveError.value = err instanceof ApiError ? err.message : 'The sketch could not be reloaded.';
      schedule(AUTOSAVE_RETRY_MS);
      return;
    }
    s.accept(server);
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
    s.document.value = doc;
    s.emitChange({ op: null, origin: 'remote', userId: null });
    s.undoStack.value = [];
    s.redoStack.value = [];
    s.selection.value = s.selection.value.filter((i) => i < doc.section.points.length);
    const who = server.updatedByName ? `${server.updatedByName} saved` : 'Someone saved';
    const mine =
      kept.length === 0 && dropped === 0
        ? ''
        : dropped === 0
          ? ` Your ${kept.length} unsaved edit${kept.length === 1 ? ' was' : 's were'} re-applied on top.`
          : ` ${kept.length} of your unsaved edits were re-applied on top; ${dropped} no longer fit and ${dropped === 1 ? 'was' : 'were'} dropped.`;
    s.notice.value = { kind: 'conflict', message: `${who} this sketch while you were editing (now revision ${server.revision}); it was reloaded.${mine} Undo history was cleared.` };
    s.saveState.value = kept.length > 0 ? 'unsaved' : 'saved';
  }

  return { reset, recordEdit, save, cancel };
}
