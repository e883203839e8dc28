import { selectedPoint } from '../../shared/model/sketch.ts';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import pg from 'pg';
import { openDatabase } from '../../server/db/client.ts';
const DEFAULT_POOL_MAX = 10;
import { applyMigrations } from '../../server/db/migrate.ts';
import { ensureDatabase, freePort } from '../../server/lifecycle/postgres.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { RT_PASSWORD, seedTeam, storedAndReplayed } from '../helpers/realtimeWorld.ts';
import { signInCookie, simClient, until, type SimClient } from '../helpers/simClient.ts';
import { startServerProcess, type ServerProcess } from '../helpers/serverProcess.ts';
import { startOwnCluster, type OwnCluster } from '../helpers/ownCluster.ts';
import { firstItems, itemAt } from '../../shared/util/invariant.ts';

/** GET `path` with `cookie`: status and JSON body (null when the body is not JSON). */
async function get(url: string, cookie?: string): Promise<{ status: number; body: { error?: { code: string; message: string } } & Record<string, unknown> }> {
  const res = await fetch(url, { headers: cookie ? { cookie } : {} });
  const text = await res.text();
  let body;
  try {
    body = JSON.parse(text);
  } catch {
    body = { raw: text };
  }
  return { status: res.status, body };
}

/**
 * Submits an edit through `author` every few hundred ms until `witness`, on another server
 * instance, receives one of them as a live `edit` broadcast — which only travels through the
 * adapter's LISTEN connection. Returns how many edits were submitted.
 */
async function untilBroadcastCrosses(author: SimClient, witness: SimClient, tag: string, timeoutMs = 30_000): Promise<number> {
  const mine = new Set<string>();
  let n = 0;
  await until(
    () => {
      if (witness.received.some((m) => m.type === 'edit' && mine.has(m.op.opId))) return true;
      if (author.engine.pendingCount === 0 && author.engine.state) {
        const opId = `${tag}-${n++}`;
        if (author.engine.submit({ type: 'setCondition', opId, field: 'alphaDeg', value: (n % 7) - 3 }).ok) mine.add(opId);
      }
      return false;
    },
    timeoutMs,
    `an edit through one instance reaches the other (${tag})`,
  );
  return n;
}

/** Nothing secret in a server's output: no SQL parameters, password hashes or session ids. */
function expectCleanLog(output: string, cookies: string[]) {
  expect(output).not.toMatch(/\$argon2/);
  expect(output).not.toMatch(/Failed query|params:/);
  for (const c of cookies) expect(output).not.toContain(decodeURIComponent(c.slice('sw.sid='.length)).slice(2, 34));
}

describe('the database drops its connections under two running server instances', () => {
  let database: TestDatabase;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  let one: ServerProcess;
  let two: ServerProcess;
  let admin: pg.Client;
  const clients: SimClient[] = [];
  const cookies: string[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, [
      { name: 'Ann', role: 'editor' },
      { name: 'Bo', role: 'editor' },
    ]);
    one = await startServerProcess(database.url, await freePort());
    two = await startServerProcess(database.url, await freePort());
    admin = new pg.Client({ connectionString: inject('pgAdminUrl') });
    await admin.connect();
    for (const [i, server] of [one, two].entries()) {
      const cookie = await signInCookie(server.url, itemAt(world.users, i).email, RT_PASSWORD);
      cookies.push(cookie);
      const c = simClient(server.url, cookie);
      clients.push(c);
      await until(() => c.socket.connected, 30_000, 'connect');
      c.engine.join(world.sketchId);
      await c.waitFor((m) => m.type === 'joined', 30_000);
    }
  });
  afterAll(async () => {
    for (const c of clients) c.close();
    await Promise.all([one?.stop(), two?.stop()]);
    for (const s of [one, two]) if (s?.output().includes('[test] no exit')) console.warn(`a server did not stop on SIGTERM:\n${s.output().slice(-2000)}`);
    await admin?.end();
    await database?.drop();
  });

  /** pg_terminate_backend on every connection the two servers hold (LISTEN, pool, sessions). */
  async function terminateServersBackends(): Promise<number> {
    const { rows } = await admin.query<{ n: string }>(
      `select count(*) filter (where pg_terminate_backend(pid)) as n from pg_stat_activity where datname = $1 and pid <> pg_backend_pid()`,
      [database.name],
    );
    return Number(itemAt(rows, 0).n);
  }

  it(`survives ${DEFAULT_POOL_MAX + 1} rounds of terminated connections: requests, sockets and cross-instance broadcasts work again each time`, async () => {
    const [ann, bo] = firstItems(clients, 2);
    await untilBroadcastCrosses(ann, bo, 'before');
    // More rounds than the pool has slots: a lost LISTEN client that kept its slot would exhaust
    // the pool before the last round.
    for (let round = 0; round < DEFAULT_POOL_MAX + 1; round++) {
      const killed = await terminateServersBackends();
      expect(killed).toBeGreaterThan(0);
      await until(async () => (await get(`${one.url}/api/auth/me`, cookies[0])).status === 200, 30_000, `instance one answers again (round ${round})`);
      await until(async () => (await get(`${two.url}/api/auth/me`, cookies[1])).status === 200, 30_000, `instance two answers again (round ${round})`);
      await untilBroadcastCrosses(round % 2 ? bo : ann, round % 2 ? ann : bo, `round-${round}`);
      expect(one.alive() && two.alive()).toBe(true);
    }
    // Everyone converged on what the database holds, which is a replay of the log.
    await until(() => clients.every((c) => c.engine.pendingCount === 0), 30_000, 'pending edits drained');
    const { row, replayed } = await storedAndReplayed(database.db, world.sketchId, { title: 'Shared section', document: world.initial });
    await until(() => clients.every((c) => c.engine.revision === row.revision), 30_000, 'clients at the stored revision');
    for (const c of clients) expect(c.engine.state).toEqual({ title: row.title, document: row.document });
    expect(replayed).toEqual({ title: row.title, document: row.document });
    expectCleanLog(one.output() + two.output(), cookies);
  }, 240_000);
});

