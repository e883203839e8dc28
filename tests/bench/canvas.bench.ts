/**
 * Canvas benchmark: `npm run bench:canvas`. Prints figures; asserts nothing (speed is measured
 * here, never in tests).
 *
 * 1. Builds the client (with a manifest) into a temporary folder and prints the initial
 *    JavaScript of the editor route: the entry chunk, the editor's chunk and what they import
 *    statically, raw and gzip (target ≤ 300 KB gzip). Lazy parts (the Cp chart, dialogs) and
 *    the solver worker's script are listed apart, and the total with the worker is printed.
 * 2. Starts a throwaway PostgreSQL cluster and the server in-process, signs the demo owner in
 *    in headless Chromium, and for sections of 64 and 200 vertices (faceted biconvex) drags one
 *    vertex with the select tool, twice: up and down by ±40 px (a spike, the flow detaches) and
 *    by ±2 px (small adjustments, attached flow) — 240 pointer moves with 16 ms between them
 *    (the rate reached, lower on a loaded machine, is printed). The page records,
 *    for each move, the time until the scene (wave map and section) was drawn from a solve that
 *    includes that move (src/canvas/paintTiming.ts; the solver worker paints it and reports its
 *    times on its own clock, brought onto the page's), and this prints p50/p90/p95/max (target
 *    p95 ≤ 16 ms): from the event's timestamp (includes Chromium's input queueing), from our
 *    handler's start (the editor's own share), and until the drawing was rasterised (in the
 *    bench the worker reads a pixel right after drawing, which rasterises the recorded calls at
 *    once instead of in the canvas's own task after it; the compositor's share after that is
 *    not visible to a page). Then where the time went, the
 *    CPU time Chromium's processes used per move (from /proc: it hardly depends on the load),
 *    and the machine's load average before and after each drag (as `uptime` prints it): the
 *    machine is shared and its load shows in the tails. `BENCH_VERTICES=200` drags only the
 *    sizes listed, `BENCH_SHOTS=folder` saves screenshots during each drag, at its pause and after it, and
 *    `BENCH_TRACE=prefix` records a Chromium trace of each drag (see `startTrace`).
 */
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { build } from 'vite';
import { startThrowawayCluster } from '../../server/lifecycle/throwawayCluster.ts';
import { ensureDatabase } from '../../server/lifecycle/postgres.ts';
import { openDatabase } from '../../server/db/client.ts';
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemoOnce } from '../../server/db/seed.ts';
import { startServer } from '../../server/index.ts';
import { REPO_ROOT } from '../../server/app.ts';
import { testEnv } from '../helpers/app.ts';
import type { Page } from 'playwright-core';
import { openBrowser } from '../helpers/browser.ts';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import { generateSection } from '../../shared/model/templates.ts';
import { routeInitialJs } from './bundleSize.ts';
import { firstItems, itemAt } from '../../shared/util/invariant.ts';

const MOVES = 240;
/** Section sizes dragged (issue target: p95 ≤ 16 ms on both). */
const SECTION_VERTICES = [64, 200];
const MOVE_INTERVAL_MS = 16;
/**
 * How far the dragged vertex goes up and down, screen pixels. ±40 px makes a spike: the flow
 * detaches at the vertex for most moves and the wave map ends there on that surface. ±2 px are
 * the small adjustments of a detailed section: the flow stays attached, the whole wave map.
 */
const DRAG_AMPLITUDES_PX = [40, 2];
const DRAG_KINDS: Record<number, string> = {
  40: '±40 px (a spike: the flow detaches there for most moves, the wave map ends at it)',
  2: '±2 px (small adjustments: attached flow, the whole wave map)',
};
const kb = (n: number) => `${(n / 1024).toFixed(1)} KB`;

/** Clock ticks per second of /proc's CPU times (Linux's USER_HZ, 100 on every common build). */
const PROC_TICKS_PER_S = 100;

/**
 * CPU time in ms used so far by each thread of Chromium's processes started under this one,
 * keyed "process type/thread name" (threads of one name added up: the page's main thread is
 * renderer/chromium, the solver worker renderer/DedicatedWorker, the software compositor
 * gpu-process/VizCompositorTh…), from /proc (Linux); null elsewhere. Unlike the latencies it
 * hardly depends on how busy the machine is, so it shows the work a drag costs on a shared
 * machine, and where.
 */
