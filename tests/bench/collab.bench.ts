/**
 * `npm run bench:collab`: 25 simulated editors in one sketch, each sending 10 edits a second for
 * 20 s over loopback to a server in its own process. Prints send → receipt latency at the other
 * clients (p50/p95/p99), edits lost (acked but not received by every other client), and the
 * server's CPU and memory. Figures only; nothing is asserted.
 */
import { readFileSync } from 'node:fs';
import { startThrowawayCluster } from '../../server/lifecycle/throwawayCluster.ts';
import { ensureDatabase, freePort } from '../../server/lifecycle/postgres.ts';
import { openDatabase } from '../../server/db/client.ts';
import { RT_PASSWORD, seedTeam } from '../helpers/realtimeWorld.ts';
import { prng, signInCookie, simClient, until, type SimClient } from '../helpers/simClient.ts';
import { startServerProcess } from '../helpers/serverProcess.ts';
import type { EditOp } from '../../shared/protocol/messages.ts';
import { itemAt } from '../../shared/util/invariant.ts';

const CLIENTS = Number(process.env.BENCH_CLIENTS ?? 25);
const RATE_PER_S = Number(process.env.BENCH_RATE ?? 10);
const DURATION_S = Number(process.env.BENCH_SECONDS ?? 20);

function cpuSeconds(pid: number): number {
  const fields = itemAt(readFileSync(`/proc/${pid}/stat`, 'utf8').split(') '), 1).split(' ');
  return (Number(fields[11]) + Number(fields[12])) / 100; // utime + stime, clock ticks at 100 Hz
}
function memoryMb(pid: number, key: 'VmRSS' | 'VmHWM'): number {
  const line = readFileSync(`/proc/${pid}/status`, 'utf8').split('\n').find((l) => l.startsWith(key))!;
  return Number(line.split(/\s+/)[1]) / 1024;
}
const pct = (sorted: number[], p: number) => itemAt(sorted, Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length)));

async function main() {
  const cluster = await startThrowawayCluster();
  await ensureDatabase(cluster.adminUrl, 'bench_collab', cluster.templateDb);
  const url = cluster.adminUrl.replace(/\/[^/]*$/, '/bench_collab');
  const db = openDatabase(url, { max: 2 });
  const world = await seedTeam(db.db, Array.from({ length: 5 }, (_, i) => ({ name: `Bench${i}`, role: 'editor' as const })));
  const server = await startServerProcess(url, await freePort());
  const pid = server.child.pid!;

  const sentAt = new Map<string, number>();
  const latencies: number[] = [];
  const receivedBy = new Map<string, number>();
  const clients: SimClient[] = [];
  for (let i = 0; i < CLIENTS; i++) {
    const c = simClient(server.url, await signInCookie(server.url, itemAt(world.users, i % 5).email, RT_PASSWORD));
    c.socket.on('message', (m) => {
      if (m.type === 'edit') {
        const t0 = sentAt.get(m.op.opId);
        if (t0 !== undefined) latencies.push(performance.now() - t0);
        receivedBy.set(m.op.opId, (receivedBy.get(m.op.opId) ?? 0) + 1);
      }
    });
    const send = c.socket.emit.bind(c.socket);
    c.socket.emit = ((ev: 'message', msg: Parameters<SimClient['send']>[0]) => {
      if (msg.type === 'edit' && !sentAt.has(msg.op.opId)) sentAt.set(msg.op.opId, performance.now());
      return send(ev, msg);
    }) as typeof c.socket.emit;
    clients.push(c);
  }
  await until(() => clients.every((c) => c.socket.connected), 20_000, 'connect');
  for (const c of clients) c.engine.join(world.sketchId);
  await until(() => clients.every((c) => c.engine.state !== null), 20_000, 'join');

  const cpu0 = cpuSeconds(pid);
  const clientCpu0 = process.cpuUsage();
  const t0 = performance.now();
  const stopAt = Date.now() + DURATION_S * 1000;
  await Promise.all(
    clients.map(async (c, i) => {
      const rand = prng(1000 + i);
      let n = 0;
      while (Date.now() < stopAt) {
        const pts = c.engine.state!.document.section.points;
        const k = Math.floor(rand() * pts.length);
        const op: EditOp = { type: 'moveVertices', opId: `b${i}-${n++}`, indices: [k], to: [[itemAt(pts, k)[0] + (rand() - 0.5) * 0.002, itemAt(pts, k)[1] + (rand() - 0.5) * 0.002]] };
        if (c.engine.submit(op).ok) c.submitted.push(op.opId);
        await new Promise((r) => setTimeout(r, 1000 / RATE_PER_S));
      }
    }),
  );
  await until(() => clients.every((c) => c.engine.pendingCount === 0), 60_000, 'drain');
  const wall = (performance.now() - t0) / 1000;
  const cpu = cpuSeconds(pid) - cpu0;
  const clientCpu = process.cpuUsage(clientCpu0);
  const clientCpuS = (clientCpu.user + clientCpu.system) / 1e6;
  await new Promise((r) => setTimeout(r, 500));

  const applied = clients.flatMap((c) => c.received.filter((m) => m.type === 'ack' && m.status !== 'rejected').map((m) => (m as { opId: string }).opId));
  const rejected = clients.reduce((s, c) => s + c.rejected.size, 0);
  const lost = applied.filter((id) => (receivedBy.get(id) ?? 0) < CLIENTS - 1).length;
  latencies.sort((a, b) => a - b);
  const row = (k: string, v: string) => console.log(`${k.padEnd(34)} ${v}`);
  console.log(`\nCollaboration benchmark: ${CLIENTS} clients × ${RATE_PER_S} edits/s × ${DURATION_S} s, one sketch, server in its own process\n`);
  row('edits submitted', String(clients.reduce((s, c) => s + c.submitted.length, 0)));
  row('edits applied (acked)', `${applied.length}  (${(applied.length / wall).toFixed(0)}/s)`);
  row('edits rejected (with reason)', String(rejected));
  row('send → receipt, p50 / p95 / p99', `${pct(latencies, 50).toFixed(1)} / ${pct(latencies, 95).toFixed(1)} / ${pct(latencies, 99).toFixed(1)} ms  (${latencies.length} receipts; target p95 ≤ 30 ms)`);
  row('edits lost', `${lost}  (must be 0)`);
  row('server CPU', `${((cpu / wall) * 100).toFixed(0)} % of one core (${cpu.toFixed(1)} s over ${wall.toFixed(1)} s)`);
  row('clients\' process CPU', `${((clientCpuS / wall) * 100).toFixed(0)} % of one core (all ${CLIENTS} clients and the measurement share it)`);
  row('server memory RSS / peak', `${memoryMb(pid, 'VmRSS').toFixed(0)} / ${memoryMb(pid, 'VmHWM').toFixed(0)} MB`);

  for (const c of clients) c.close();
  await server.stop();
  await db.close();
  cluster.stop();
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
