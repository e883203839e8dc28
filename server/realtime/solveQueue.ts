import { Worker } from 'node:worker_threads';
import type { Db } from '../db/client.ts';
import type { AnalysisStatus } from '../../shared/model/analysis.ts';
import type { SketchDocument } from '../../shared/model/sketch.ts';
import { solveDocument } from '../api/sketches/solveDocument.ts';
import { storeAnalysis } from './repository.ts';
import type { SolveAnswer, SolveRequest } from './solveWorker.ts';
import { errorForLog } from '../log.ts';

/**
 * The server's solve of each sketch, run after its edits commit — never inside the row lock,
 * so a slow solve (tens of ms for a 2,000-vertex section) holds up no other editor — and stored
 * tagged with the revision it was computed on (`storeAnalysis` never replaces a newer result).
 *
 * Per sketch, solves are coalesced: one runs at a time, at most one waits (a newer request
 * replaces the waiting one) and a sketch is solved at most every SOLVE_MIN_INTERVAL_MS, so a
 * busy sketch costs a few solves a second however many edits arrive. Solves run in a worker
 * thread, so the event loop keeps answering edits while a large section is solved.
 */
export interface SolveQueue {
  /** The sketch is at `revision` with `document`: solve it (soon) and store the result. */
  schedule(sketchId: string, revision: number, document: SketchDocument): void;
  /** Resolves once nothing is solving or waiting. */
  idle(): Promise<void>;
}

export const SOLVE_MIN_INTERVAL_MS = 250;

export type Solver = (document: SketchDocument) => Promise<{ status: AnalysisStatus; resultJson: string }>;

export function createSolveQueue(db: Db, log: (line: string) => void, solve: Solver = solveInWorker): SolveQueue {
  const sketches = new Map<string, { running: boolean; waiting: { revision: number; document: SketchDocument } | null; lastStart: number; newest: number }>();
  let idleWaiters: (() => void)[] = [];

  function checkIdle(): void {
    if (sketches.size > 0) return;
    const waiters = idleWaiters;
    idleWaiters = [];
    for (const w of waiters) w();
  }

  async function run(sketchId: string): Promise<void> {
    const entry = sketches.get(sketchId)!;
    entry.running = true;
    while (entry.waiting) {
      const wait = entry.lastStart + SOLVE_MIN_INTERVAL_MS - performance.now();
      if (wait > 0) await new Promise((r) => setTimeout(r, wait).unref());
      const job = entry.waiting;
      entry.waiting = null;
      entry.lastStart = performance.now();
      try {
        const solved = await solve(job.document);
        await storeAnalysis(db, sketchId, job.revision, solved.status, solved.resultJson);
      } catch (err) {
        // The next edit (or a join) schedules it again; the result stays tagged with its older revision.
        log(`[realtime] solve of ${sketchId} at revision ${job.revision} failed: ${errorForLog(err, false)}`);
      }
    }
    entry.running = false;
    sketches.delete(sketchId);
    checkIdle();
  }

  return {
    schedule(sketchId, revision, document) {
      let entry = sketches.get(sketchId);
      if (!entry) {
        entry = { running: false, waiting: null, lastStart: -Infinity, newest: -1 };
        sketches.set(sketchId, entry);
      }
      // Already solving or waiting for this revision or a newer one: nothing to add.
      if (revision <= entry.newest) return;
      entry.newest = revision;
      entry.waiting = { revision, document };
      if (!entry.running) void run(sketchId);
    },
    idle() {
      if (sketches.size === 0) return Promise.resolve();
      return new Promise((resolve) => idleWaiters.push(resolve));
    },
  };
}

// ── One solver thread per process, started on first use ───────────────────────────────────────

let worker: Worker | null = null;
let workerBroken = false;
let nextId = 1;
const pending = new Map<number, { resolve: (a: { status: AnalysisStatus; resultJson: string }) => void; reject: (e: Error) => void }>();

function startWorker(): Worker {
  // The server runs TypeScript through tsx; the worker registers it before loading its module.
  const url = new URL('./solveWorker.ts', import.meta.url).href;
  const w = new Worker(`import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(url)}); });`, { eval: true, name: 'shockwright-solver' });
  w.unref();
  w.on('message', (answer: SolveAnswer) => {
    const p = pending.get(answer.id);
    if (!p) return;
    pending.delete(answer.id);
    if (answer.ok) p.resolve({ status: answer.status, resultJson: answer.resultJson });
    else p.reject(new Error(answer.message));
  });
  const fail = (err: Error) => {
    if (worker === w) worker = null;
    for (const p of pending.values()) p.reject(err);
    pending.clear();
  };
  w.on('error', (err) => {
    // A thread that cannot start (or crashed): solve on the main thread from now on.
    workerBroken = true;
    fail(err);
  });
  w.on('exit', (code) => fail(new Error(`solver thread exited with ${code}`)));
  return w;
}

/** Solves in the process's solver thread (on the main thread if the thread cannot run). */
export const solveInWorker: Solver = async (document) => {
  if (workerBroken) return solveInline(document);
  worker ??= startWorker();
  const id = nextId++;
  const request: SolveRequest = { id, document };
  return new Promise((resolve, reject) => {
    pending.set(id, { resolve, reject });
    worker!.postMessage(request);
  }).catch(() => solveInline(document)) as Promise<{ status: AnalysisStatus; resultJson: string }>;
};

/** The same solve on the calling thread. */
export const solveInline: Solver = async (document) => {
  const solved = solveDocument(document);
  return { status: solved.status, resultJson: JSON.stringify(solved.result) };
};
