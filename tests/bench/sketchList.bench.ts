/**
 * `npm run bench:list`: what the home page's sketch list costs for a big team, never assertions.
 *
 * A team of `BENCH_LIST_SKETCHES` (300) sketches of `BENCH_LIST_VERTICES` (200) vertices with
 * three design points each, made through the API, on a server in its own process. Then
 * GET /api/teams/:id/sketches — what every open home page of the team fetches after a
 * `teamSketches` notice (at most one a second per team): one request at a time (wall time
 * p50 / p95), ten at once (ten open home pages hearing the same notice), and the CPU time the
 * server process and PostgreSQL spent per request (CPU time says more than wall time on a busy
 * machine). The load average is printed before and after.
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
/** The CPU time of the cluster's postmaster and every process it started (backends, workers). */
function clusterCpuSeconds(dataDir: string): number {
  const postmaster = Number(firstItem(readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n')));
  let total = cpuSeconds(postmaster);
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const fields = itemAt(readFileSync(`/proc/${entry}/stat`, 'utf8').split(') '), 1).split(' ');
      if (Number(itemAt(fields, 1)) === postmaster) total += cpuSeconds(Number(entry));
    } catch {
      // gone meanwhile
    }
  }
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

    const one: number[] = [];
    const serverCpu0 = cpuSeconds(pid);
    const pgCpu0 = clusterCpuSeconds(dataDir);
    for (let i = 0; i < SEQUENTIAL; i++) {
      const t0 = performance.now();
      await list();
      one.push(performance.now() - t0);
    }
    const serverCpu = (cpuSeconds(pid) - serverCpu0) / SEQUENTIAL;
    const pgCpu = (clusterCpuSeconds(dataDir) - pgCpu0) / SEQUENTIAL;

    const ten: number[] = [];
    for (let r = 0; r < ROUNDS; r++) {
      const t0 = performance.now();
      await Promise.all(Array.from({ length: PAGES }, () => list()));
      ten.push(performance.now() - t0);
    }

    row('rows in the list / answer size', `${rows} / ${(Buffer.byteLength(first) / 1024).toFixed(0)} KB`);
    row('one list request: p50 / p95', spread(one));
    row('server CPU per list request', `${(serverCpu * 1000).toFixed(1)} ms`);
    row('PostgreSQL CPU per list request', `${(pgCpu * 1000).toFixed(1)} ms (every process of the cluster)`);
    row(`${PAGES} home pages at once (one notice): p50 / p95`, `${spread(ten)} until the last answer`);
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