function chromiumThreadCpuMs(): Map<string, number> | null {
  const stat = (file: string) => {
    const text = readFileSync(file, 'utf8');
    // pid (comm) state ppid … utime stime: fields after the closing parenthesis.
    const close = text.lastIndexOf(')');
    const rest = text.slice(close + 2).split(' ');
    return { comm: text.slice(text.indexOf('(') + 1, close), ppid: Number(rest[1]), ms: ((Number(rest[11]) + Number(rest[12])) * 1000) / PROC_TICKS_PER_S };
  };
  try {
    const procs = new Map<number, { ppid: number; comm: string }>();
    for (const name of readdirSync('/proc')) {
      if (!/^\d+$/.test(name)) continue;
      try {
        procs.set(Number(name), stat(`/proc/${name}/stat`));
      } catch {
        // ended meanwhile
      }
    }
    const ours = (pid: number): boolean => {
      for (let p = procs.get(pid)?.ppid, hops = 0; p !== undefined && p > 1 && hops < 20; p = procs.get(p)?.ppid, hops++) if (p === process.pid) return true;
      return false;
    };
    const out = new Map<string, number>();
    for (const [pid, p] of procs) {
      if (!/chrom/i.test(p.comm) || !ours(pid)) continue;
      try {
        const type = /--type=([a-z-]+)/.exec(readFileSync(`/proc/${pid}/cmdline`, 'utf8'))?.[1] ?? 'browser';
        for (const tid of readdirSync(`/proc/${pid}/task`)) {
          const t = stat(`/proc/${pid}/task/${tid}/stat`);
          const key = `${type}/${t.comm}`;
          out.set(key, (out.get(key) ?? 0) + t.ms);
        }
      } catch {
        // ended meanwhile
      }
    }
    return out;
  } catch {
    return null;
  }
}

/** The load averages as `uptime` prints them (1, 5 and 15 minutes) and the core count. */
function uptimeLine(): string {
  const [l1, l5, l15] = firstItems(loadavg(), 3);
  return `load average ${l1.toFixed(2)}, ${l5.toFixed(2)}, ${l15.toFixed(2)} on ${cpus().length} cores`;
}

/**
 * The section sizes to drag: SECTION_VERTICES, or those listed in BENCH_VERTICES (e.g.
 * `BENCH_VERTICES=200 npm run bench:canvas`, to look at one size while working on it).
 */
function benchSizes(): number[] {
  const wanted = process.env.BENCH_VERTICES;
  if (!wanted) return SECTION_VERTICES;
  const sizes = wanted.split(',').map(Number);
  for (const v of sizes) if (!Number.isInteger(v) || v < 4 || v % 4 !== 0) throw new Error(`BENCH_VERTICES: ${JSON.stringify(wanted)} must list vertex counts that are multiples of 4 (e.g. 64,200)`);
  return sizes;
}

function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  return itemAt(sorted, Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1)));
}

/** BENCH_SHOTS=folder: screenshots of the editor during each drag (an eighth of the way in), at its pause (still holding) and after it. */
const shotsDir = process.env.BENCH_SHOTS ? path.resolve(process.env.BENCH_SHOTS) : null;

/**
 * BENCH_TRACE=path-prefix: a Chromium trace (timeline, V8 and canvas categories, every process)
 * of each measured drag, written as `<prefix>-<vertices>v-<amplitude>px.json` for Chromium's
 * performance panel (or any trace viewer). Tracing costs CPU: the latencies of a traced run
 * are not the bench's figures.
 */
