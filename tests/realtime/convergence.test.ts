import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type RunningServer } from '../../server/index.ts';
import { freePort } from '../../server/lifecycle/postgres.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { testEnv } from '../helpers/app.ts';
import { RT_PASSWORD, seedTeam, storedAndReplayed } from '../helpers/realtimeWorld.ts';
import { prng, randomEdit, signInCookie, simClient, until, type SimClient } from '../helpers/simClient.ts';
import type { ServerMessage } from '../../shared/protocol/messages.ts';
import { startServerProcess, type ServerProcess } from '../helpers/serverProcess.ts';
import { itemAt } from '../../shared/util/invariant.ts';

/**
 * Runs `clients` simulated editors that each submit a random edit every `everyMs` (on average)
 * for `durationMs`, or until `stop()` says so. Resolves when they have stopped submitting.
 */
async function storm(clients: SimClient[], duration: number | (() => boolean), everyMs: number, seed: number): Promise<void> {
  const stopAt = Date.now() + (typeof duration === 'number' ? duration : Infinity);
  const stop = typeof duration === 'function' ? duration : () => false;
  await Promise.all(
    clients.map(async (c, i) => {
      const rand = prng(seed * 100 + i);
      let n = 0;
      while (Date.now() < stopAt && !stop()) {
        const state = c.engine.state;
        if (state) {
          const opId = `c${i}-${n++}`;
          if (c.engine.submit(randomEdit(state.document, rand, opId)).ok) c.submitted.push(opId);
        }
        await new Promise((r) => setTimeout(r, everyMs * (0.5 + rand())));
      }
    }),
  );
}

async function expectConverged(database: TestDatabase, world: Awaited<ReturnType<typeof seedTeam>>, clients: SimClient[]) {
  await until(() => clients.every((c) => c.engine.connected && c.engine.pendingCount === 0), 30_000, 'every client drained');
  const { row, log, replayed } = await storedAndReplayed(database.db, world.sketchId, { title: 'Shared section', document: world.initial });
  await until(() => clients.every((c) => c.engine.revision === row.revision), 10_000, 'every client at the stored revision');
  // Every client, the database, and a replay of the op log agree.
  for (const c of clients) expect(c.engine.state).toEqual({ title: row.title, document: row.document });
  expect(replayed).toEqual({ title: row.title, document: row.document });
  // Revisions are 1…R without holes, each op id applied at most once.
  expect(log.map((e) => e.revision)).toEqual(Array.from({ length: row.revision }, (_, i) => i + 1));
  expect(new Set(log.map((e) => e.opId)).size).toBe(log.length);
  return { row, log };
}

describe('convergence: 20 clients editing one sketch at once', () => {
  let database: TestDatabase;
  let server: RunningServer;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  const clients: SimClient[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, ['Ann', 'Bo', 'Cato', 'Dee'].map((name) => ({ name, role: 'editor' as const })));
    server = await startServer(testEnv(database.url), { log: () => {} });
    for (let i = 0; i < 20; i++) {
      const u = itemAt(world.users, i % 4);
      const c = simClient(server.url, await signInCookie(server.url, u.email, RT_PASSWORD));
      clients.push(c);
    }
    await until(() => clients.every((c) => c.socket.connected), 10_000, 'all connected');
    for (const c of clients) c.engine.join(world.sketchId);
    await until(() => clients.every((c) => c.engine.state !== null), 10_000, 'all joined');
  });
  afterAll(async () => {
    for (const c of clients) c.close();
    await server?.close();
    await database?.drop();
  });

  it('[R2][R3][R6] all clients, the database and the replayed op log are identical; every op acked exactly once', async () => {
    await storm(clients, 4000, 120, 7);
    const { log } = await expectConverged(database, world, clients);
    const submitted = clients.flatMap((c) => c.submitted);
    expect(submitted.length).toBeGreaterThan(300);
    const applied = new Set(log.map((e) => e.opId));
    for (const c of clients) {
      for (const id of c.submitted) {
        if (c.sent.has(id)) {
          // Sent: acked exactly once, and applied unless the ack said rejected (with a reason).
          expect(c.acks.get(id), `acks for ${id}`).toBe(1);
          expect(applied.has(id), `${id} applied xor rejected`).toBe(!c.rejected.has(id));
        } else {
          // Never sent: dropped locally because a concurrent edit made it meaningless (a vertex
          // deleted or the section replaced; a design point removed, or its name taken meanwhile).
          expect(c.dropped.get(id), `${id} was dropped with a reason`).toMatch(/deleted|replaced|simple polygon|vertex|design point/);
          expect(applied.has(id)).toBe(false);
        }
      }
    }
    // Conflicts are real (twenty people on one small polygon), but plenty of edits get through.
    expect(applied.size).toBeGreaterThan(150);
  });
});

