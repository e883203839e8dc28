/**
 * Pointer-to-paint latency for the canvas benchmark (tests/bench/canvas.bench.ts). Off unless
 * the page sets `globalThis.__shockwrightBench = true` before loading; then each pointer move
 * that changes the shown section is paired with the first wave-map repaint whose result covers
 * it (the request numbers of useLiveSolve), and two latencies in ms are recorded:
 * - from the event's own timestamp (includes the browser's input queueing), and
 * - from when our handler ran (the editor's own share: solve in the worker, render, draw).
 * With the worker painting, also until the drawing was rasterised (the worker reads a pixel
 * after drawing in the bench, which rasterises the recorded calls there and then; otherwise the
 * canvas does it in a task of its own right after), and, for a move whose own request was solved and painted, where the
 * time went: from the handler until the request is posted (the page's work before it), from
 * the handler to the worker starting on it (that, the copy, and waiting behind an earlier solve), the solve, building the draw lists, the draw calls, and
 * the raster.
 */
import { firstItem } from '@shared/util/invariant';

interface Breakdown {
  /** From the handler's start until the request went to the worker (this page's work before posting it). */
  toPost: number[];
  toWorker: number[];
  solve: number[];
  lists: number[];
  paint: number[];
  raster: number[];
}

interface BenchGlobals {
  __shockwrightBench?: boolean;
  __shockwrightPaintLatencies?: { fromEvent: number[]; fromHandler: number[]; rasterised?: number[]; breakdown?: Breakdown };
}

const g = globalThis as typeof globalThis & BenchGlobals;
const pending: { seq: number; eventTime: number; handlerTime: number }[] = [];
/** Per request: when it went to the worker. */
const requests = new Map<number, { sentAt: number }>();
let handlerStart = 0;

export function benchEnabled(): boolean {
  return g.__shockwrightBench === true;
}

/** Called first thing in the canvas's pointer handler. */
export function noteHandlerStart(): void {
  if (benchEnabled()) handlerStart = performance.now();
}

/** A pointer event (timestamp `eventTime`, performance.now() clock) produced solve request `seq`. */
export function noteInput(seq: number, eventTime: number): void {
  if (!benchEnabled()) return;
  pending.push({ seq, eventTime, handlerTime: handlerStart || performance.now() });
}

/** Request `seq` was posted to the solver worker. */
export function noteSent(seq: number): void {
  if (benchEnabled()) requests.set(seq, { sentAt: performance.now() });
}

/**
 * The wave map was drawn from the answer to request `seq`, at `at` (this page's clock; now by
 * default). The worker says how long it solved and painted.
 */
export function notePaint(seq: number, at: number = performance.now(), worker?: { solveMs: number; listsMs: number; paintMs: number; rasterMs: number }): void {
  if (!benchEnabled() || pending.length === 0) return;
  const out = (g.__shockwrightPaintLatencies ??= { fromEvent: [], fromHandler: [] });
  const breakdown = (out.breakdown ??= { toPost: [], toWorker: [], solve: [], lists: [], paint: [], raster: [] });
  const rasterised = (out.rasterised ??= []);
  const r = requests.get(seq);
  while (pending.length > 0 && firstItem(pending).seq <= seq) {
    const p = pending.shift()!;
    out.fromEvent.push(at - p.eventTime);
    out.fromHandler.push(at - p.handlerTime);
    if (worker) rasterised.push(at + worker.rasterMs - p.eventTime);
    if (p.seq === seq && r && worker) {
      breakdown.toPost.push(r.sentAt - p.handlerTime);
      breakdown.toWorker.push(at - worker.paintMs - worker.listsMs - worker.solveMs - p.handlerTime);
      breakdown.solve.push(worker.solveMs);
      breakdown.lists.push(worker.listsMs);
      breakdown.paint.push(worker.paintMs);
      breakdown.raster.push(worker.rasterMs);
    }
  }
  for (const k of requests.keys()) if (k <= seq) requests.delete(k);
}
