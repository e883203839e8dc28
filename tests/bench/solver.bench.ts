/**
 * Solver benchmark: `npm run bench`. Prints solve times; asserts nothing (speed is measured
 * here, never in tests).
 *
 * - Core solve (march, trailing edge, loads, both theories; `options.waves = false`) and the
 *   full solve with the wave map, for 4, 16, 64 and 200 facets. The core solve's result is
 *   the complete one the API and the worker receive (every facet record built, nothing
 *   deferred); only the wave map is left out. The figure is the core solve as a caller pays
 *   it, which takes two things:
 *   - The process has drawn wave maps too, as the server and the section worker have: each
 *     row warms up the core solve and the full solve (300 ms each) before it is timed, and the
 *     rows run in order. A helper shared by the whole program (a list reader, say) that the
 *     wave map also calls sees more kinds of data there, and the engine compiles it more
 *     generally for the core solve as well: a harness that runs only the core solve measured
 *     a quarter less than this bench for the same code (2026-12-03) until the core solve
 *     stopped reading its lists through such a helper (shared/solver/README.md, Cost).
 *   - Each sample is a batch of calls lasting about 10 ms (the batch size set from the
 *     warm-up's rate), timed with process.hrtime.bigint and divided by the batch size. The
 *     garbage the solve leaves is collected every hundred or so calls of 200 facets; a sample
 *     of 1 ms (as this bench took before) held a collection in fewer than half the samples,
 *     so the median left the collections out. Ten-millisecond samples each carry their share,
 *     so the median is the cost per call with the collections paid; the CPU time's mean
 *     over all samples is printed beside its median. Median and p95 are over 100 samples
 *     (a second of calls).
 *   The same samples' CPU time (process.cpuUsage, user + system) is printed beside the wall
 *   time: other work on a busy machine inflates the wall time more than this process's CPU
 *   time, so the CPU column is the one to compare between runs at different loads. It is not
 *   load-free either (a busy neighbour shares caches and perhaps the core): compare old and
 *   new code back to back, and read the load average printed with every table.
 * - `npm run bench -- --core` prints the section solve table only (a few seconds).
 * - An envelope of 40 Mach × 61 α on a 64-facet section (core solve), median and p95 of
 *   whole-envelope times.
 * - A study of 40 Mach × 61 α × 5 flap deflections (12 200 points) on the 64-facet fin with a
 *   flap, end to end through shared/flight/study.ts in Node (one pass, and in 30 ms slices as the
 *   server runs it), then in headless Chromium through the Vite bundle of the study worker;
 *   and the PDF report's time without and with that study.
 * Targets: 200 facets ≤ 20 µs median (core); envelope ≤ 100 ms; study ≤ 0.5 s in the worker;
 * core cost linear in facets:
 * the marginal column (extra time per extra facet since the previous row) should stay roughly
 * flat, while ns/facet falls as the fixed cost is spread. The wave map is O(L log L) in its lines.
 *
 * The section is our own: a cambered lens ("Shockwright demo fin", 6 % thick, 1 % camber)
 * with cosine-spaced vertices.
 */
import { cpus, loadavg } from 'node:os';
import type { SolveInput } from '../../shared/model/solveInput';
import { solveSection } from '../../shared/solver/solveSection';
import { itemAt } from '../../shared/util/invariant.ts';

function demoSection(facets: number): [number, number][] {
  const m = facets / 2; // facets per surface
  const upper: [number, number][] = [];
  const lower: [number, number][] = [];
  for (let i = 0; i <= m; i++) {
    const x = 0.5 * (1 - Math.cos((Math.PI * i) / m));
    const half = 0.06 * 2 * x * (1 - x); // 6 % thick lens
    const camber = 0.01 * 4 * x * (1 - x);
    upper.push([x, camber + half]);
    lower.push([x, camber - half]);
  }
  // Nose → upper → tail → lower back toward the nose (clockwise).
  return [...upper, ...lower.slice(1, -1).reverse()];
}

function input(points: [number, number][], mach: number, alphaDeg: number, waves: boolean): SolveInput {
  return {
    section: { points },
    flow: { mach, alphaDeg, gamma: 1.4 },
    options: { fieldExtentChords: 1.5, waves },
  };
}