describe('PostgreSQL stops and starts again under a running server', () => {
  let cluster: OwnCluster;
  let server: ServerProcess;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  let cookie: string;
  let client: SimClient;

  beforeAll(async () => {
    cluster = await startOwnCluster();
    await ensureDatabase(cluster.url('postgres'), 'shockwright');
    const url = cluster.url('shockwright');
    await applyMigrations(url);
    const seedDb = openDatabase(url, { max: 2 });
    world = await seedTeam(seedDb.db, [{ name: 'Cy', role: 'editor' }]);
    await seedDb.close();
    server = await startServerProcess(url, await freePort());
    cookie = await signInCookie(server.url, itemAt(world.users, 0).email, RT_PASSWORD);
    client = simClient(server.url, cookie);
    await until(() => client.socket.connected, 30_000, 'connect');
    client.engine.join(world.sketchId);
    await client.waitFor((m) => m.type === 'joined', 30_000);
  }, 120_000);
  afterAll(async () => {
    client?.close();
    await server?.stop();
    if (server?.output().includes('[test] no exit')) console.warn(`the server did not stop on SIGTERM:\n${server.output().slice(-2000)}`);
    cluster?.destroy();
  });

  it('answers a JSON 503 naming the database while it is away, keeps running, and works again once it is back — no restart', async () => {
    cluster.stop();

    // Away: every API request that needs the database says so, in the usual error shape.
    let me = await get(`${server.url}/api/auth/me`, cookie);
    expect(me.status).toBe(503);
    expect(me.body.error).toEqual({ code: 'database_unavailable', message: expect.stringMatching(/database \(PostgreSQL\) is not reachable/) });
    const signIn = await fetch(`${server.url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-shockwright-request': '1' }, body: JSON.stringify({ email: itemAt(world.users, 0).email, password: RT_PASSWORD }) });
    expect(signIn.status).toBe(503);
    const health = await get(`${server.url}/api/health`);
    expect(health.status).toBe(503);
    expect(health.body.database).toMatchObject({ reachable: false, reason: 'The database is not reachable.' });
    expect(JSON.stringify(health.body)).not.toMatch(/ECONNREFUSED|127\.0\.0\.1|terminat/i);
    // An edit made meanwhile waits in the client, unconfirmed.
    expect(client.engine.submit({ type: 'setCondition', opId: 'while-away', field: 'mach', value: 3.3 })).toEqual({ ok: true });
    await client.waitFor((m) => m.type === 'error' && m.about === 'edit', 30_000);
    expect(client.engine.pendingCount).toBe(1);
    expect(server.alive()).toBe(true);

    cluster.start();

    // Back: the same session works again within seconds, and the waiting edit is applied.
    await until(async () => (me = await get(`${server.url}/api/auth/me`, cookie)).status === 200, 30_000, 'the API answers again');
    expect((me.body as { user: { email: string } }).user.email).toBe(itemAt(world.users, 0).email);
    await until(() => client.engine.pendingCount === 0, 30_000, 'the edit made while away is confirmed');
    expect(selectedPoint(client.engine.state!.document).condition.mach).toBe(3.3);
    expect((await get(`${server.url}/api/health`)).status).toBe(200);
    expect(server.alive()).toBe(true);
    expectCleanLog(server.output(), [cookie]);
  }, 120_000);
});
