import { selectedPoint } from '../../shared/model/sketch.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type RunningServer } from '../../server/index.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { testEnv } from '../helpers/app.ts';
import { RT_PASSWORD, seedTeam } from '../helpers/realtimeWorld.ts';
import { signInCookie, simClient, until, type SimClient } from '../helpers/simClient.ts';
import { PING_INTERVAL_MS, PING_TIMEOUT_MS, PROTOCOL_VERSION, type ServerMessage } from '../../shared/protocol/messages.ts';
import { spawn } from 'node:child_process';
import path from 'node:path';
import { firstItem, firstItems, itemAt } from '../../shared/util/invariant.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');

describe('realtime protocol against one server', () => {
  let database: TestDatabase;
  let server: RunningServer;
  let world: Awaited<ReturnType<typeof seedTeam>>;
  const clients: SimClient[] = [];

  async function client(who: number): Promise<SimClient> {
    const c = simClient(server.url, await signInCookie(server.url, itemAt(world.users, who).email, RT_PASSWORD));
    clients.push(c);
    await until(() => c.socket.connected, 5000, 'socket connect');
    return c;
  }

  beforeAll(async () => {
    database = await createTestDatabase();
    world = await seedTeam(database.db, [
      { name: 'Ada', role: 'editor' },
      { name: 'Ben', role: 'editor' },
      { name: 'Cy', role: 'viewer' },
    ]);
    server = await startServer(testEnv(database.url), { log: () => {} });
  });
  afterAll(async () => {
    for (const c of clients) c.close();
    await server?.close();
    await database?.drop();
  });

  it('[R1] a malformed message gets an error naming the problem and changes nothing', async () => {
    const a = await client(0);
    a.send({ type: 'edit', sketchId: world.sketchId, baseRevision: 0, op: { type: 'deleteVertex', opId: 'x', index: -1 } } as never);
    const err = (await a.waitFor((m) => m.type === 'error')) as Extract<ServerMessage, { type: 'error' }>;
    expect(err.code).toBe('invalid_message');
    expect(err.reason).toMatch(/op\.index/);
    a.send({ type: 'edit', sketchId: world.sketchId, baseRevision: 0, op: { type: 'deleteVertex', opId: 'y', index: 1 } });
    const notJoined = (await a.waitFor((m) => m.type === 'error' && m.code === 'not_joined')) as Extract<ServerMessage, { type: 'error' }>;
    expect(notJoined.reason).toBe('Join the sketch before sending to it.');
    a.send({ type: 'join', protocol: PROTOCOL_VERSION + 1, sketchId: world.sketchId });
    expect(((await a.waitFor((m) => m.type === 'error' && m.code === 'protocol_mismatch')) as { reason: string }).reason).toMatch(/reload the page/);
  });

  it('joining answers with the document, its revision and the people present', async () => {
    const a = itemAt(clients, 0);
    a.engine.join(world.sketchId);
    const joined = (await a.waitFor((m) => m.type === 'joined')) as Extract<ServerMessage, { type: 'joined' }>;
    expect(joined.revision).toBe(0);
    expect(joined.document.section.points).toHaveLength(16);
    expect(joined.people.map((p) => p.name)).toEqual(['Ada']);
    expect(joined.you).toMatchObject({ name: 'Ada', role: 'editor', colour: expect.stringMatching(/^#/) });
  });

  it('[R2] an edit is acked with the next revision and broadcast to the others', async () => {
    const a = firstItem(clients);
    const b = await client(1);
    b.engine.join(world.sketchId);
    await b.waitFor((m) => m.type === 'joined');
    await a.waitFor((m) => m.type === 'people' && m.people.length === 2);
    const result = a.engine.submit({ type: 'setCondition', opId: 'op-mach-1', field: 'mach', value: 3.2 });
    expect(result).toEqual({ ok: true });
    const ack = (await a.waitFor((m) => m.type === 'ack' && m.opId === 'op-mach-1')) as Extract<ServerMessage, { type: 'ack'; status: 'applied' }>;
    expect(ack).toMatchObject({ status: 'applied', revision: 1 });
    const seen = (await b.waitFor((m) => m.type === 'edit' && m.revision === 1)) as Extract<ServerMessage, { type: 'edit' }>;
    expect(seen.op).toMatchObject({ type: 'setCondition', value: 3.2 });
    await until(() => !!b.engine.state && selectedPoint(b.engine.state.document).condition.mach === 3.2, 2000, 'b sees Mach 3.2');
  });

  it('[R3] a repeated op id is acked again with the first outcome and not applied twice', async () => {
    const [a, b] = firstItems(clients, 2);
    a.send({ type: 'edit', sketchId: world.sketchId, baseRevision: 1, op: { type: 'setCondition', opId: 'op-mach-1', field: 'mach', value: 3.2 } });
    await until(() => (a.acks.get('op-mach-1') ?? 0) === 2, 2000, 'second ack');
    const acks = a.received.filter((m) => m.type === 'ack' && m.opId === 'op-mach-1');
    expect(acks).toHaveLength(2);
    expect(acks[1]).toMatchObject({ status: 'applied', revision: 1 });
    expect(a.engine.revision).toBe(1);
    // [R7] …and broadcast again: a colleague who missed the first broadcast (it died with the
    // instance that committed it) catches up; one who has it ignores the repeat.
    const repeats = () => b.received.filter((m) => m.type === 'edit' && m.op.opId === 'op-mach-1').length;
    await until(() => repeats() === 2, 10_000, 'the repeat reaches b');
    expect(b.engine.revision).toBe(1);
    expect(b.engine.pendingCount).toBe(0);
  });

  it('[R5][R6] concurrent inserts into the same facet are both kept, and both clients converge', async () => {
    const [a, b] = firstItems(clients, 2);
    // Vertex 3 → 4 is one facet; both insert into it on revision 1, before either sees the other.
    const p3 = itemAt(a.engine.state!.document.section.points, 3);
    const p4 = itemAt(a.engine.state!.document.section.points, 4);
    const mid = (t: number): [number, number] => [p3[0] + (p4[0] - p3[0]) * t, p3[1] + (p4[1] - p3[1]) * t];
    expect(a.engine.submit({ type: 'insertVertex', opId: 'ins-a', index: 4, at: mid(0.3) })).toEqual({ ok: true });
    expect(b.engine.submit({ type: 'insertVertex', opId: 'ins-b', index: 4, at: mid(0.6) })).toEqual({ ok: true });
    const ackA = (await a.waitFor((m) => m.type === 'ack' && m.opId === 'ins-a')) as { status: string; revision: number };
    const ackB = (await b.waitFor((m) => m.type === 'ack' && m.opId === 'ins-b')) as { status: string; revision: number };
    expect([ackA.revision, ackB.revision].sort()).toEqual([2, 3]);
    expect([ackA.status, ackB.status].sort()).toEqual(['applied', 'rebased']);
    await until(() => a.engine.revision === 3 && b.engine.revision === 3 && a.engine.pendingCount === 0 && b.engine.pendingCount === 0, 3000, 'both at revision 3');
    expect(a.engine.state).toEqual(b.engine.state);
    expect(a.engine.state!.document.section.points).toHaveLength(18);
    expect(a.engine.state!.document.section.points).toContainEqual(mid(0.3));
    expect(a.engine.state!.document.section.points).toContainEqual(mid(0.6));
  });

  it('a viewer can watch but every edit is rejected with the reason', async () => {
    const c = await client(2);
    c.engine.join(world.sketchId);
    await c.waitFor((m) => m.type === 'joined');
    c.send({ type: 'edit', sketchId: world.sketchId, baseRevision: 3, op: { type: 'setCondition', opId: 'viewer-op', field: 'mach', value: 2 } });
    const ack = (await c.waitFor((m) => m.type === 'ack' && m.opId === 'viewer-op')) as { status: string; reason: string };
    expect(ack).toMatchObject({ status: 'rejected', reason: 'Your role in this team is viewer; editing needs the editor role.' });
  });

  it('an edit that would break the section is rejected and the document stays as it was', async () => {
    const a = firstItem(clients);
    await until(() => a.engine.revision === 3, 2000, 'a at revision 3');
    const before = a.engine.state!.document.section.points;
    a.send({ type: 'edit', sketchId: world.sketchId, baseRevision: 3, op: { type: 'moveVertices', opId: 'tangle', indices: [4], to: [[0.5, -0.5]] } });
    const ack = (await a.waitFor((m) => m.type === 'ack' && m.opId === 'tangle')) as { status: string; reason: string };
    expect(ack.status).toBe('rejected');
    expect(ack.reason).toMatch(/simple polygon/);
    expect(a.engine.state!.document.section.points).toEqual(before);
  });

  it('[R4] presence is relayed to the others with cursor and selection', async () => {
    const [a, b] = firstItems(clients, 2);
    a.send({ type: 'presence', sketchId: world.sketchId, cursor: [0.3, 0.05], selection: [2, 3] });
    const p = (await b.waitFor((m) => m.type === 'presence')) as Extract<ServerMessage, { type: 'presence' }>;
    expect(p).toMatchObject({ cursor: [0.3, 0.05], selection: [2, 3], userId: itemAt(world.users, 0).id });
  });

  it('someone who leaves disappears from everyone’s people list', async () => {
    const [a, , c] = firstItems(clients, 3);
    const mark = a.received.length;
    c.close();
    const people = (await a.waitFor((m) => m.type === 'people', 12_000, mark)) as Extract<ServerMessage, { type: 'people' }>;
    expect(people.people.map((p) => p.name).sort()).toEqual(['Ada', 'Ben']);
  });

  it('someone whose connection goes silent (a frozen or cut-off machine) disappears within a few seconds', async () => {
    const a = firstItem(clients);
    const cookie = await signInCookie(server.url, itemAt(world.users, 2).email, RT_PASSWORD);
    const peer = spawn(process.execPath, ['--import', 'tsx', 'tests/helpers/remoteClient.ts', server.url, cookie, world.sketchId], { cwd: ROOT, stdio: ['ignore', 'pipe', 'inherit'] });
    try {
      await new Promise<void>((resolve, reject) => {
        peer.stdout!.on('data', (d) => String(d).includes('joined') && resolve());
        peer.once('exit', () => reject(new Error('peer exited')));
      });
      await a.waitFor((m) => m.type === 'people' && m.people.some((p) => p.name === 'Cy'), 5000, a.received.length - 5);
      const mark = a.received.length;
      peer.kill('SIGSTOP'); // no FIN, no pong: only the heartbeat can tell
      // The heartbeat (ping every PING_INTERVAL_MS, PING_TIMEOUT_MS to answer) notices; the
      // wait allows generous slack for a loaded machine.
      await a.waitFor((m) => m.type === 'people' && !m.people.some((p) => p.name === 'Cy'), 3 * (PING_INTERVAL_MS + PING_TIMEOUT_MS), mark);
    } finally {
      peer.kill('SIGKILL');
    }
  });

  it('a rejoining client gets the edits it missed, in order', async () => {
    const [a, b] = firstItems(clients, 2);
    b.socket.disconnect();
    a.engine.submit({ type: 'rename', opId: 'rename-1', title: 'Renamed while Ben was away' });
    await a.waitFor((m) => m.type === 'ack' && m.opId === 'rename-1');
    b.socket.connect();
    const replay = (await b.waitFor((m) => m.type === 'replay')) as Extract<ServerMessage, { type: 'replay' }>;
    expect(replay.edits.map((e) => e.op.type)).toEqual(['rename']);
    expect(itemAt(replay.edits, 0).userId).toBe(itemAt(world.users, 0).id);
    await until(() => b.engine.state?.title === 'Renamed while Ben was away', 2000, 'b sees the new title');
    expect(b.engine.revision).toBe(a.engine.revision);
  });
});