function quantile(sorted: number[], q: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.round(q * (sorted.length - 1))));
  return itemAt(sorted, i);
}

/** Per-call times (µs) of `samples` batches of `batch` calls each. */
function timePerCall(fn: () => unknown, batch: number, samples: number): number[] {
  return timeAndCpuPerCall(fn, batch, samples).wall;
}

/** Per-call wall and CPU times (µs, each list sorted) of `samples` batches of `batch` calls. */
function timeAndCpuPerCall(fn: () => unknown, batch: number, samples: number): { wall: number[]; cpu: number[] } {
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let s = 0; s < samples; s++) {
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    for (let i = 0; i < batch; i++) fn();
    const t1 = process.hrtime.bigint();
    const c = process.cpuUsage(c0);
    wall.push(Number(t1 - t0) / 1000 / batch);
    cpu.push((c.user + c.system) / batch);
  }
  return { wall: wall.sort((a, b) => a - b), cpu: cpu.sort((a, b) => a - b) };
}

let sink = 0;
function consume(r: ReturnType<typeof solveSection>): void {
  sink += r.coefficients ? r.coefficients.cl : 1;
}

/** Calls `fn` for `ms` milliseconds; returns how many calls that took. */
function warmUp(fn: () => unknown, ms: number): number {
  const end = Date.now() + ms;
  let calls = 0;
  while (Date.now() < end) {
    fn();
    calls++;
  }
  return calls;
}

/** Samples of this many milliseconds each carry their share of the garbage collections. */
const CORE_SAMPLE_MS = 10;

const cpu = cpus()[0];
console.log(
  `Node ${process.version}, ${cpus().length} × ${cpu?.model ?? 'cpu'}${cpu?.speed ? ` @ ${cpu.speed} MHz` : ''}, ` +
    `load average ${loadavg().map((l) => l.toFixed(2)).join(' / ')} (other work on the machine inflates the figures)`,
);
console.log('');

const rows: string[][] = [];
let previous: { facets: number; median: number } | null = null;
for (const facets of [4, 16, 64, 200]) {
  const pts = demoSection(facets);
  const core = input(pts, 2.5, 3, false);
  const full = input(pts, 2.5, 3, true);
  const check = solveSection(core);
  if (check.status !== 'ok' || check.surfaces.upper.length + check.surfaces.lower.length !== facets) {
    throw new Error(`bench section with ${facets} facets did not solve: ${check.status}`);
  }
  const coreFn = () => consume(solveSection(core));
  const fullFn = () => consume(solveSection(full));
  const coreRate = warmUp(coreFn, 300) / 300; // calls per ms
  warmUp(fullFn, 300);
  const coreBatch = Math.max(10, Math.round(coreRate * CORE_SAMPLE_MS));
  const { wall: c, cpu: cCpu } = timeAndCpuPerCall(coreFn, coreBatch, 100);
  const cCpuMean = cCpu.reduce((a, b) => a + b, 0) / cCpu.length;
  const fullBatch = Math.max(2, Math.round(400 / facets));
  const f = timePerCall(fullFn, fullBatch, 150);
  const cMed = quantile(c, 0.5);
  // Marginal cost of the extra facets since the previous row: flat when the solve is linear.
  const marginal = previous ? ((cMed - previous.median) * 1000) / (facets - previous.facets) : NaN;
  previous = { facets, median: cMed };
  rows.push([
    String(facets),
    cMed.toFixed(2),
    quantile(c, 0.95).toFixed(2),
    quantile(cCpu, 0.5).toFixed(2),
    cCpuMean.toFixed(2),
    ((cMed * 1000) / facets).toFixed(0),
    Number.isNaN(marginal) ? '–' : marginal.toFixed(0),
    quantile(f, 0.5).toFixed(1),
    quantile(f, 0.95).toFixed(1),
    String(solveSection(full).waves.length),
  ]);
}

const header = [
  'facets',
  'core median µs',
  'core p95 µs',
  'core CPU median µs',
  'core CPU mean µs',
  'core ns/facet',
  'marginal ns/facet',
  'with wave map median µs',
  'with wave map p95 µs',
  'waves',
];
const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => itemAt(r, i).length)));
const fmtRow = (r: string[]) => r.map((c, i) => c.padStart(itemAt(widths, i))).join('  ');
console.log(`Section solve (demo fin, M 2.5, α 3°, γ 1.4; core: samples of ${CORE_SAMPLE_MS} ms, wave maps drawn in the same process)`);
console.log(fmtRow(header));
for (const r of rows) console.log(fmtRow(r));

