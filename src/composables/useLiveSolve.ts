import { onBeforeUnmount, ref, shallowRef, toRaw, watch, type Ref } from 'vue';
import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import type { DesignPointsAnalysis } from '@shared/flight/storedAnalysis';
import type { SketchDocument } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import type { PressureDomain } from '@/canvas/colors';
import type { SceneDetail, SceneState } from '@/canvas/scenePainter';
import type { WorkerRequest, WorkerResponse } from '@/workers/solverProtocol';
import { benchEnabled, notePaint, noteSent } from '@/canvas/paintTiming';

/**
 * Where the canvas sends its scene: the solver worker paints it on a transferred canvas right
 * after each solve (src/canvas/scenePainter.ts). `attach` returns false when this browser cannot
 * transfer a canvas; the canvas then paints the scene itself.
 */
export interface ScenePort {
  attach(canvas: HTMLCanvasElement): boolean;
  update(state: SceneState): void;
  /** The scene as a bitmap at `pixelRatio` (PNG export); null without a transferred canvas. */
  picture(pixelRatio: number): Promise<ImageBitmap | null>;
  /**
   * What the scene on screen was last painted with, as the worker reports it (reactive): its
   * detail and its colour domain (the legend's range, [DR8]); null until the first paint.
   */
  shown(): { detail: SceneDetail; domain: PressureDomain } | null;
  /**
   * Sends what is queued for the worker now (a pointer move's solve and scene state) instead of
   * at the end of the task: a drag's preview then reaches the worker before the page re-renders
   * for the move (~0.5 ms at 200 vertices).
   */
  flush(): void;
}

/**
 * Analyses the shown document in the solver worker after every change (also during a drag).
 * Every change is posted at once and the worker solves only the newest it has, so a fast drag
 * never builds a queue and never waits for this thread — older positions are simply skipped.
 *
 * `data` (the solver result) and `analysis` are the selected design point's — the one drawn —
 * and keep the last solvable answer when the shown sketch cannot be solved (mid-drag through a
 * crossing, say); `issues` then says why. `points` holds every design point's analysis. While
 * `selectedOnly` is true (a drag) only the selected point is solved and the others keep their
 * last answer until the release solves them all again.
 */
