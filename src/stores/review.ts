import { defineStore } from 'pinia';
import { computed, ref, shallowRef, watch } from 'vue';
import { api } from '@/api/client';
import { bump, watchTopic } from '@/composables/useSketchNotices';
import { useSketchStore } from '@/stores/sketch';
import type { Point } from '@shared/model/sketch';
import { importResultSchema, sketchSchema } from '@shared/model/sketchApi';
import { newId } from '@shared/model/ids';
import { pageOf } from '@shared/model/teams';
import {
  activityEntrySchema,
  reviewHistoryEntrySchema,
  reviewState,
  pinDetailSchema,
  pinSummarySchema,
  snapshotDetailSchema,
  snapshotSummarySchema,
  type PinDetail,
  type PinSummary,
  type Approval,
  type PinTarget,
  type ReviewState,
  type ReviewStatus,
  type SnapshotDetail,
} from '@shared/model/review';
import type { PinMarker } from '@/canvas/pins';
import { outlineOnto, type CompareOutlines } from '@/canvas/renderReview';

export const REVIEW_TABS = ['pins', 'snapshots', 'activity', 'approvals'] as const;
export type ReviewTab = (typeof REVIEW_TABS)[number];

/** The canvas shows up to this many pins (the newest); the list pages through all of them. */
export const CANVAS_PIN_LIMIT = 100;

const pinPage = pageOf(pinSummarySchema);

/**
 * The review workflow of the open sketch, shared by the editor's review bar, the review panel
 * and the canvas: which panel tab is open, pin placement, the selected pin, the compared
 * snapshots' outlines, the pins drawn on the canvas and the review status. Server changes go
 * through the actions here; each bumps the notice topics it touched so every panel showing
 * them refreshes (the realtime channel bumps the same topics for other people's changes).
 * Like every store, it never imports Konva or the socket.
 */