const load = () => loadavg().map((l) => l.toFixed(2)).join(' / ');
console.log(`  (load average now ${load()}; targets on a quiet machine: 200 facets core ≤ 20 µs, wave map ≤ 5 ms)`);
if (process.argv.includes('--core')) process.exit(0);

// The wave map with its interactions (a sweep, O(L log L) in its lines) on large sections:
// the 2000-point demo fin and a 2000-point biconvex arc, both with the default field and a
// far field of 50 chords. Target: ≤ 50 ms for 2 000 points (default field), on a quiet machine.
{
  const biconvex = (points: number): [number, number][] => {
    const m = points / 2;
    const upper: [number, number][] = [];
    const lower: [number, number][] = [];
    for (let i = 0; i <= m; i++) {
      const x = i / m;
      const y = 0.2 * x * (1 - x);
      upper.push([x, y]);
      lower.push([x, -y]);
    }
    return [...upper, ...lower.slice(1, -1).reverse()];
  };
  console.log('');
  console.log('Wave map with interactions (median / p95 over 15 solves, ms)');
  for (const [name, pts, mach, alphaDeg] of [
    ['demo fin, 2 000 points', demoSection(2000), 2.5, 3],
    ['10 % biconvex arc, 2 000 points', biconvex(2000), 2, 0],
  ] as const) {
    for (const extent of [1.5, 50]) {
      const inp: SolveInput = { section: { points: pts.map((p) => [p[0], p[1]]) }, flow: { mach, alphaDeg, gamma: 1.4 }, options: { fieldExtentChords: extent, waves: true } };
      const fn = () => consume(solveSection(inp));
      warmUp(fn, 600);
      const t = timePerCall(fn, 1, 15).map((us) => us / 1000);
      const r = solveSection(inp);
      console.log(
        `  ${name}, field ${extent} chords: ${quantile(t, 0.5).toFixed(1)} / ${quantile(t, 0.95).toFixed(1)} ms ` +
          `(${r.waves.length} waves, ${r.intersections.length} meetings; load ${load()})`,
      );
    }
  }
}

// Envelope: 40 Mach × 61 α on a 64-facet section, core solve.
const envPts = demoSection(64);
const machs = Array.from({ length: 40 }, (_, i) => 1.2 + (i * (5 - 1.2)) / 39);
const alphas = Array.from({ length: 61 }, (_, j) => -15 + j * 0.5);
const envInputs = machs.flatMap((m) => alphas.map((a) => input(envPts, m, a, false)));
const statusCount: Record<string, number> = {};
for (const inp of envInputs) {
  const s = solveSection(inp).status;
  statusCount[s] = (statusCount[s] ?? 0) + 1;
}
const envFn = () => {
  for (const inp of envInputs) consume(solveSection(inp));
};
warmUp(envFn, 500);
const env = timePerCall(envFn, 1, 30).map((us) => us / 1000);
console.log('');
console.log(`Envelope: ${machs.length} Mach (1.2–5.0) × ${alphas.length} α (−15°…15°) = ${envInputs.length} solves, 64 facets, no wave map`);
console.log(`  median ${quantile(env, 0.5).toFixed(1)} ms, p95 ${quantile(env, 0.95).toFixed(1)} ms  (target ≤ 100 ms)`);
console.log(`  statuses: ${Object.entries(statusCount).map(([k, v]) => `${k} ${v}`).join(', ')}; load ${load()}`);
if (sink === 42.4242) console.log('');

