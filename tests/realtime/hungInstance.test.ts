import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { startServer, type RunningServer } from '../../server/index.ts';
import { sketches } from '../../server/db/schema.ts';
import { storeAnalysis } from '../../server/realtime/repository.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { testEnv } from '../helpers/app.ts';
import { RT_PASSWORD, seedTeam, storedAndReplayed } from '../helpers/realtimeWorld.ts';
import { prng, signInCookie, simClient, until, type SimClient } from '../helpers/simClient.ts';
import type { EditOp } from '../../shared/protocol/messages.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');

/** 'T' while the process is stopped (SIGSTOP), from /proc/<pid>/stat. */
const processState = (pid: number) => firstItem(itemAt(readFileSync(`/proc/${pid}/stat`, 'utf8').split(') '), 1).split(' '));

/**
 * [R2] An instance frozen while it holds a sketch's row lock (a stopped process, a machine
 * swapping) must not block the editors on the other instances for as long as it hangs:
 * PostgreSQL ends a session idle in its transaction after IDLE_IN_TRANSACTION_TIMEOUT_MS, the
 * waiting batch then takes the lock, and nothing acked is lost.
 */
describe('an instance frozen while it holds a sketch’s row lock', () => {
  let database: TestDatabase;
  let server: RunningServer;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  let holder: ChildProcess | undefined;
  const clients: SimClient[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, ['Ivo', 'Jun'].map((name) => ({ name, role: 'editor' as const })));
    server = await startServer(testEnv(database.url), { log: () => {} });
  });
  afterAll(async () => {
    if (holder?.pid && holder.exitCode === null) {
      holder.kill('SIGCONT');
      holder.kill('SIGKILL');
    }
    for (const c of clients) c.close();
    await server?.close();
    await database?.drop();
  });

  it('editors on another instance get their edits through while it stays frozen; every acked edit is stored and solved', async () => {
    for (let i = 0; i < 4; i++) clients.push(simClient(server.url, await signInCookie(server.url, itemAt(world.users, i % 2).email, RT_PASSWORD)));
    await until(() => clients.every((c) => c.socket.connected), 20_000, 'all connected');
    for (const c of clients) c.engine.join(world.sketchId);
    await until(() => clients.every((c) => c.engine.state !== null), 20_000, 'all joined');

    // The other instance takes the row lock, then freezes.
    holder = spawn(process.execPath, ['--import', 'tsx', 'tests/helpers/lockHolder.ts', database.url, world.sketchId, firstItem(world.users).id], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    holder.stdout!.on('data', (d) => (output += d));
    holder.stderr!.on('data', (d) => (output += d));
    await until(() => output.includes('locked'), 30_000, `the holder locked the row (${output})`);
    holder.kill('SIGSTOP');
    await until(() => processState(holder!.pid!) === 'T', 10_000, 'the holder is stopped');

    // Everyone edits meanwhile: each client moves a vertex of its own, one edit at a time.
    const rand = prng(5);
    let n = 0;
    const editing = (async () => {
      while (!clients.every((c) => c.acks.size >= 4)) {
        for (const [i, c] of clients.entries()) {
          if (c.engine.pendingCount > 0) continue;
          const pts = c.engine.state!.document.section.points;
          const k = i * 3;
          const [x, y] = itemAt(pts, k);
          const op: EditOp = { type: 'moveVertices', opId: `h${i}-${n++}`, indices: [k], to: [[x, y + (rand() - 0.5) * 0.002]] };
          if (c.engine.submit(op).ok) c.submitted.push(op.opId);
        }
        await new Promise((r) => setTimeout(r, 50));
      }
    })();
    await until(() => clients.every((c) => c.acks.size >= 4), 60_000, 'edits acked while the holder is frozen');
    await editing;
    // The holder is still frozen: the edits did not wait for it to come back.
    expect(processState(holder.pid!)).toBe('T');

    await until(() => clients.every((c) => c.engine.pendingCount === 0), 30_000, 'every client drained');
    const { row, log, replayed } = await storedAndReplayed(database.db, world.sketchId, { title: 'Shared section', document: world.initial });
    await until(() => clients.every((c) => c.engine.revision === row.revision), 10_000, 'every client at the stored revision');
    for (const c of clients) expect(c.engine.state).toEqual({ title: row.title, document: row.document });
    expect(replayed).toEqual({ title: row.title, document: row.document });
    expect(log.map((e) => e.revision)).toEqual(Array.from({ length: row.revision }, (_, i) => i + 1));
    // Every acked edit is in the log; the frozen instance's batch wrote nothing.
    const applied = new Set(log.map((e) => e.opId));
    for (const c of clients) for (const [opId] of c.acks) expect(applied.has(opId) || c.rejected.has(opId), `acked op ${opId} is stored`).toBe(true);
    expect(applied.has('hung-op')).toBe(false);
    // The solve ran after the commits, and the stored result names the revision it belongs to.
    await expect.poll(async () => (await database.db.query.sketches.findFirst({ where: eq(sketches.id, world.sketchId) }))!.resultRevision, { timeout: 30_000 }).toBe(row.revision);
  });

  it('a stored result is never replaced by the result of an older revision', async () => {
    const read = async () => (await database.db.query.sketches.findFirst({ where: eq(sketches.id, world.sketchId), columns: { resultRevision: true, lastSolveStatus: true } }))!;
    expect(await storeAnalysis(database.db, world.sketchId, 1000, 'ok', '{"version":2}')).toBe(true);
    expect(await storeAnalysis(database.db, world.sketchId, 999, 'detached', '{"version":2}')).toBe(false);
    expect(await read()).toEqual({ resultRevision: 1000, lastSolveStatus: 'ok' });
  });
});