async function startTrace(page: Page) {
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('Tracing.start', {
    transferMode: 'ReturnAsStream',
    traceConfig: {
      includedCategories: ['devtools.timeline', 'disabled-by-default-devtools.timeline', 'v8', 'v8.execute', 'disabled-by-default-v8.cpu_profiler', 'blink', 'cc', 'gpu', 'viz', 'toplevel', 'benchmark'],
    },
  });
  return {
    async stop(file: string) {
      const done = new Promise<string>((resolve) => cdp.once('Tracing.tracingComplete', (e) => resolve(e.stream ?? '')));
      await cdp.send('Tracing.end');
      const handle = await done;
      const chunks: string[] = [];
      for (;;) {
        const { data, eof, base64Encoded } = await cdp.send('IO.read', { handle });
        chunks.push(base64Encoded ? Buffer.from(data, 'base64').toString('utf8') : data);
        if (eof) break;
      }
      await cdp.send('IO.close', { handle });
      writeFileSync(file, chunks.join(''));
      console.log(`  trace written: ${file}`);
    },
  };
}

/** Creates a faceted biconvex of `vertices` vertices, opens it and drags its mid-chord upper vertex. */
async function dragBench(page: Page, baseUrl: string, vertices: number, amplitudePx: number) {
  const generated = generateSection('biconvex', { thicknessPercent: 6, facetsPerSide: vertices / 2 });
  if (!generated.ok) throw new Error('bench section did not generate');
  const base = defaultSketchDocument();
  const sketchDocument = {
    ...base,
    section: { points: generated.points },
    designPoints: base.designPoints.map((p) => ({ ...p, condition: { mach: 2.5, alphaDeg: 3, gamma: 1.4, altitudeM: null } })),
  };
  const sketchId = await page.evaluate(
    async ({ doc, title }) => {
      const me = await (await fetch('/api/auth/me')).json();
      const res = await fetch(`/api/teams/${me.teams[0].teamId}/sketches`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-shockwright-request': '1' },
        body: JSON.stringify({ title, document: doc }),
      });
      const body = await res.json();
      if (!res.ok) throw new Error(`creating the bench sketch: ${JSON.stringify(body)}`);
      return body.id as string;
    },
    { doc: sketchDocument, title: `Bench — faceted biconvex, ${vertices} vertices` },
  );

  await page.goto(`${baseUrl}/sketches/${sketchId}`);
  const canvas = page.getByTestId('sketch-canvas');
  await canvas.waitFor();
  await page.getByTestId('coef-exact-cl').filter({ hasNotText: '—' }).waitFor();
  const box = (await canvas.boundingBox())!;
  const [scale, originX, originY] = firstItems((await canvas.getAttribute('data-view'))!.split(' ').map(Number), 3);
  const vertex = itemAt(generated.points, vertices / 4); // mid-chord on the upper surface
  const x = box.x + vertex[0] * scale + originX;
  const y = box.y - vertex[1] * scale + originY;

  // Warm up (JIT, worker start), then clear the record.
  await page.mouse.move(x, y);
  await page.mouse.down();
  for (let i = 1; i <= 30; i++) {
    await page.mouse.move(x, y - (i % 10));
    await page.waitForTimeout(MOVE_INTERVAL_MS);
  }
  await page.mouse.up();
  await page.keyboard.press('Control+z');
  await page.waitForTimeout(300);

  await page.mouse.move(x, y);
  await page.mouse.down();
  // Start the drag past its threshold and come back, so that every measured move moves the vertex.
  await page.mouse.move(x, y - 4);
  await page.mouse.move(x, y);
  await page.waitForTimeout(300);
  await page.evaluate(() => {
    (globalThis as { __shockwrightPaintLatencies?: unknown }).__shockwrightPaintLatencies = { fromEvent: [], fromHandler: [] };
  });
  const trace = process.env.BENCH_TRACE ? await startTrace(page) : null;
  const cpuBefore = chromiumThreadCpuMs();
  const startedAt = performance.now();
  for (let i = 1; i <= MOVES; i++) {
    // Up and down by up to `amplitudePx`: the section stays valid while the wave map changes.
    const dy = amplitudePx * Math.sin((i / MOVES) * Math.PI * 4);
    await page.mouse.move(x + (i % 3), y - dy);
    await page.waitForTimeout(MOVE_INTERVAL_MS);
    if (shotsDir && i === MOVES / 8) await page.screenshot({ path: path.join(shotsDir, `drag-${vertices}v-${amplitudePx}px-during.png`) });
  }
  const dragMs = performance.now() - startedAt;
  const cpuAfter = chromiumThreadCpuMs();
  if (trace) await trace.stop(`${process.env.BENCH_TRACE}-${vertices}v-${amplitudePx}px.json`);
  await page.waitForTimeout(200);
  // Still holding the vertex: the pointer has paused, so the scene is painted in full again.
  if (shotsDir) await page.screenshot({ path: path.join(shotsDir, `drag-${vertices}v-${amplitudePx}px-paused.png`) });
  await page.mouse.up();
  if (shotsDir) {
    await page.getByTestId('coef-exact-cl').filter({ hasNotText: '—' }).waitFor();
    await page.waitForTimeout(500);
    await page.screenshot({ path: path.join(shotsDir, `drag-${vertices}v-${amplitudePx}px-after.png`) });
  }
  const record = await page.evaluate(
    () => (globalThis as { __shockwrightPaintLatencies?: { fromEvent: number[]; fromHandler: number[]; rasterised?: number[]; breakdown?: Record<'toPost' | 'toWorker' | 'solve' | 'lists' | 'paint' | 'raster', number[]> } }).__shockwrightPaintLatencies,
  );
  const waveCount = await page.evaluate(() => document.querySelector('[data-testid="sketch-canvas"]')?.getAttribute('data-wave-count'));
  return {
    fromEvent: [...(record?.fromEvent ?? [])].sort((a, b) => a - b),
    fromHandler: [...(record?.fromHandler ?? [])].sort((a, b) => a - b),
    waveCount: waveCount ?? '?',
    breakdown: record?.breakdown ?? null,
    rasterised: [...(record?.rasterised ?? [])].sort((a, b) => a - b),
    cpuPerMove:
      cpuBefore && cpuAfter
        ? [...cpuAfter].map(([thread, ms]) => [thread, (ms - (cpuBefore.get(thread) ?? 0)) / MOVES] as const).sort((a, b) => b[1] - a[1])
        : null,
    movesPerS: (MOVES * 1000) / dragMs,
  };
}