// ---------------------------------------------------------------------------------------------
// Studies: 40 Mach × 61 α × 5 flap deflections = 12 200 points on the 64-facet demo fin with a
// 25 % flap, at 10 km with turbulent friction; the engine of shared/flight/study.ts end to end
// (prepare per deflection, analyse per point, compact rows, summaries, packing). Target ≤ 0.5 s
// in the worker. Then the same study in headless Chromium through the real worker bundle, and
// the PDF report. All figures, no assertions.
// ---------------------------------------------------------------------------------------------
await (async () => {
  const { runStudy, runStudySliced } = await import('../../shared/flight/study.ts');
  const { studyDefinitionSchema } = await import('../../shared/model/study.ts');
  const { normalizeDocument, sketchCase } = await import('../../shared/model/sketch.ts');
  const { analyseDesignPoints } = await import('../../shared/flight/designPoints.ts');
  const { selectedAnalysis } = await import('../../shared/flight/storedAnalysis.ts');

  const document = normalizeDocument({
    version: 1,
    section: { points: demoSection(64) },
    condition: { mach: 2.5, alphaDeg: 3, gamma: 1.4, altitudeM: 10_000 },
    flap: { hingeXOverC: 0.75, deflectionDeg: 0 },
    loads: { chordM: 0.4, spanM: 0.3, friction: 'turbulent' as const },
  });
  const doc = sketchCase(document);
  const definition = studyDefinitionSchema.parse({
    mach: { kind: 'range', start: 1.2, end: 5, step: 3.8 / 39 },
    alpha: { startDeg: -15, endDeg: 15, stepDeg: 0.5 },
    flapDeg: [-10, -5, 0, 5, 10],
    altitudeM: 10_000,
    friction: 'turbulent',
  });
  const first = runStudy(doc, definition);
  if (first.status !== 'done') throw new Error(`bench study did not run: ${JSON.stringify(first)}`);
  const points = first.results.rows.length;
  const counts = Object.entries(first.results.counts).map(([k, v]) => `${k} ${v}`).join(', ');

  const syncTimes: number[] = [];
  for (let i = 0; i < 12; i++) {
    const t0 = performance.now();
    runStudy(doc, definition);
    syncTimes.push(performance.now() - t0);
  }
  const slicedTimes: number[] = [];
  for (let i = 0; i < 8; i++) {
    const t0 = performance.now();
    await runStudySliced(doc, definition, { pause: () => new Promise((r) => setImmediate(r)), sliceMs: 30 });
    slicedTimes.push(performance.now() - t0);
  }
  syncTimes.sort((a, b) => a - b);
  slicedTimes.sort((a, b) => a - b);
  const json = JSON.stringify(first.results).length;
  console.log('');
  console.log(`Study: 40 Mach (1.2–5.0) × 61 α (−15°…15°) × 5 flap (−10°…10°) = ${points} points, 64 facets, 10 km, turbulent friction`);
  console.log(`  statuses: ${counts}; packed results ${(json / 1024).toFixed(0)} KB of JSON`);
  console.log(`  Node, one pass:               median ${quantile(syncTimes, 0.5).toFixed(0)} ms, p95 ${quantile(syncTimes, 0.95).toFixed(0)} ms  (${((quantile(syncTimes, 0.5) * 1000) / points).toFixed(1)} µs/point)`);
  console.log(`  Node, 30 ms slices (server):  median ${quantile(slicedTimes, 0.5).toFixed(0)} ms, p95 ${quantile(slicedTimes, 0.95).toFixed(0)} ms`);

  await chromiumStudy(doc, definition, points);

  // PDF report: the demo fin's analysis alone, and with the study (charts + per-Mach table).
  const { renderReport } = await import('../../server/api/reports/renderReport.ts');
  const solvedPoints = analyseDesignPoints(document);
  const analysis = selectedAnalysis(solvedPoints)!;
  const base = { title: 'Shockwright demo fin', teamName: 'Bench', revision: 1, generatedAt: new Date(), generatedBy: 'Bench', units: 'si' as const, document, analysis, points: solvedPoints };
  const study = { id: 'study_bench', name: 'Envelope', revision: 1, definition, results: first.results, createdByName: 'Bench', createdAt: new Date().toISOString() };
  const t0 = performance.now();
  const firstPdf = await renderReport({ ...base, study: null });
  const coldMs = performance.now() - t0;
  const plain: number[] = [];
  const withStudy: number[] = [];
  let studyBytes = 0;
  for (let i = 0; i < 10; i++) {
    let t = performance.now();
    await renderReport({ ...base, study: null });
    plain.push(performance.now() - t);
    t = performance.now();
    studyBytes = (await renderReport({ ...base, study })).length;
    withStudy.push(performance.now() - t);
  }
  plain.sort((a, b) => a - b);
  withStudy.sort((a, b) => a - b);
  console.log('');
  console.log('PDF report (pdfkit, fonts embedded, vector wave map and charts)');
  console.log(`  first report in the process (fonts read and unpacked): ${coldMs.toFixed(0)} ms, ${(firstPdf.length / 1024).toFixed(0)} KB`);
  console.log(`  section report:              median ${quantile(plain, 0.5).toFixed(0)} ms, p95 ${quantile(plain, 0.95).toFixed(0)} ms`);
  console.log(`  with the 12 200-point study: median ${quantile(withStudy, 0.5).toFixed(0)} ms, p95 ${quantile(withStudy, 0.95).toFixed(0)} ms, ${(studyBytes / 1024).toFixed(0)} KB`);
})();

