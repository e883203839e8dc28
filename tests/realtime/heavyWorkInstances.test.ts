/**
 * [H1] across instances: a person's heavy-work slots (server studies, PDF reports) live in
 * PostgreSQL as leases (server/http/heavyWork.ts), so two server processes on one database give
 * a person two slots in all, not two each. An instance that dies frees its slots once their lease
 * (HEAVY_SLOT_LEASE_MS) runs out; one that hangs past its lease stops its study when it wakes
 * and saves nothing; terminated database connections stop neither the servers nor the renewals.
 *
 * Studies here compute at most 50 points per slice (FAULT_STUDY_SLICE_POINTS) and pause 2 s
 * between slices (FAULT_STUDY_PAUSE_MS): a maximal study runs for about 13 minutes however fast
 * the machine solves, so each is still running while the test acts (with slices cut by time
 * alone, a fast solve finished studies mid-test). Every wait is on state (the slots table, an
 * answer), never a fixed sleep.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { eq } from 'drizzle-orm';
import pg from 'pg';
import { freePort } from '../../server/lifecycle/postgres.ts';
import { heavyWorkSlots, studies } from '../../server/db/schema.ts';
import { HEAVY_SLOT_LEASE_MS } from '../../server/http/heavyWork.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { RT_PASSWORD, seedTeam } from '../helpers/realtimeWorld.ts';
import { signInCookie, until } from '../helpers/simClient.ts';
import { startServerProcess, type ServerProcess } from '../helpers/serverProcess.ts';
import { firstItem } from '../../shared/util/invariant.ts';

/** 100 Mach numbers × 200 incidences: the largest study allowed ([ST4]), a few hundred slices. */
const MAXIMAL = { mach: { kind: 'range', start: 1.5, end: 5.46, step: 0.04 }, alpha: { startDeg: -10, endDeg: 9.9, stepDeg: 0.1 } } as const;
const FAULTS = { FAULT_STUDY_PAUSE_MS: '2000', FAULT_STUDY_SLICE_POINTS: '50' };
const PER_PERSON = /^You already have 2 studies or reports being computed \(at most 2 at a time per person\)/;

interface Answer {
  status: number;
  body: { error?: { code: string; message: string } } & Record<string, unknown>;
}

/** A study request left running: its answer (or how it ended without one) and a way to close it. */
interface RunningStudy {
  answer: Promise<Answer | 'closed' | 'connection lost'>;
  close(): void;
}

function startStudy(server: ServerProcess, cookie: string, sketchId: string, name: string): RunningStudy {
  const closer = new AbortController();
  const answer = fetch(`${server.url}/api/sketches/${sketchId}/studies`, {
    method: 'POST',
    headers: { cookie, 'content-type': 'application/json', 'x-shockwright-request': '1' },
    body: JSON.stringify({ name, definition: MAXIMAL }),
    signal: closer.signal,
  }).then(
    async (res): Promise<Answer> => ({ status: res.status, body: await res.json() }),
    (): 'closed' | 'connection lost' => (closer.signal.aborted ? 'closed' : 'connection lost'),
  );
  return { answer, close: () => closer.abort() };
}

async function report(server: ServerProcess, cookie: string, sketchId: string): Promise<Answer> {
  const res = await fetch(`${server.url}/api/sketches/${sketchId}/report.pdf`, { headers: { cookie } });
  const type = res.headers.get('content-type') ?? '';
  return { status: res.status, body: type.includes('json') ? await res.json() : { pdfBytes: (await res.arrayBuffer()).byteLength } };
}

/** 'T' while the process is stopped (SIGSTOP), from /proc/<pid>/stat. */
async function stopped(pid: number): Promise<boolean> {
  const { readFile } = await import('node:fs/promises');
  return (await readFile(`/proc/${pid}/stat`, 'utf8')).split(') ')[1]?.startsWith('T') ?? false;
}

