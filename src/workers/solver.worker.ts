/// <reference lib="webworker" />
import { analyseSketch } from '@shared/flight/analyseSketch';
import type { SolveRequest, SolveResponse } from './solverProtocol';

/**
 * The shared analysis (flap, shock-expansion solve, both thin-section theories, wave map,
 * loads) in a Web Worker, so that solving never blocks drawing. It is the same pure function
 * the server runs on save, so the live preview and the stored result agree. One request in,
 * one answer out, in order; the page coalesces requests (see useLiveSolve).
 */
const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (event: MessageEvent<SolveRequest>) => {
  const { seq, document } = event.data;
  let answer: SolveResponse;
  try {
    const t0 = performance.now();
    const analysis = analyseSketch(document);
    answer = { seq, ok: true, analysis, solveMs: performance.now() - t0 };
  } catch (err) {
    // The solver throws only for programmer errors; say so rather than going silent.
    answer = { seq, ok: false, message: `The solver failed unexpectedly: ${(err as Error).message}` };
  }
  scope.postMessage(answer);
};