export const useReviewStore = defineStore('review', () => {
  const sketch = useSketchStore();

  const panelOpen = ref(false);
  const tab = ref<ReviewTab>('pins');
  /** A click on the canvas places a pin (reviewers and up). */
  const pinMode = ref(false);
  /** Where the pin being written points (placed, not yet posted). */
  const draft = shallowRef<PinTarget | null>(null);
  const selectedPinId = ref<string | null>(null);
  /** Centre the canvas on the selected pin once its thread has loaded. */
  const centrePending = ref(false);
  const compare = shallowRef<CompareOutlines | null>(null);
  const canvasPins = shallowRef<PinSummary[]>([]);
  const canvasPinTotal = ref(0);
  const reviewStatus = ref<ReviewStatus>('draft');
  /** The approval in force, with the revision it was given to [A1]. */
  const approval = shallowRef<Approval | null>(null);
  /**
   * What people read [A2]: computed here from the approval and the sketch's revision, so the
   * header turns to "changed since approval" the moment anyone's edit lands.
   */
  const state = computed<ReviewState>(() => reviewState(reviewStatus.value, approval.value, sketch.revision));

  const openPinCount = computed(() => canvasPins.value.filter((p) => p.status === 'open').length);

  /** What the canvas draws: every loaded pin, the selected one marked, and the draft. */
  const markers = computed<PinMarker[]>(() => {
    const list: PinMarker[] = canvasPins.value.map((p) => ({ id: p.id, at: p.target.at, status: p.status, selected: p.id === selectedPinId.value }));
    if (draft.value) list.push({ id: 'draft', at: draft.value.at, status: 'draft', selected: false });
    return list;
  });

  async function refreshCanvasPins() {
    const id = sketch.sketchId;
    if (!id) return;
    try {
      const page = await api.get(`/api/sketches/${id}/pins?status=all&limit=${CANVAS_PIN_LIMIT}&offset=0`, pinPage);
      if (sketch.sketchId !== id) return;
      canvasPins.value = page.items;
      canvasPinTotal.value = page.total;
    } catch {
      // The list panel shows the error; the canvas keeps the pins it had.
    }
  }

  async function refreshStatus() {
    const id = sketch.sketchId;
    if (!id) return;
    try {
      const s = await api.get(`/api/sketches/${id}`, sketchSchema);
      if (sketch.sketchId === id) takeReview(s);
    } catch {
      // Keep the status shown; the next notice tries again.
    }
  }

  function reset() {
    panelOpen.value = false;
    pinMode.value = false;
    draft.value = null;
    selectedPinId.value = null;
    centrePending.value = false;
    compare.value = null;
    canvasPins.value = [];
    canvasPinTotal.value = 0;
    // What the sketch was opened with, until the refresh answers (no flash of a wrong status).
    reviewStatus.value = sketch.reviewStatus;
    approval.value = sketch.approval;
  }

  function takeReview(s: { reviewStatus: ReviewStatus; approval: Approval | null }) {
    reviewStatus.value = s.reviewStatus;
    approval.value = s.approval;
  }

  watch(
    () => sketch.sketchId,
    (id) => {
      reset();
      if (id) {
        void refreshCanvasPins();
        void refreshStatus();
      }
    },
    { immediate: true },
  );
  watchTopic('pins', () => void refreshCanvasPins());
  watchTopic('status', () => void refreshStatus());

  // ---- panel and canvas ----
  function openPanel(which?: ReviewTab) {
    panelOpen.value = true;
    if (which) tab.value = which;
  }

  function closePanel() {
    panelOpen.value = false;
    pinMode.value = false;
    draft.value = null;
    compare.value = null;
  }

  function startPinning() {
    openPanel('pins');
    selectedPinId.value = null;
    draft.value = null;
    pinMode.value = true;
  }

  function cancelPinning() {
    pinMode.value = false;
    draft.value = null;
  }

  /** The canvas reports where a pin goes; the panel asks for the first comment. */
  function placeDraft(target: PinTarget) {
    draft.value = target;
    pinMode.value = false;
    openPanel('pins');
  }

  function openPin(id: string, options: { centre?: boolean } = {}) {
    selectedPinId.value = id;
    centrePending.value = !!options.centre;
    draft.value = null;
    pinMode.value = false;
    openPanel('pins');
  }

  function closePin() {
    selectedPinId.value = null;
    centrePending.value = false;
  }

  /**
   * Overlays two compared sides' outlines on the canvas (A dashed, B solid). Another sketch's
   * outline is put on A's nose and chord; the answer says whether it was.
   */
  function showCompare(a: readonly Point[], b: readonly Point[]): { fitted: boolean } {
    const onto = outlineOnto(a, b);
    compare.value = { a, b: onto.points, labelA: 'A', labelB: 'B' };
    return { fitted: onto.fitted };
  }

  // ---- server actions (each refreshes what it changed) ----
  function requireSketch(): string {
    if (!sketch.sketchId) throw new Error('No sketch is open.');
    return sketch.sketchId;
  }

  async function createPin(target: PinTarget, body: string, mentions: string[]): Promise<PinDetail> {
    const pin = await api.post(`/api/sketches/${requireSketch()}/pins`, { target, body, mentions }, pinDetailSchema);
    draft.value = null;
    selectedPinId.value = pin.id;
    bump('pins');
    return pin;
  }

  async function reply(pinId: string, body: string, mentions: string[]): Promise<PinDetail> {
    const pin = await api.post(`/api/pins/${pinId}/replies`, { body, mentions }, pinDetailSchema);
    bump('pins');
    return pin;
  }

  async function setPinStatus(pinId: string, status: 'open' | 'resolved'): Promise<PinDetail> {
    const pin = await api.post(`/api/pins/${pinId}/${status === 'resolved' ? 'resolve' : 'reopen'}`, {}, pinDetailSchema);
    bump('pins');
    return pin;
  }

  async function saveSnapshot(name: string, note: string): Promise<SnapshotDetail> {
    const id = requireSketch();
    // The server captures what it has stored: send our edits first.
    await sketch.save();
    const snap = await api.post(`/api/sketches/${id}/snapshots`, { name, note }, snapshotDetailSchema);
    bump('snapshots');
    return snap;
  }

  /** Takes in a new revision the server made (restore, import): the channel brings it when live. */
  async function reloadAfterServerEdit(id: string) {
    if (!sketch.live && sketch.sketchId === id) await sketch.open(id);
  }

  /**
   * Restores a snapshot as a new revision; the server first keeps the current state as an
   * automatic snapshot, so nothing is lost.
   */
  async function restoreSnapshot(snapshotId: string): Promise<void> {
    const id = requireSketch();
    await sketch.save();
    await api.post(`/api/snapshots/${snapshotId}/restore`, {}, sketchSchema);
    compare.value = null;
    await reloadAfterServerEdit(id);
    bump('snapshots', 'activity');
  }

  /**
   * Replaces the section with imported coordinates (and the loads chord, when the file gave one);
   * the server snapshots the sketch first. The import then is one step of our undo history: undo
   * puts back the section (and chord) it replaced, as an edit everyone receives.
   */
  async function importSection(input: { points: Point[]; fileName: string; loadsChordM: number | null }): Promise<void> {
    const id = requireSketch();
    await sketch.save();
    const body = { points: input.points, fileName: input.fileName, ...(input.loadsChordM === null ? {} : { loadsChordM: input.loadsChordM }) };
    const answer = await api.post(`/api/sketches/${id}/import`, body, importResultSchema);
    await reloadAfterServerEdit(id);
    const chord = input.loadsChordM === null ? {} : { loadsChordM: input.loadsChordM };
    const before = answer.imported.before;
    sketch.recordServerEdit(
      { type: 'replaceSection', opId: newId('op'), points: input.points, ...chord },
      { type: 'replaceSection', opId: newId('op'), points: before.points, ...(before.loadsChordM === undefined ? {} : { loadsChordM: before.loadsChordM }) },
    );
    bump('snapshots', 'activity');
  }

  /**
   * Records an outcome for the revision the person looked at [A3]; the server refuses it (409)
   * when the sketch has moved on meanwhile. Our own edits are sent first, so they are not lost.
   */
  async function approve(revision: number, note: string): Promise<void> {
    const id = requireSketch();
    await sketch.save();
    takeReview(await api.post(`/api/sketches/${id}/approvals`, { revision, note }, sketchSchema));
    bump('status');
  }

  async function requestChanges(revision: number, note: string): Promise<void> {
    const id = requireSketch();
    await sketch.save();
    takeReview(await api.post(`/api/sketches/${id}/change-requests`, { revision, note }, sketchSchema));
    bump('status');
  }

  /** Owners only, after they confirmed it [A7]: back to draft; the history keeps every earlier outcome [A5]. */
  async function resetReview(): Promise<void> {
    const id = requireSketch();
    takeReview(await api.post(`/api/sketches/${id}/review-reset`, { confirm: true }, sketchSchema));
    bump('status');
  }

  async function requestReview(reviewerIds: string[], message: string): Promise<void> {
    const id = requireSketch();
    await sketch.save();
    takeReview(await api.post(`/api/sketches/${id}/review-requests`, { reviewerIds, message }, sketchSchema));
    bump('status');
  }

  return {
    panelOpen,
    tab,
    pinMode,
    draft,
    selectedPinId,
    centrePending,
    compare,
    canvasPins,
    canvasPinTotal,
    reviewStatus,
    approval,
    state,
    openPinCount,
    markers,
    refreshCanvasPins,
    refreshStatus,
    openPanel,
    closePanel,
    startPinning,
    cancelPinning,
    placeDraft,
    openPin,
    closePin,
    showCompare,
    createPin,
    reply,
    setPinStatus,
    saveSnapshot,
    restoreSnapshot,
    importSection,
    approve,
    requestChanges,
    resetReview,
    requestReview,
  };
});

/** Pages of the review lists, as the API answers them. */
export const pinPageSchema = pinPage;
export const snapshotPageSchema = pageOf(snapshotSummarySchema);
export const activityPageSchema = pageOf(activityEntrySchema);
export const reviewHistoryPageSchema = pageOf(reviewHistoryEntrySchema);
