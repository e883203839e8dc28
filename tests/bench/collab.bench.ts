/**
 * `npm run bench:collab`: figures for live editing, never assertions.
 *
 * 1. 25 simulated editors in one sketch, each sending 10 edits a second for 20 s over loopback
 *    to a server in its own process: send → receipt latency at the other clients (p50/p95/p99;
 *    target p95 ≤ 30 ms on a quiet machine), edits lost (acked but not received by every other
 *    client), the server's CPU and memory.
 * 2. A 2,000-vertex section: one editor's edits one after another (send → ack, i.e. the server's
 *    time for an edit plus loopback; target ≤ 15 ms), then ten editors at 10 edits/s each.
 * 3. A join on one instance right after another instance died, beside a normal join.
 *
 * The machine's load (load average, and how busy its cores were during each run) is printed
 * beside the figures: on a busy machine the latencies say more about the machine.
 */
import { readFileSync } from 'node:fs';
import os from 'node:os';
import { startThrowawayCluster } from '../../server/lifecycle/throwawayCluster.ts';
import { ensureDatabase, freePort } from '../../server/lifecycle/postgres.ts';
import { openDatabase } from '../../server/db/client.ts';
import { sketches } from '../../server/db/schema.ts';
import { newId } from '../../shared/model/ids.ts';
import { sketchDocumentSchema } from '../../shared/model/sketch.ts';
import { RT_PASSWORD, seedTeam } from '../helpers/realtimeWorld.ts';
import { prng, signInCookie, simClient, until, type SimClient } from '../helpers/simClient.ts';
import { startServerProcess, type ServerProcess } from '../helpers/serverProcess.ts';
import { untilInstancesMeet } from '../helpers/instances.ts';
import type { EditOp } from '../../shared/protocol/messages.ts';
import { firstItem, firstItems, itemAt } from '../../shared/util/invariant.ts';
import { sketchSummaryColumns } from '../../server/db/sketchSummary.ts';

const CLIENTS = Number(process.env.BENCH_CLIENTS ?? 25);
const RATE_PER_S = Number(process.env.BENCH_RATE ?? 10);
const DURATION_S = Number(process.env.BENCH_SECONDS ?? 20);
const BIG_VERTICES = 2000;
const BIG_SEQUENTIAL_EDITS = Number(process.env.BENCH_BIG_EDITS ?? 300);
const BIG_EDITORS = 10;
const BIG_SECONDS = Number(process.env.BENCH_BIG_SECONDS ?? 10);

function cpuSeconds(pid: number): number {
  // The fields after the command name's closing parenthesis; utime and stime are the 12th and 13th.
  const fields = itemAt(readFileSync(`/proc/${pid}/stat`, 'utf8').split(') '), 1).split(' ');
  return (Number(itemAt(fields, 11)) + Number(itemAt(fields, 12))) / 100; // utime + stime, clock ticks at 100 Hz
}
function memoryMb(pid: number, key: 'VmRSS' | 'VmHWM'): number {
  const line = readFileSync(`/proc/${pid}/status`, 'utf8').split('\n').find((l) => l.startsWith(key))!;
  return Number(line.split(/\s+/)[1]) / 1024;
}
/** Busy and total jiffies of all cores (/proc/stat), to tell how loaded the machine was. */
function machineTicks(): { busy: number; total: number } {
  const f = firstItem(readFileSync('/proc/stat', 'utf8').split('\n')).trim().split(/\s+/).slice(1).map(Number);
  const idle = itemAt(f, 3) + itemAt(f, 4); // idle and iowait
  const total = f.reduce((a, b) => a + b, 0);
  return { busy: total - idle, total };
}
const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] ?? NaN;
const row = (k: string, v: string) => console.log(`${k.padEnd(40)} ${v}`);
const spread = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return `${pct(s, 50).toFixed(1)} / ${pct(s, 95).toFixed(1)} / ${pct(s, 99).toFixed(1)} ms  (${s.length})`;
};
/** Runs `f`, and says how busy the machine's cores were meanwhile (all processes, ours included). */
async function measured<T>(f: () => Promise<T>): Promise<{ value: T; machineBusy: string }> {
  const t0 = machineTicks();
  const value = await f();
  const t1 = machineTicks();
  const busy = (t1.busy - t0.busy) / Math.max(1, t1.total - t0.total);
  return { value, machineBusy: `${(busy * 100).toFixed(0)} % of ${os.cpus().length} cores busy (all processes, this benchmark included)` };
}
const loadLine = () => `load average ${os.loadavg().map((l) => l.toFixed(2)).join(' / ')} (1 / 5 / 15 min) on ${os.cpus().length} cores`;

