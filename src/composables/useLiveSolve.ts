import { onBeforeUnmount, ref, shallowRef, toRaw, watch, type Ref } from 'vue';
import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import type { SketchDocument } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import type { SolveRequest, SolveResponse } from '@/workers/solverProtocol';

/**
 * Analyses the shown document in the solver worker after every change (also during a drag).
 * At most one request is in flight; while it runs only the newest document waits, so a fast
 * drag never builds a queue — older positions are simply skipped.
 *
 * `data` (the solver result) and `analysis` keep the last solvable answer when the shown
 * sketch cannot be solved (mid-drag through a crossing, say); `issues` then says why.
 */
export function useLiveSolve(document: Ref<SketchDocument | null>) {
  const analysis = shallowRef<SketchAnalysis | null>(null);
  const data = shallowRef<SolveResult | null>(null);
  /** Sequence number of the request the latest answer belongs to. */
  const dataSeq = ref(0);
  /** Sequence number of the newest request (a solve is pending while it is above dataSeq). */
  const requestSeq = ref(0);
  const issues = shallowRef<{ path: string; message: string }[]>([]);
  const isLoading = ref(false);
  const error = ref<string | null>(null);
  const solveMs = ref<number | null>(null);

  let worker: Worker | null = null;
  let seq = 0;
  let inFlight = false;
  let waiting: SolveRequest | null = null;

  function ensureWorker(): Worker {
    if (worker) return worker;
    worker = new Worker(new URL('../workers/solver.worker.ts', import.meta.url), { type: 'module', name: 'shockwright-solver' });
    worker.onmessage = (event: MessageEvent<SolveResponse>) => {
      const answer = event.data;
      inFlight = false;
      if (answer.ok && answer.analysis.result) {
        analysis.value = answer.analysis;
        data.value = answer.analysis.result;
        issues.value = [];
        solveMs.value = answer.solveMs;
        error.value = null;
      } else if (answer.ok) {
        issues.value = [{ path: 'input', message: answer.analysis.problem ?? 'This sketch cannot be solved.' }];
      } else {
        error.value = answer.message;
      }
      dataSeq.value = answer.seq;
      if (waiting) send(waiting);
      else isLoading.value = false;
    };
    worker.onerror = (event) => {
      inFlight = false;
      isLoading.value = false;
      error.value = `The live solver stopped: ${event.message || 'unknown error'}. Reload the page to restart it.`;
    };
    return worker;
  }

  function send(request: SolveRequest) {
    waiting = null;
    inFlight = true;
    isLoading.value = true;
    ensureWorker().postMessage(request);
  }

  /** Queues the document; returns the request's sequence number. */
  function refresh(): number {
    const doc = document.value;
    seq += 1;
    if (!doc) return seq;
    requestSeq.value = seq;
    // Plain arrays and numbers: cheap to structure-clone (toRaw in case a caller passes a proxy).
    const request: SolveRequest = { seq, document: toRaw(doc) };
    if (inFlight) waiting = request;
    else send(request);
    return seq;
  }

  // 'sync' so that a pointer event that changes the preview has its request number at once
  // (the paint-latency measurement pairs the event with the repaint that answers it).
  watch(document, () => refresh(), { flush: 'sync', immediate: true });

  onBeforeUnmount(() => {
    worker?.terminate();
    worker = null;
  });

  return { data, analysis, dataSeq, requestSeq, issues, isLoading, error, solveMs, refresh, lastRequestSeq: () => seq };
}