async function main() {
  const work = mkdtempSync(path.join(tmpdir(), 'sw-bench-canvas-'));
  const outDir = path.join(work, 'client');
  let cluster: Awaited<ReturnType<typeof startThrowawayCluster>> | null = null;
  try {
    // ---- 1. bundle size ----
    console.log('Building the client…');
    await build({ root: REPO_ROOT, logLevel: 'warn', build: { outDir, emptyOutDir: true, manifest: true } });
    const editor = routeInitialJs(outDir, 'src/views/SketchView.vue');
    console.log('\nInitial JavaScript of the editor route (/sketches/:id)');
    for (const f of editor.files) console.log(`  ${kb(f.gzip).padStart(9)} gzip  ${kb(f.bytes).padStart(9)} raw  ${f.file}`);
    console.log(`  ${kb(editor.gzip).padStart(9)} gzip  ${kb(editor.bytes).padStart(9)} raw  total (target ≤ 300 KB gzip)`);
    console.log('  loaded later by the editor (its dynamic imports), not counted:');
    for (const f of editor.later) console.log(`  ${kb(f.gzip).padStart(9)} gzip  ${kb(f.bytes).padStart(9)} raw  ${f.file}`);
    const solverWorker = editor.workers.filter((f) => f.file.includes('solver.worker'));
    for (const f of solverWorker) {
      console.log(`  ${kb(f.gzip).padStart(9)} gzip  ${kb(f.bytes).padStart(9)} raw  ${f.file} (fetched when the editor opens; runs in its own thread)`);
    }
    const withWorker = editor.gzip + solverWorker.reduce((s, f) => s + f.gzip, 0);
    console.log(`  ${kb(withWorker).padStart(9)} gzip  main-thread initial JS plus the solver worker`);

    // ---- 2. drag latency ----
    console.log('\nStarting PostgreSQL and the server…');
    cluster = await startThrowawayCluster();
    await ensureDatabase(cluster.adminUrl, 'sw_bench', cluster.templateDb);
    const url = cluster.adminUrl.replace(/\/[^/]*$/, '/sw_bench');
    const seedDb = openDatabase(url, { max: 2 });
    await seedDemoOnce(seedDb.db);
    await seedDb.close();
    const server = await startServer(testEnv(url, { CLIENT_DIST: outDir }), { log: () => {} });
    const browser = await openBrowser(server.url);
    try {
      const { page, context } = browser;
      await context.addInitScript('globalThis.__shockwrightBench = true');
      await page.goto(`${server.url}/sign-in`);
      await page.getByTestId('sign-in-email').fill(DEMO_PEOPLE[0].email);
      await page.getByTestId('sign-in-password').fill(DEMO_PASSWORD);
      await page.getByTestId('sign-in-submit').click();
      await page.getByTestId('header-user').waitFor();

      const [l1Before] = firstItems(loadavg(), 1);
      const sizes = benchSizes();
      if (shotsDir) mkdirSync(shotsDir, { recursive: true });
      for (const [vertices, amplitudePx] of sizes.flatMap((v) => DRAG_AMPLITUDES_PX.map((a) => [v, a] as const))) {
        const loadBefore = uptimeLine();
        const stats = await dragBench(page, server.url, vertices, amplitudePx);
        const line = (name: string, v: number[]) =>
          `  ${name.padEnd(34)} p50 ${quantile(v, 0.5).toFixed(1).padStart(5)} ms   p90 ${quantile(v, 0.9).toFixed(1).padStart(5)} ms   p95 ${quantile(v, 0.95).toFixed(1).padStart(5)} ms   max ${(v.at(-1) ?? Number.NaN).toFixed(1).padStart(5)} ms`;
        console.log(`\nDrag of one vertex of a ${vertices}-vertex section (faceted biconvex, M 2.5, α 3°), ${MOVES} pointer moves ${MOVE_INTERVAL_MS} ms apart, ${DRAG_KINDS[amplitudePx] ?? `±${amplitudePx} px`}, ${stats.waveCount} waves at rest, pressure field and meeting marks on (the default layers)`);
        console.log(`  machine before this drag: ${loadBefore}; after it: ${uptimeLine()}`);
        console.log(`  moves paired with a repaint: ${stats.fromEvent.length} of ${MOVES} (sent at ${stats.movesPerS.toFixed(0)}/s)`);
        if (stats.cpuPerMove) {
          const total = stats.cpuPerMove.reduce((sum, [, ms]) => sum + ms, 0);
          const top = stats.cpuPerMove.filter(([, ms]) => ms >= 0.5).map(([thread, ms]) => `${thread} ${ms.toFixed(1)}`);
          console.log(`  Chromium CPU per pointer move (hardly depends on the machine's load): ${total.toFixed(1)} ms — ${top.join(', ')}`);
        }
        console.log(line('pointer event → wave map drawn', stats.fromEvent));
        console.log(line('our handler → wave map drawn', stats.fromHandler));
        if (stats.rasterised.length > 0) console.log(line('pointer event → wave map rasterised', stats.rasterised));
        if (stats.breakdown) {
          console.log(`  where the time went (the ${stats.breakdown.solve.length} moves whose own request was solved and painted):`);
          for (const [name, label] of [['toPost', 'handler → request to the worker'], ['toWorker', 'handler → worker starts on it'], ['solve', 'solve in the worker'], ['lists', 'draw lists built in the worker'], ['paint', 'draw calls in the worker'], ['raster', 'raster in the worker']] as const) {
            console.log(line(`  ${label}`, [...stats.breakdown[name]].sort((a, b) => a - b)));
          }
        }
        console.log('  (target p95 ≤ 16 ms)');
      }
      const [l1, l5] = firstItems(loadavg(), 2);
      console.log(`\nmachine: ${cpus().length} cores, load average ${l1Before.toFixed(1)} before the drags, ${l1.toFixed(1)} after (1 min), ${l5.toFixed(1)} (5 min) — other work on the machine shows in the p95`);
      if (browser.foreignRequests.length > 0) console.log(`  note: the page tried to reach other hosts: ${browser.foreignRequests.join(', ')}`);
    } finally {
      await browser.close();
      await server.close();
    }
  } finally {
    cluster?.stop();
    rmSync(work, { recursive: true, force: true });
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
