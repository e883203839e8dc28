/**
 * Solver benchmark: `npm run bench`. Prints solve times; asserts nothing (speed is measured
 * here, never in tests).
 *
 * - Core solve (march, trailing edge, loads, both theories; `options.waves = false`) and the
 *   full solve with the wave map, for 4, 16, 64 and 200 facets. Each sample times a batch of
 *   calls with process.hrtime.bigint and divides by the batch size, so that the timer's own
 *   cost does not swamp a few-microsecond call; median and p95 are over the samples.
 * - An envelope of 40 Mach × 61 α on a 64-facet section (core solve), median and p95 of
 *   whole-envelope times.
 * Targets: 200 facets ≤ 20 µs median (core); envelope ≤ 100 ms; core cost linear in facets:
 * the marginal column (extra time per extra facet since the previous row) should stay roughly
 * flat, while ns/facet falls as the fixed cost is spread. The wave map is O(lines²) by design.
 *
 * The section is our own: a cambered lens ("Shockwright demo fin", 6 % thick, 1 % camber)
 * with cosine-spaced vertices.
 */
import { cpus, loadavg } from 'node:os';
import type { SolveInput } from '../../shared/model/solveInput';
import { solveSection } from '../../shared/solver/solveSection';

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
  return sorted[i];
}

/** Per-call times (µs) of `samples` batches of `batch` calls each. */
function timePerCall(fn: () => unknown, batch: number, samples: number): number[] {
  const out: number[] = [];
  for (let s = 0; s < samples; s++) {
    const t0 = process.hrtime.bigint();
    for (let i = 0; i < batch; i++) fn();
    const t1 = process.hrtime.bigint();
    out.push(Number(t1 - t0) / 1000 / batch);
  }
  return out.sort((a, b) => a - b);
}

let sink = 0;
function consume(r: ReturnType<typeof solveSection>): void {
  sink += r.coefficients ? r.coefficients.cl : 1;
}

function warmUp(fn: () => unknown, ms: number): void {
  const end = Date.now() + ms;
  while (Date.now() < end) fn();
}

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
  warmUp(coreFn, 300);
  warmUp(fullFn, 300);
  const coreBatch = Math.max(10, Math.round(4000 / facets));
  const c = timePerCall(coreFn, coreBatch, 300);
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
  'core ns/facet',
  'marginal ns/facet',
  'with wave map median µs',
  'with wave map p95 µs',
  'waves',
];
const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
const fmtRow = (r: string[]) => r.map((c, i) => c.padStart(widths[i])).join('  ');
console.log('Section solve (demo fin, M 2.5, α 3°, γ 1.4)');
console.log(fmtRow(header));
for (const r of rows) console.log(fmtRow(r));

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
console.log(`  statuses: ${Object.entries(statusCount).map(([k, v]) => `${k} ${v}`).join(', ')}`);
if (sink === 42.4242) console.log('');