export function useLiveSolve(document: Ref<SketchDocument | null>, options: { selectedOnly?: Ref<boolean> } = {}) {
  const analysis = shallowRef<SketchAnalysis | null>(null);
  const points = shallowRef<DesignPointsAnalysis | null>(null);
  const data = shallowRef<SolveResult | null>(null);
  /** Sequence number of the request the latest answer belongs to. */
  const dataSeq = ref(0);
  /** Sequence number of the newest request (a solve is pending while it is above dataSeq). */
  const requestSeq = ref(0);
  const issues = shallowRef<{ path: string; message: string }[]>([]);
  const isLoading = ref(false);
  const error = ref<string | null>(null);
  const solveMs = ref<number | null>(null);
  const shown = shallowRef<{ detail: SceneDetail; domain: PressureDomain } | null>(null);

  let worker: Worker | null = null;
  let seq = 0;
  // What goes to the worker is sent once this task's work is done, the scene with the document,
  // so the worker paints each solve with the marks of the same moment.
  let pendingSolve: { seq: number; document: SketchDocument; selectedOnly: boolean } | null = null;
  let pendingScene: SceneState | null = null;
  let flushQueued = false;
  let pictureId = 0;
  const pictures = new Map<number, (bitmap: ImageBitmap | null) => void>();

  function ensureWorker(): Worker {
    if (worker) return worker;
    worker = new Worker(new URL('../workers/solver.worker.ts', import.meta.url), { type: 'module', name: 'shockwright-solver' });
    worker.onmessage = (event: MessageEvent<WorkerResponse>) => {
      const msg = event.data;
      if (msg.type === 'painted') {
        // The worker's clock has its own origin: bring the time onto this page's.
        notePaint(msg.seq, msg.at - performance.timeOrigin, msg);
        return;
      }
      if (msg.type === 'shown') {
        shown.value = { detail: msg.detail, domain: msg.domain };
        return;
      }
      if (msg.type === 'picture') {
        pictures.get(msg.id)?.(msg.bitmap);
        pictures.delete(msg.id);
        return;
      }
      if (msg.seq < dataSeq.value) return;
      if (msg.ok && msg.analysis.result) {
        analysis.value = msg.analysis;
        data.value = msg.analysis.result;
        points.value = mergePoints(points.value, msg.points);
        issues.value = [];
        solveMs.value = msg.solveMs;
        error.value = null;
      } else if (msg.ok) {
        issues.value = [{ path: 'input', message: msg.analysis.problem ?? 'This sketch cannot be solved.' }];
      } else {
        error.value = msg.message;
      }
      dataSeq.value = msg.seq;
      isLoading.value = dataSeq.value < requestSeq.value;
    };
    worker.onerror = (event) => {
      isLoading.value = false;
      error.value = `The live solver stopped: ${event.message || 'unknown error'}. Reload the page to restart it.`;
    };
    return worker;
  }

  /** A selected-only answer replaces that point's entry and keeps the others' last answers. */
  function mergePoints(before: DesignPointsAnalysis | null, next: DesignPointsAnalysis): DesignPointsAnalysis {
    const doc = document.value;
    if (!doc || !before || next.points.length === doc.designPoints.length) return next;
    const fresh = new Map(next.points.map((p) => [p.id, p]));
    const held = new Map(before.points.map((p) => [p.id, p]));
    const merged = doc.designPoints.map((p) => fresh.get(p.id) ?? held.get(p.id)).filter((p): p is NonNullable<typeof p> => !!p);
    return { ...next, points: merged };
  }

  function post(msg: WorkerRequest, transfer: Transferable[] = []) {
    ensureWorker().postMessage(msg, transfer);
  }

  function queueFlush() {
    if (flushQueued) return;
    flushQueued = true;
    queueMicrotask(flush);
  }

  function flush() {
    flushQueued = false;
    if (pendingSolve) {
      noteSent(pendingSolve.seq);
      post({ type: 'solve', ...pendingSolve, scene: pendingScene ?? undefined });
    } else if (pendingScene) {
      post({ type: 'scene', state: pendingScene });
    }
    pendingSolve = null;
    pendingScene = null;
  }

  /** Queues the document for the worker; returns the request's sequence number. */
  function refresh(): number {
    const doc = document.value;
    seq += 1;
    if (!doc) return seq;
    requestSeq.value = seq;
    isLoading.value = true;
    // Plain arrays and numbers: cheap to structure-clone (toRaw in case a caller passes a proxy).
    pendingSolve = { seq, document: toRaw(doc), selectedOnly: options.selectedOnly?.value ?? false };
    queueFlush();
    return seq;
  }

  const scene: ScenePort = {
    attach(canvas) {
      if (typeof canvas.transferControlToOffscreen !== 'function') return false;
      const offscreen = canvas.transferControlToOffscreen();
      post({ type: 'canvas', canvas: offscreen, bench: benchEnabled() }, [offscreen]);
      return true;
    },
    update(state) {
      pendingScene = state;
      queueFlush();
    },
    shown: () => shown.value,
    flush: () => {
      if (flushQueued) flush();
    },
    picture(pixelRatio) {
      const id = ++pictureId;
      return new Promise((resolve) => {
        pictures.set(id, resolve);
        post({ type: 'picture', id, pixelRatio });
      });
    },
  };

  // 'sync' so that a pointer event that changes the preview has its request number at once
  // (the paint-latency measurement pairs the event with the repaint that answers it).
  watch(document, () => refresh(), { flush: 'sync', immediate: true });

  onBeforeUnmount(() => {
    worker?.terminate();
    worker = null;
    for (const resolve of pictures.values()) resolve(null);
    pictures.clear();
  });

  return { data, analysis, points, dataSeq, requestSeq, issues, isLoading, error, solveMs, refresh, scene, lastRequestSeq: () => seq };
}
