/**
 * Pointer-to-paint latency for the canvas benchmark (tests/bench/canvas.bench.ts). Off unless
 * the page sets `globalThis.__shockwrightBench = true` before loading; then each pointer move
 * that changes the shown section is paired with the first wave-map repaint whose result covers
 * it (the request numbers of useLiveSolve), and two latencies in ms are recorded:
 * - from the event's own timestamp (includes the browser's input queueing), and
 * - from when our handler ran (the editor's own share: solve in the worker, render, draw).
 */
interface BenchGlobals {
  __shockwrightBench?: boolean;
  __shockwrightPaintLatencies?: { fromEvent: number[]; fromHandler: number[] };
}

const g = globalThis as typeof globalThis & BenchGlobals;
const pending: { seq: number; eventTime: number; handlerTime: number }[] = [];
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

/** The wave map was just drawn from the answer to request `seq`. */
export function notePaint(seq: number): void {
  if (!benchEnabled() || pending.length === 0) return;
  const now = performance.now();
  const out = (g.__shockwrightPaintLatencies ??= { fromEvent: [], fromHandler: [] });
  while (pending.length > 0 && pending[0].seq <= seq) {
    const p = pending.shift()!;
    out.fromEvent.push(now - p.eventTime);
    out.fromHandler.push(now - p.handlerTime);
  }
}
