/**
 * `npm run bench:list`: what the home page's sketch list costs for a big team, never assertions.
 *
 * A team of `BENCH_LIST_SKETCHES` (300) sketches of `BENCH_LIST_VERTICES` (200) vertices with
 * three design points each, made through the API, on a server in its own process. Then
 * GET /api/teams/:id/sketches — what every open home page of the team fetches after a
 * `teamSketches` notice (at most one a second per team): one request at a time (wall time
 * p50 / p95), ten at once (ten open home pages hearing the same notice), and the CPU time the
 * server process and PostgreSQL spent per request (CPU time says more than wall time on a busy
 * machine). The load average is printed before and after. Two ways of answering are measured
 * alternately, back to back: from the summary columns (what the list does), and reading and
 * summarising every document (what it did before migration 0011).
 */
import { readFileSync, readdirSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { startThrowawayCluster } from '../../server/lifecycle/throwawayCluster.ts';
import { ensureDatabase, freePort } from '../../server/lifecycle/postgres.ts';
import { openDatabase } from '../../server/db/client.ts';
import { defaultSketchDocument, type SketchDocument } from '../../shared/model/sketch.ts';
import { newId } from '../../shared/model/ids.ts';
import { RT_PASSWORD, seedTeam } from '../helpers/realtimeWorld.ts';
import { signInCookie } from '../helpers/simClient.ts';
import { startServerProcess } from '../helpers/serverProcess.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';

const SKETCHES = Number(process.env.BENCH_LIST_SKETCHES ?? 300);
const VERTICES = Number(process.env.BENCH_LIST_VERTICES ?? 200);
const SEQUENTIAL = Number(process.env.BENCH_LIST_REQUESTS ?? 40);
const PAGES = 10;
const ROUNDS = Number(process.env.BENCH_LIST_ROUNDS ?? 10);

/** utime + stime of a process in seconds (clock ticks at 100 Hz). */
function cpuSeconds(pid: number): number {
  try {
    const fields = itemAt(readFileSync(`/proc/${pid}/stat`, 'utf8').split(') '), 1).split(' ');
    return (Number(itemAt(fields, 11)) + Number(itemAt(fields, 12))) / 100;
  } catch {
    return 0; // the process ended meanwhile
  }
}
/** The CPU time of the cluster's postmaster and of every process it started (backends, workers), by pid. */
function clusterCpu(dataDir: string): Map<number, number> {
  const postmaster = Number(firstItem(readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n')));
  const out = new Map<number, number>([[postmaster, cpuSeconds(postmaster)]]);
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const fields = itemAt(readFileSync(`/proc/${entry}/stat`, 'utf8').split(') '), 1).split(' ');
      if (Number(itemAt(fields, 1)) === postmaster) out.set(Number(entry), cpuSeconds(Number(entry)));
    } catch {
      // gone meanwhile
    }
  }
  return out;
}
/** CPU seconds the cluster spent between two readings (processes that ended meanwhile, e.g. an autovacuum worker, are not counted). */
function clusterCpuSince(before: Map<number, number>, dataDir: string): number {
  let total = 0;
  for (const [pid, cpu] of clusterCpu(dataDir)) total += cpu - (before.get(pid) ?? 0);
  return total;
}
const loadLine = () => `load average ${os.loadavg().map((l) => l.toFixed(2)).join(' / ')} (1 / 5 / 15 min) on ${os.cpus().length} cores`;
const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] ?? NaN;
const spread = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return `${pct(s, 50).toFixed(1)} / ${pct(s, 95).toFixed(1)} ms  (${s.length})`;
};
const row = (k: string, v: string) => console.log(`${k.padEnd(44)} ${v}`);

/** A closed section of n vertices: a thin ellipse of thickness t/c, with three design points. */
function sectionDocument(n: number, tOverC: number, k: number): SketchDocument {
  const points: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    points.push([Math.round((0.5 - 0.5 * Math.cos(t)) * 1e7) / 1e7, Math.round((tOverC / 2) * Math.sin(t) * 1e7) / 1e7]);
  }
  const base = defaultSketchDocument();
  const first = firstItem(base.designPoints);
  return {
    ...base,
    section: { points },
    designPoints: [
      { ...first, name: 'Cruise', condition: { ...first.condition, mach: 2 + (k % 10) / 10 } },
      { ...first, id: newId('point'), name: 'Pull-up', condition: { ...first.condition, mach: 1.8, alphaDeg: 6 } },
      { ...first, id: newId('point'), name: 'Max q', condition: { ...first.condition, mach: 2.6, alphaDeg: 1 } },
    ],
  };
}