/** Watches sent edits and their receipts by op id. */
function instrument(clients: SimClient[]) {
  const sentAt = new Map<string, number>();
  const receipts: number[] = [];
  const acks: number[] = [];
  const receivedBy = new Map<string, number>();
  for (const c of clients) {
    c.socket.on('message', (m) => {
      const id = m.type === 'edit' ? m.op.opId : m.type === 'ack' ? m.opId : null;
      const t0 = id === null ? undefined : sentAt.get(id);
      if (m.type === 'edit') {
        if (t0 !== undefined) receipts.push(performance.now() - t0);
        receivedBy.set(m.op.opId, (receivedBy.get(m.op.opId) ?? 0) + 1);
      } else if (m.type === 'ack' && t0 !== undefined) acks.push(performance.now() - t0);
    });
    const send = c.socket.emit.bind(c.socket);
    c.socket.emit = ((ev: 'message', msg: Parameters<SimClient['send']>[0]) => {
      if (msg.type === 'edit' && !sentAt.has(msg.op.opId)) sentAt.set(msg.op.opId, performance.now());
      return send(ev, msg);
    }) as typeof c.socket.emit;
  }
  return { receipts, acks, receivedBy };
}

async function openClients(url: string, emails: string[], n: number, sketchId: string): Promise<SimClient[]> {
  const clients: SimClient[] = [];
  for (let i = 0; i < n; i++) clients.push(simClient(url, await signInCookie(url, itemAt(emails, i % emails.length), RT_PASSWORD)));
  await until(() => clients.every((c) => c.socket.connected), 30_000, 'connect');
  for (const c of clients) c.engine.join(sketchId);
  await until(() => clients.every((c) => c.engine.state !== null), 30_000, 'join');
  return clients;
}

/** Each client moves a random vertex a little, `rate` times a second, for `seconds`. */
async function editStorm(clients: SimClient[], rate: number, seconds: number, tag: string): Promise<void> {
  const stopAt = Date.now() + seconds * 1000;
  await Promise.all(
    clients.map(async (c, i) => {
      const rand = prng(1000 + i);
      let n = 0;
      while (Date.now() < stopAt) {
        const pts = c.engine.state!.document.section.points;
        const k = Math.floor(rand() * pts.length);
        const [x, y] = itemAt(pts, k);
        const op: EditOp = { type: 'moveVertices', opId: `${tag}${i}-${n++}`, indices: [k], to: [[x + (rand() - 0.5) * 0.0002, y + (rand() - 0.5) * 0.0002]] };
        if (c.engine.submit(op).ok) c.submitted.push(op.opId);
        await new Promise((r) => setTimeout(r, 1000 / rate));
      }
    }),
  );
  await until(() => clients.every((c) => c.engine.pendingCount === 0), 120_000, 'drain');
}

/** An ellipse of n vertices, thin enough for a wing section, with distinct rounded points. */
function bigDocument(n: number) {
  const points: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    points.push([Math.round((0.5 - 0.5 * Math.cos(t)) * 1e7) / 1e7, Math.round(0.06 * Math.sin(t) * 1e7) / 1e7]);
  }
  return sketchDocumentSchema.parse({ version: 1, section: { points }, condition: { mach: 2.5, alphaDeg: 2 } });
}

