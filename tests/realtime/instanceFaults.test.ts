import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { firstItems, itemAt } from '../../shared/util/invariant.ts';
import { freePort } from '../../server/lifecycle/postgres.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { RT_PASSWORD, seedTeam, storedAndReplayed } from '../helpers/realtimeWorld.ts';
import { signInCookie, simClient, until, type SimClient } from '../helpers/simClient.ts';
import { startServerProcess, type ServerProcess } from '../helpers/serverProcess.ts';
import { lastPeople, untilInstancesMeet } from '../helpers/instances.ts';

/**
 * Two server instances on one database, one of which dies at the worst moments: right after
 * committing an edit (before acking or broadcasting it), and just before someone joins on the
 * other. Waits are on state, never on a clock.
 */
describe('an instance dying under the editors of another', () => {
  let database: TestDatabase;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  let first: ServerProcess;
  let second: ServerProcess;
  const clients: SimClient[] = [];
  const open = async (proc: ServerProcess, who: number) => {
    const c = simClient(proc.url, await signInCookie(proc.url, itemAt(world.users, who).email, RT_PASSWORD));
    clients.push(c);
    await until(() => c.socket.connected, 20_000, 'socket connected');
    c.engine.join(world.sketchId);
    await until(() => c.engine.state !== null, 20_000, 'joined');
    return c;
  };
  const emails = (): [string, string] => {
    const [a, b] = firstItems(world.users, 2);
    return [a.email, b.email];
  };

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, ['Kai', 'Lea', 'Mo'].map((name) => ({ name, role: 'editor' as const })));
    first = await startServerProcess(database.url, await freePort(), { FAULT_DIE_AFTER_COMMIT: 'die-' });
    second = await startServerProcess(database.url, await freePort());
    await untilInstancesMeet([first, second], world.sketchId, emails());
  });
  afterAll(async () => {
    for (const c of clients) c.close();
    for (const p of [first, second]) if (p?.alive()) await p.stop();
    await database?.drop();
  });

  it('[R7] an edit committed by an instance that died before broadcasting reaches the other instance’s editors without another edit', async () => {
    const author = await open(first, 0);
    const watchers = [await open(second, 1), await open(second, 2)];
    // An ordinary edit first: it reaches everyone.
    author.engine.submit({ type: 'rename', opId: 'fine-1', title: 'Before the crash' });
    await until(() => watchers.every((w) => w.engine.revision === 1), 20_000, 'the first edit reached the watchers');

    // The next one is committed, then its instance dies before acking or broadcasting it.
    author.engine.submit({ type: 'rename', opId: 'die-1', title: 'Committed, never broadcast' });
    await until(() => !first.alive(), 20_000, 'the first instance died');
    const { row } = await storedAndReplayed(database.db, world.sketchId, { title: 'Shared section', document: world.initial });
    expect(row.revision).toBe(2);
    expect(row.title).toBe('Committed, never broadcast');
    expect(watchers.every((w) => !w.received.some((m) => m.type === 'edit' && m.revision === 2))).toBe(true);

    // Nobody edits: the revision heartbeat tells the watchers they are behind, and they catch up.
    await until(() => watchers.every((w) => w.engine.revision === 2), 30_000, 'the watchers caught up');
    for (const w of watchers) {
      expect(w.engine.state).toEqual({ title: row.title, document: row.document });
      expect(w.received.some((m) => m.type === 'revision' && m.revision === 2)).toBe(true);
    }
    for (const c of clients.splice(0)) c.close();
  });

  it('a join right after an instance died completes and shows the people present, without waiting for the dead one', async () => {
    // Bring the first instance back (no fault this time), with someone on it, and let the two meet.
    first = await startServerProcess(database.url, await freePort());
    await untilInstancesMeet([first, second], world.sketchId, emails());
    const onFirst = await open(first, 0);
    const onSecond = await open(second, 1);
    await until(() => JSON.stringify(lastPeople(onSecond.received)) === JSON.stringify(['Kai', 'Lea']), 20_000, 'both instances in the people list');

    await first.kill();
    const from = Date.now();
    const joiner = await open(second, 2);
    const joinMs = Date.now() - from;
    // The joiner sees who is here; the person on the dead instance goes from everyone's list.
    await until(() => lastPeople(joiner.received)?.includes('Lea') === true && lastPeople(joiner.received)?.includes('Mo') === true, 20_000, 'the joiner sees the people present');
    await until(() => JSON.stringify(lastPeople(joiner.received)) === JSON.stringify(['Lea', 'Mo']), 30_000, 'the dead instance’s people leave the list');
    await until(() => JSON.stringify(lastPeople(onSecond.received)) === JSON.stringify(['Lea', 'Mo']), 30_000, 'the dead instance’s people leave every list');
    expect(onFirst.socket.connected).toBe(false);
    // Figures, not assertions: bench:collab prints the join times.
    if (process.env.SHOW_TIMINGS) console.log(`join right after an instance died: ${joinMs} ms`);
  });
});