/**
 * The study in headless Chromium through the real worker: the worker entry is bundled by Vite
 * (as the app's build does), served from 127.0.0.1, and timed from posting the run to receiving
 * the results (progress messages, slicing and the results' structured clone included). The
 * first run includes starting the worker and compiling its code.
 */
async function chromiumStudy(doc: unknown, definition: unknown, points: number): Promise<void> {
  const { existsSync, mkdtempSync, readFileSync, rmSync } = await import('node:fs');
  const { tmpdir } = await import('node:os');
  const path = await import('node:path');
  const http = await import('node:http');
  const { fileURLToPath } = await import('node:url');
  const executablePath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  console.log('');
  if (!existsSync(executablePath)) {
    console.log(`Study in headless Chromium: skipped (no Chromium at ${executablePath}).`);
    return;
  }
  const root = fileURLToPath(new URL('../..', import.meta.url));
  const out = mkdtempSync(path.join(tmpdir(), 'sw-bench-worker-'));
  const { build } = await import('vite');
  await build({
    configFile: false,
    logLevel: 'silent',
    root,
    resolve: { alias: [{ find: '@shared', replacement: path.join(root, 'shared') }] },
    build: { outDir: out, emptyOutDir: true, lib: { entry: path.join(root, 'src/workers/study.worker.ts'), formats: ['es'], fileName: () => 'study.worker.js' } },
  });
  const page = '<!doctype html><meta charset="utf-8"><link rel="icon" href="data:,"><title>bench</title>';
  const server = http.createServer((req, res) => {
    if (req.url === '/study.worker.js') {
      res.writeHead(200, { 'content-type': 'text/javascript' }).end(readFileSync(path.join(out, 'study.worker.js')));
    } else res.writeHead(200, { 'content-type': 'text/html' }).end(page);
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const port = (server.address() as { port: number }).port;
  const { chromium } = await import('playwright-core');
  const browser = await chromium.launch({ executablePath, args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'] });
  try {
    const tab = await browser.newPage();
    await tab.addInitScript('globalThis.__name = (f) => f');
    await tab.goto(`http://127.0.0.1:${port}/`);
    const times = await tab.evaluate(
      async ({ doc, definition }) => {
        const worker = new Worker('/study.worker.js', { type: 'module' });
        const runOnce = (id: number) =>
          new Promise<number>((resolve, reject) => {
            const t0 = performance.now();
            worker.onmessage = (e: MessageEvent<{ type: string; id: number; message?: string }>) => {
              if (e.data.id !== id) return;
              if (e.data.type === 'done') resolve(performance.now() - t0);
              else if (e.data.type !== 'progress') reject(new Error(e.data.message ?? e.data.type));
            };
            worker.postMessage({ type: 'run', id, document: doc, definition });
          });
        const out: number[] = [];
        for (let i = 1; i <= 8; i++) out.push(await runOnce(i));
        worker.terminate();
        return out;
      },
      { doc, definition },
    );
    const cold = itemAt(times, 0);
    const warm = times.slice(1).sort((a, b) => a - b);
    const version = browser.version();
    console.log(`Study in headless Chromium ${version}, Web Worker (Vite bundle of src/workers/study.worker.ts), ${points} points`);
    console.log(`  first run (worker start + compile): ${cold.toFixed(0)} ms`);
    console.log(`  later runs: median ${quantile(warm, 0.5).toFixed(0)} ms, p95 ${quantile(warm, 0.95).toFixed(0)} ms  (target ≤ 500 ms)`);
  } finally {
    await browser.close();
    server.close();
    rmSync(out, { recursive: true, force: true });
  }
}