async function main() {
  const cluster = await startThrowawayCluster();
  await ensureDatabase(cluster.adminUrl, 'bench_collab', cluster.templateDb);
  const url = cluster.adminUrl.replace(/\/[^/]*$/, '/bench_collab');
  const db = openDatabase(url, { max: 2 });
  const world = await seedTeam(db.db, Array.from({ length: 5 }, (_, i) => ({ name: `Bench${i}`, role: 'editor' as const })));
  const emails = world.users.map((u) => u.email);
  const bigId = newId('sketch');
  const big = bigDocument(BIG_VERTICES);
  await db.db.insert(sketches).values({ id: bigId, teamId: world.teamId, title: 'Big section', document: big, createdBy: firstItem(world.users).id, updatedBy: firstItem(world.users).id, ...sketchSummaryColumns(big, 0) });
  const server = await startServerProcess(url, await freePort());
  const pid = server.child.pid!;
  const procs: ServerProcess[] = [server];

  try {
    console.log(`\nCollaboration benchmark (server in its own process; clients share this one)`);
    console.log(`Machine before: ${loadLine()}\n`);

    // ── 1. Many editors on one small sketch ──
    const clients = await openClients(server.url, emails, CLIENTS, world.sketchId);
    const watch = instrument(clients);
    const cpu0 = cpuSeconds(pid);
    const clientCpu0 = process.cpuUsage();
    const t0 = performance.now();
    const { machineBusy } = await measured(() => editStorm(clients, RATE_PER_S, DURATION_S, 'b'));
    const wall = (performance.now() - t0) / 1000;
    const cpu = cpuSeconds(pid) - cpu0;
    const clientCpu = process.cpuUsage(clientCpu0);
    await new Promise((r) => setTimeout(r, 500));
    const applied = clients.flatMap((c) => c.received.filter((m) => m.type === 'ack' && m.status !== 'rejected').map((m) => (m as { opId: string }).opId));
    const lost = applied.filter((id) => (watch.receivedBy.get(id) ?? 0) < CLIENTS - 1).length;
    console.log(`1. ${CLIENTS} clients × ${RATE_PER_S} edits/s × ${DURATION_S} s on a 16-vertex section`);
    row('edits submitted', String(clients.reduce((s, c) => s + c.submitted.length, 0)));
    row('edits applied (acked)', `${applied.length}  (${(applied.length / wall).toFixed(0)}/s)`);
    row('edits rejected (with reason)', String(clients.reduce((s, c) => s + c.rejected.size, 0)));
    row('send → receipt, p50 / p95 / p99', `${spread(watch.receipts)}; target p95 ≤ 30 ms`);
    row('send → ack, p50 / p95 / p99', spread(watch.acks));
    row('edits lost', `${lost}  (must be 0)`);
    row('server CPU', `${((cpu / wall) * 100).toFixed(0)} % of one core (${cpu.toFixed(1)} s over ${wall.toFixed(1)} s; ${((cpu / Math.max(1, applied.length)) * 1000).toFixed(2)} ms an edit)`);
    row("clients' process CPU", `${((((clientCpu.user + clientCpu.system) / 1e6) / wall) * 100).toFixed(0)} % of one core (all ${CLIENTS} clients and the measurement)`);
    row('machine during the run', machineBusy);
    row('server memory RSS / peak', `${memoryMb(pid, 'VmRSS').toFixed(0)} / ${memoryMb(pid, 'VmHWM').toFixed(0)} MB`);
    for (const c of clients) c.close();

    // ── 2. A 2,000-vertex section ──
    console.log(`\n2. A ${BIG_VERTICES}-vertex section`);
    const solo = firstItem(await openClients(server.url, emails, 1, bigId));
    const soloWatch = instrument([solo]);
    const rand = prng(77);
    const bigCpu0 = cpuSeconds(pid);
    const sequential = await measured(async () => {
      for (let n = 0; n < BIG_SEQUENTIAL_EDITS; n++) {
        const pts = solo.engine.state!.document.section.points;
        const k = Math.floor(rand() * pts.length);
        const [x, y] = itemAt(pts, k);
        solo.engine.submit({ type: 'moveVertices', opId: `s-${n}`, indices: [k], to: [[x, y + (rand() - 0.5) * 1e-5]] });
        await until(() => solo.engine.pendingCount === 0, 30_000, 'ack');
      }
    });
    const bigCpu = cpuSeconds(pid) - bigCpu0;
    row('one editor, one edit at a time: send → ack', `${spread(soloWatch.acks)}; target ≤ 15 ms (server time + loopback)`);
    row('server CPU per edit', `${((bigCpu / BIG_SEQUENTIAL_EDITS) * 1000).toFixed(1)} ms (all its threads, the coalesced solves included)`);
    row('machine during the run', sequential.machineBusy);
    solo.close();
    const big = await openClients(server.url, emails, BIG_EDITORS, bigId);
    const bigWatch = instrument(big);
    const crowd = await measured(() => editStorm(big, 10, BIG_SECONDS, 'g'));
    row(`${BIG_EDITORS} editors × 10 edits/s: send → ack`, spread(bigWatch.acks));
    row(`${BIG_EDITORS} editors × 10 edits/s: send → receipt`, spread(bigWatch.receipts));
    row('machine during the run', crowd.machineBusy);
    for (const c of big) c.close();

    // ── 3. A join right after another instance died ──
    console.log('\n3. Joining while another instance of the server has just died');
    const other = await startServerProcess(url, await freePort());
    procs.push(other);
    await untilInstancesMeet([server, other], world.sketchId, firstItems(emails, 2));
    const onOther = await openClients(other.url, emails, 2, world.sketchId);
    const joinTime = async () => {
      const c = simClient(server.url, await signInCookie(server.url, itemAt(emails, 2), RT_PASSWORD));
      await until(() => c.socket.connected, 30_000, 'connect');
      const from = performance.now();
      c.engine.join(world.sketchId);
      await until(() => c.engine.state !== null, 30_000, 'join');
      const ms = performance.now() - from;
      c.close();
      return ms;
    };
    const normal = [await joinTime(), await joinTime(), await joinTime()];
    await other.kill();
    for (const c of onOther) c.close();
    const afterDeath = await joinTime();
    row('join (join → joined), normal', `${normal.map((m) => m.toFixed(0)).join(' / ')} ms`);
    row('join right after another instance died', `${afterDeath.toFixed(0)} ms  (it used to wait for the adapter to give up on the dead instance: ~4 s)`);
    console.log(`\nMachine after: ${loadLine()}`);
  } finally {
    for (const p of procs) if (p.alive()) await p.stop();
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