async function main() {
  const cluster = await startThrowawayCluster();
  await ensureDatabase(cluster.adminUrl, 'bench_list', cluster.templateDb);
  const url = cluster.adminUrl.replace(/\/[^/]*$/, '/bench_list');
  const db = openDatabase(url, { max: 2 });
  const world = await seedTeam(db.db, [{ name: 'Lister', role: 'editor' }]);
  const server = await startServerProcess(url, await freePort());
  const pid = server.child.pid!;
  const dataDir = path.join(cluster.dir, 'data');
  try {
    const cookie = await signInCookie(server.url, firstItem(world.users).email, RT_PASSWORD);
    const headers = { cookie, 'content-type': 'application/json', 'x-shockwright-request': '1' };
    console.log(`\nSketch list benchmark: a team of ${SKETCHES} sketches of ${VERTICES} vertices (server in its own process)`);
    const made0 = performance.now();
    for (let k = 0; k < SKETCHES; k++) {
      const res = await fetch(`${server.url}/api/teams/${world.teamId}/sketches`, {
        method: 'POST',
        headers,
        body: JSON.stringify({ title: `Section ${k + 1}`, document: sectionDocument(VERTICES, 0.03 + (k % 7) / 100, k) }),
      });
      if (res.status !== 201) throw new Error(`create failed: ${res.status} ${await res.text()}`);
    }
    console.log(`(made through the API in ${((performance.now() - made0) / 1000).toFixed(1)} s)`);
    console.log(`Machine before: ${loadLine()}\n`);

    const list = async () => {
      const res = await fetch(`${server.url}/api/teams/${world.teamId}/sketches`, { headers: { cookie } });
      const body = await res.text();
      if (res.status !== 200) throw new Error(`list failed: ${res.status} ${body}`);
      return body;
    };
    const first = await list();
    const rows = (JSON.parse(first) as unknown[]).length;
    for (let i = 0; i < 3; i++) await list(); // warm-up

    /** One block of figures: sequential requests (wall, server and PostgreSQL CPU), then ten at once. */
    const measure = async () => {
      const one: number[] = [];
      const serverCpu0 = cpuSeconds(pid);
      const pgCpu0 = clusterCpu(dataDir);
      for (let i = 0; i < SEQUENTIAL; i++) {
        const t0 = performance.now();
        await list();
        one.push(performance.now() - t0);
      }
      const serverCpu = (cpuSeconds(pid) - serverCpu0) / SEQUENTIAL;
      const pgCpu = clusterCpuSince(pgCpu0, dataDir) / SEQUENTIAL;
      const ten: number[] = [];
      for (let r = 0; r < ROUNDS; r++) {
        const t0 = performance.now();
        await Promise.all(Array.from({ length: PAGES }, () => list()));
        ten.push(performance.now() - t0);
      }
      return { one, ten, serverCpu: [serverCpu], pgCpu: [pgCpu] };
    };
    // A/B, alternating, back to back: the summary columns (what the list reads), and every
    // document read and summarised (what it did before migration 0011, and still does for a row
    // whose summary is not of its revision: taking the revision tag away puts the list there).
    const byColumns = { one: [] as number[], ten: [] as number[], serverCpu: [] as number[], pgCpu: [] as number[] };
    const byDocuments = { one: [] as number[], ten: [] as number[], serverCpu: [] as number[], pgCpu: [] as number[] };
    const hasSummary = async (on: boolean) => {
      await db.pool.query(on ? `update sketches set summary_revision = revision where team_id = $1` : `update sketches set summary_revision = null where team_id = $1`, [world.teamId]);
    };
    for (let round = 0; round < 2; round++) {
      for (const [on, into] of [[true, byColumns], [false, byDocuments]] as const) {
        await hasSummary(on);
        await list(); // the first request after the switch is not counted
        const m = await measure();
        for (const k of ['one', 'ten', 'serverCpu', 'pgCpu'] as const) into[k].push(...m[k]);
      }
    }
    await hasSummary(true);
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / Math.max(1, xs.length);

    row('rows in the list / answer size', `${rows} / ${(Buffer.byteLength(first) / 1024).toFixed(0)} KB`);
    for (const [label, m] of [['from the summary columns', byColumns], ['reading every document (before)', byDocuments]] as const) {
      console.log(`\n${label}`);
      row('  one list request: p50 / p95', spread(m.one));
      row('  server CPU per list request', `${(mean(m.serverCpu) * 1000).toFixed(1)} ms`);
      row('  PostgreSQL CPU per list request', `${(mean(m.pgCpu) * 1000).toFixed(1)} ms (the cluster's processes alive at the end)`);
      row(`  ${PAGES} home pages at once: p50 / p95`, `${spread(m.ten)} until the last answer`);
    }
    console.log(`\nMachine after: ${loadLine()}`);
  } finally {
    if (server.alive()) await server.stop();
    await db.close();
    cluster.stop();
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