describe('[H1] a person’s heavy-work slots across two server instances on one database', () => {
  let database: TestDatabase;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  let one: ServerProcess;
  let two: ServerProcess;
  let cookie: string;
  let ann: string;
  const open: RunningStudy[] = [];
  const servers: ServerProcess[] = [];

  const start = async () => {
    const s = await startServerProcess(database.url, await freePort(), FAULTS);
    servers.push(s);
    return s;
  };
  /** Ann's slots in the database: the ones every instance counts. */
  const annSlots = async () => (await database.db.select().from(heavyWorkSlots).where(eq(heavyWorkSlots.userId, ann))).length;
  const study = (server: ServerProcess, name: string) => {
    const s = startStudy(server, cookie, world.sketchId, name);
    open.push(s);
    return s;
  };

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, [{ name: 'Ann', role: 'editor' }]);
    ann = firstItem(world.users).id;
    [one, two] = [await start(), await start()];
    // One session, used on both instances (sessions live in the database).
    cookie = await signInCookie(one.url, firstItem(world.users).email, RT_PASSWORD);
  });
  afterAll(async () => {
    for (const s of open) s.close();
    for (const s of servers) if (s.child.pid && s.alive()) s.child.kill('SIGCONT');
    await Promise.all(servers.map((s) => s.stop()));
    await database?.drop();
  });

  it('one study on each instance holds both of the person’s slots: a third, on either instance, is refused with the per-person message; closing one frees it for the other instance', async () => {
    const onOne = study(one, 'On one');
    const onTwo = study(two, 'On two');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(2);

    const third = await startStudy(one, cookie, world.sketchId, 'Third').answer;
    expect(third).toMatchObject({ status: 429, body: { error: { code: 'busy', message: expect.stringMatching(PER_PERSON) } } });
    const reportOnTwo = await report(two, cookie, world.sketchId);
    expect(reportOnTwo).toMatchObject({ status: 429, body: { error: { code: 'busy', message: expect.stringMatching(PER_PERSON) } } });

    // Ann closes the tab of the study on instance two: its slot is given back, and instance one
    // — which never held it — lets her start heavy work again.
    onTwo.close();
    expect(await onTwo.answer).toBe('closed');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(1);
    const reportOnOne = await report(one, cookie, world.sketchId);
    expect(reportOnOne.status).toBe(200);
    expect(reportOnOne.body.pdfBytes).toBeGreaterThan(1000);

    onOne.close();
    expect(await onOne.answer).toBe('closed');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(0);
    expect(await database.db.select().from(studies)).toEqual([]);
  });

  it('terminated database connections stop neither instance nor the lease renewals of a running study', async () => {
    const running = study(one, 'Through the drop');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(1);
    const before = firstItem(await database.db.select().from(heavyWorkSlots).where(eq(heavyWorkSlots.userId, ann)));
    const admin = new pg.Client({ connectionString: inject('pgAdminUrl') });
    await admin.connect();
    try {
      await admin.query(`select pg_terminate_backend(pid) from pg_stat_activity where datname = $1 and pid <> pg_backend_pid()`, [database.name]);
    } finally {
      await admin.end();
    }
    // The lease keeps being renewed over new connections; the study keeps its slot.
    await until(
      async () => {
        const rows = await database.db.select().from(heavyWorkSlots).where(eq(heavyWorkSlots.id, before.id)).catch(() => []);
        return rows.some((r) => r.leaseUntil > before.leaseUntil);
      },
      60_000,
      'the lease renewed after the connections were terminated',
    );
    expect(one.alive() && two.alive()).toBe(true);
    expect((await report(two, cookie, world.sketchId)).status).toBe(200);
    running.close();
    expect(await running.answer).toBe('closed');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(0);
  });

  it(`an instance killed mid-study frees its slot once its lease (${HEAVY_SLOT_LEASE_MS / 1000} s) runs out, never before`, async () => {
    const doomed = study(one, 'On the killed instance');
    const onTwo = study(two, 'On two');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(2);

    await one.kill();
    expect(await doomed.answer).toBe('connection lost');
    // The dead instance's lease still counts for a while: the bound is never exceeded…
    expect((await report(two, cookie, world.sketchId)).status).toBe(429);
    // …and then runs out by itself: Ann may start heavy work again on the living instance.
    await until(async () => (await report(two, cookie, world.sketchId)).status === 200, HEAVY_SLOT_LEASE_MS + 60_000, 'the dead instance’s slot is free');
    expect(await annSlots()).toBe(1);
    expect(two.alive()).toBe(true);

    onTwo.close();
    expect(await onTwo.answer).toBe('closed');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(0);
  }, 180_000);

  it('an instance that hangs past its lease loses the slot to the other instance; when it wakes its study stops with a 503 and saves nothing', async () => {
    const three = await start();
    const hung = study(three, 'On the hung instance');
    const onTwo = study(two, 'On two');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(2);

    three.child.kill('SIGSTOP');
    await until(() => stopped(three.child.pid!), 10_000, 'instance three is stopped');
    // Its lease runs out while it hangs, and Ann's place goes to new work on instance two.
    await until(async () => (await report(two, cookie, world.sketchId)).status === 200, HEAVY_SLOT_LEASE_MS + 60_000, 'the hung instance’s lease ran out');
    const taker = study(two, 'Took the place');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(2);

    three.child.kill('SIGCONT');
    const answer = await hung.answer;
    expect(answer).toMatchObject({ status: 503, body: { error: { code: 'heavy_slot_lost', message: expect.stringMatching(/Nothing was saved; please start it again/) } } });
    expect(three.alive()).toBe(true);
    // The bound held throughout: Ann's two slots are the two studies on instance two.
    expect(await annSlots()).toBe(2);
    expect(await database.db.select().from(studies)).toEqual([]);

    for (const s of [onTwo, taker]) s.close();
    expect(await onTwo.answer).toBe('closed');
    expect(await taker.answer).toBe('closed');
    await expect.poll(annSlots, { timeout: 60_000 }).toBe(0);
  }, 180_000);
});