describe('a server crash in the middle of editing', () => {
  let database: TestDatabase;
  let proc: ServerProcess;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  const clients: SimClient[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, ['Eve', 'Fay'].map((name) => ({ name, role: 'editor' as const })));
    proc = await startServerProcess(database.url, await freePort());
  });
  afterAll(async () => {
    for (const c of clients) c.close();
    await proc?.stop();
    await database?.drop();
  });

  it('clients reconnect, re-send what was pending, converge, and the database holds every acked op', async () => {
    for (let i = 0; i < 6; i++) {
      clients.push(simClient(proc.url, await signInCookie(proc.url, itemAt(world.users, i % 2).email, RT_PASSWORD)));
    }
    await until(() => clients.every((c) => c.socket.connected), 10_000, 'all connected');
    for (const c of clients) c.engine.join(world.sketchId);
    await until(() => clients.every((c) => c.engine.state !== null), 10_000, 'all joined');

    const port = Number(new URL(proc.url).port);
    let stopEditing = false;
    const editing = storm(clients, () => stopEditing, 40, 11);
    // Crash once every client's edits are flowing; restart once every client has seen it go.
    await until(() => clients.every((c) => c.acks.size >= 3), 60_000, 'edits acked before the crash');
    await proc.kill();
    await until(() => clients.every((c) => !c.socket.connected), 30_000, 'every client saw the crash');
    proc = await startServerProcess(database.url, port);
    const ackedBefore = clients.map((c) => c.acks.size);
    await until(() => clients.every((c, i) => c.acks.size >= itemAt(ackedBefore, i) + 3), 60_000, 'edits acked after the restart');
    stopEditing = true;
    await editing;

    const { log } = await expectConverged(database, world, clients);
    const applied = new Set(log.map((e) => e.opId));
    const acked = clients.flatMap((c) => [...c.received.filter((m) => m.type === 'ack' && m.status !== 'rejected').map((m) => (m as { opId: string }).opId)]);
    for (const id of acked) expect(applied.has(id), `acked op ${id} is in the database`).toBe(true);
    // The crash really happened while edits were in flight.
    expect(clients.some((c) => c.received.some((m) => m.type === 'replay' || m.type === 'snapshot'))).toBe(true);
  });
});

describe('two server instances on one database', () => {
  let database: TestDatabase;
  let procs: ServerProcess[] = [];
  let world: Awaited<ReturnType<typeof seedTeam>>;
  const clients: SimClient[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, ['Gil', 'Hal'].map((name) => ({ name, role: 'editor' as const })));
    procs = [await startServerProcess(database.url, await freePort()), await startServerProcess(database.url, await freePort())];
    // The two instances must know each other (adapter heartbeat) before anyone joins: wait
    // until someone joining on the second shows in the people list of a member on the first.
    const cookies = [await signInCookie(itemAt(procs, 0).url, itemAt(world.users, 0).email, RT_PASSWORD), await signInCookie(itemAt(procs, 1).url, itemAt(world.users, 1).email, RT_PASSWORD)];
    const watcher = simClient(itemAt(procs, 0).url, itemAt(cookies, 0));
    watcher.engine.join(world.sketchId);
    await until(() => watcher.engine.state !== null, 30_000, 'watcher joined');
    await until(async () => {
      const from = watcher.received.length;
      const visitor = simClient(itemAt(procs, 1).url, itemAt(cookies, 1));
      try {
        await until(() => visitor.socket.connected, 30_000, 'visitor connected');
        visitor.engine.join(world.sketchId);
        const seen = (m: ServerMessage) => (m.type === 'people' || m.type === 'joined') && m.people.length >= 2;
        return await watcher.waitFor(seen, 2000, from).then(() => true, () => false);
      } finally {
        visitor.close();
      }
    }, 60_000, 'the two instances see each other');
    watcher.close();
  });
  afterAll(async () => {
    for (const c of clients) c.close();
    for (const p of procs) await p.stop();
    await database?.drop();
  });

  it('edits through both instances reach everyone in one order and converge', async () => {
    for (let i = 0; i < 8; i++) {
      const proc = itemAt(procs, i % 2);
      clients.push(simClient(proc.url, await signInCookie(proc.url, itemAt(world.users, i % 2).email, RT_PASSWORD)));
    }
    await until(() => clients.every((c) => c.socket.connected), 10_000, 'all connected');
    for (const c of clients) c.engine.join(world.sketchId);
    await until(() => clients.every((c) => c.engine.state !== null), 10_000, 'all joined');
    // Presence crosses instances too: everyone sees all eight connections.
    await until(() => clients.every((c) => {
      const last = [...c.received].reverse().find((m) => m.type === 'people' || m.type === 'joined') as { people: unknown[] } | undefined;
      return last?.people.length === 8;
    }), 15_000, 'people lists across instances');
    await storm(clients, 3000, 50, 23);
    await expectConverged(database, world, clients);
  });
});
