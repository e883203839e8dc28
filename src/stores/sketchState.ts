import { computed, ref, shallowRef } from 'vue';
import type { Sketch } from '@shared/model/sketchApi';
import type { SketchDocument } from '@shared/model/sketch';
import type { SketchOp } from '@shared/model/ops';
import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import { readSelectedAnalysis } from '@shared/flight/storedAnalysis';
import type { EditOp } from '@shared/protocol/messages';

/** One local edit in the history: the op as applied and the op that takes it back. */
export interface HistoryEntry {
  op: SketchOp;
  inverse: SketchOp;
}

export type SaveState = 'saved' | 'unsaved' | 'saving' | 'error';

export interface SketchNotice {
  kind: 'conflict' | 'error' | 'info';
  message: string;
}

/** A change to the document shown, as open form fields hear about it. */
export interface DocumentChange {
  /** The edit as it changed the shown document; null when unknown (reload, snapshot). */
  op: EditOp | null;
  origin: 'local' | 'remote';
  /** Who made a remote edit (null: unknown). */
  userId: string | null;
}

/**
 * The refs of the open sketch, shared by the store (`sketch.ts`) and its two ways of getting
 * edits to the server: autosave over REST (`sketchAutosave.ts`) and the realtime channel
 * (`sketchRealtime.ts`). Plain state and two helpers; no behaviour beyond that.
 */
export function createSketchState() {
  const state = {
    sketchId: ref<string | null>(null),
    teamId: ref<string | null>(null),
    title: ref(''),
    document: shallowRef<SketchDocument | null>(null),
    revision: ref(0),
    updatedAt: ref<string | null>(null),
    updatedByName: ref<string | null>(null),
    /** What the server analysed and stored (the authoritative result), and the revision it belongs to. */
    serverAnalysis: shallowRef<SketchAnalysis | null>(null),
    serverStatus: ref<Sketch['lastSolveStatus']>(null),
    /** Review status and approval as loaded with the sketch (the review store keeps them current). */
    reviewStatus: ref<Sketch['reviewStatus']>('draft'),
    approval: shallowRef<Sketch['approval']>(null),
    isLoading: ref(false),
    loadError: ref<string | null>(null),
    saveState: ref<SaveState>('saved'),
    saveError: ref<string | null>(null),
    notice: ref<SketchNotice | null>(null),
    /** Why the last edit was refused (shown near the canvas), cleared by the next good edit. */
    lastRejection: ref<string | null>(null),
    readOnly: ref(false),
    selection: ref<number[]>([]),
    undoStack: shallowRef<HistoryEntry[]>([]),
    redoStack: shallowRef<HistoryEntry[]>([]),
    /** True while edits travel over the realtime channel. */
    live: ref(false),
  };
  const listeners = new Set<(change: DocumentChange) => void>();
  return {
    ...state,
    isDirty: computed(() => state.saveState.value !== 'saved'),
    /** Takes the server's view of the sketch (metadata, stored result, review status). */
    accept(sketch: Sketch) {
      state.sketchId.value = sketch.id;
      state.teamId.value = sketch.teamId;
      state.title.value = sketch.title;
      state.revision.value = sketch.revision;
      state.updatedAt.value = sketch.updatedAt;
      state.updatedByName.value = sketch.updatedByName;
      state.serverAnalysis.value = asAnalysis(sketch.lastResult);
      state.serverStatus.value = sketch.lastSolveStatus;
      state.reviewStatus.value = sketch.reviewStatus;
      state.approval.value = sketch.approval;
    },
    /** Form fields subscribe here to hear who changed what (see useFieldEdits). */
    onDocumentChange(listener: (change: DocumentChange) => void): () => void {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    emitChange(change: DocumentChange) {
      for (const l of [...listeners]) l(change);
    },
  };
}

export type SketchState = ReturnType<typeof createSketchState>;

/** The stored analysis of the selected design point, if the server stored one (older rows may not). */
export function asAnalysis(raw: unknown): SketchAnalysis | null {
  return readSelectedAnalysis(raw);
}
