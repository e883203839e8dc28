/**
 * Heavy work is bounded per person and per instance [H1] (server/http/heavyWork.ts; across
 * instances: tests/realtime/heavyWorkInstances.test.ts): four
 * maximal studies running at once leave /api/health answering, and with the four slots taken a
 * fifth heavy request — or a person's third — is refused at once with a 429 that says why; a
 * study whose request is closed stops and frees its slot. No timing is asserted.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { STUDY_MAX_POINTS } from '../../shared/model/study.ts';
import { eq } from 'drizzle-orm';
import { heavyWorkSlots } from '../../server/db/schema.ts';
import { CSRF, createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';

/** 100 Mach numbers × 200 incidences: the largest study allowed ([ST4]). */
const MAXIMAL = { mach: { kind: 'range', start: 1.5, end: 5.46, step: 0.04 }, alpha: { startDeg: -10, endDeg: 9.9, stepDeg: 0.1 } } as const;

describe('[H1] heavy work bounded per person and per instance', () => {
  let world: World;
  let owner: string;
  let editor: string;
  let outsider: string;
  let sketchId: string;
  let outsiderSketch: string;

  beforeAll(async () => {
    world = await createWorld();
    owner = (await signIn(world, 'owner'))!;
    editor = (await signIn(world, 'editor'))!;
    outsider = (await signIn(world, 'outsider'))!;
    sketchId = await freshSketch(world, world.teamId, 'Envelope sweep');
    outsiderSketch = await freshSketch(world, world.outsiderTeamId, 'Elsewhere');
  });
  afterAll(async () => world?.close());

  /** Heavy-work slots held in the database now (of one person, or everyone's). */
  async function slotsInDatabase(userId?: string): Promise<number> {
    const rows = await world.database.db.select().from(heavyWorkSlots).where(userId ? eq(heavyWorkSlots.userId, userId) : undefined);
    return rows.length;
  }

  const study = (cookie: string, sketch: string, name: string) =>
    request(world.app).post(`/api/sketches/${sketch}/studies`).set(CSRF).set('Cookie', cookie).send({ name, definition: MAXIMAL });

  it('four maximal studies at once: /api/health answers while they run, and all four are saved', async () => {
    const heavy = world.built.context.heavy;
    // Two people, two maximal studies each: the instance's four slots.
    const running = [study(owner, sketchId, 'A1'), study(owner, sketchId, 'A2'), study(editor, sketchId, 'B1'), study(editor, sketchId, 'B2')].map((r) => r.then((res) => res));
    await expect.poll(() => heavy.running(), { timeout: 60_000 }).toBe(4);
    const health = await request(world.app).get('/api/health');
    expect(health.status).toBe(200);
    expect(health.body.status).toBe('ok');

    const done = await Promise.all(running);
    expect(done.map((r) => r.status)).toEqual([201, 201, 201, 201]);
    expect(done.map((r) => r.body.points)).toEqual([STUDY_MAX_POINTS, STUDY_MAX_POINTS, STUDY_MAX_POINTS, STUDY_MAX_POINTS]);
    expect(heavy.running()).toBe(0);
  });

  it('with the four slots taken, a fifth heavy request (study or report) and a person’s third get 429 at once, saying why; nothing is written', async () => {
    const heavy = world.built.context.heavy;
    // Hold the slots with work that ends when the test says so (a study's length depends on the machine).
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    const occupants = [world.users.owner.id, world.users.owner.id, world.users.editor.id, world.users.editor.id].map((id) => heavy.run(id, 'held work', () => held));
    // The four slots are claimed in the database (shared by every instance), then the work runs.
    await expect.poll(() => heavy.running()).toBe(4);
    expect(await slotsInDatabase()).toBe(4);
    try {
      const third = await study(owner, sketchId, 'A3');
      expect(third.status).toBe(429);
      expect(third.headers['retry-after']).toBe('5');
      expect(third.body.error).toEqual({ code: 'busy', message: expect.stringMatching(/^You already have 2 studies or reports being computed \(at most 2 at a time per person\)/), details: { retryAfterSeconds: 5 } });

      const fifth = await study(outsider, outsiderSketch, 'C1');
      expect(fifth.status).toBe(429);
      expect(fifth.body.error.message).toMatch(/^The server is computing 4 studies and reports right now, as many as it runs at once/);
      const report = await request(world.app).get(`/api/sketches/${outsiderSketch}/report.pdf`).set('Cookie', outsider);
      expect(report.status).toBe(429);
      expect(report.body.error.code).toBe('busy');
      expect((await request(world.app).get('/api/health')).status).toBe(200);
    } finally {
      release();
      await Promise.all(occupants);
    }
    expect(heavy.running()).toBe(0);
    expect(await slotsInDatabase()).toBe(0);

    // The slots are free again; the refused requests wrote nothing.
    const after = await study(outsider, outsiderSketch, 'C2');
    expect(after.status).toBe(201);
    const list = await request(world.app).get(`/api/sketches/${sketchId}/studies`).set('Cookie', owner);
    expect(list.body.items.map((s: { name: string }) => s.name).sort()).toEqual(['A1', 'A2', 'B1', 'B2']);
    const elsewhere = await request(world.app).get(`/api/sketches/${outsiderSketch}/studies`).set('Cookie', outsider);
    expect(elsewhere.body.items.map((s: { name: string }) => s.name)).toEqual(['C2']);
  });

  it('a study whose request is closed stops, saves nothing and frees its slot', async () => {
    const heavy = world.built.context.heavy;
    const before = await request(world.app).get(`/api/sketches/${sketchId}/studies`).set('Cookie', editor);
    // The person closes the tab while a maximal study runs (the request is aborted mid-way).
    const closing = study(editor, sketchId, 'Closed tab');
    const settled = closing.then(
      () => 'answered',
      () => 'aborted',
    );
    await expect.poll(() => heavy.running(), { timeout: 60_000 }).toBe(1);
    closing.abort();
    expect(await settled).toBe('aborted');
    // The study stops at its next slice instead of running its 20,000 points to the end.
    await expect.poll(() => heavy.running(), { timeout: 60_000 }).toBe(0);
    // Given back in the database too, where other instances count it.
    await expect.poll(() => slotsInDatabase(world.users.editor.id)).toBe(0);
    const after = await request(world.app).get(`/api/sketches/${sketchId}/studies`).set('Cookie', editor);
    expect(after.body.total).toBe(before.body.total);
    expect(after.body.items.map((s: { name: string }) => s.name)).not.toContain('Closed tab');
    // Both of the person's slots are free: two studies may start again.
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    const two = [heavy.run(world.users.editor.id, 'held work', () => held), heavy.run(world.users.editor.id, 'held work', () => held)];
    await expect.poll(() => heavy.running()).toBe(2);
    release();
    await Promise.all(two);
  });

  it('a refused or failed heavy request frees its slot: an invalid study and a report of an unknown study leave nothing running', async () => {
    const heavy = world.built.context.heavy;
    const bad = await request(world.app).post(`/api/sketches/${sketchId}/studies`).set(CSRF).set('Cookie', owner).send({ name: 'Bad', definition: { ...MAXIMAL, designPointId: 'point_zzzzzzzzzzzzzzzzzzzz' } });
    expect(bad.status).toBe(400);
    const missing = await request(world.app).get(`/api/sketches/${sketchId}/report.pdf?study=study_zzzzzzzzzzzzzzzzzzzz`).set('Cookie', owner);
    expect(missing.status).toBe(404);
    expect(heavy.running()).toBe(0);
    for (let i = 0; i < 3; i++) expect((await request(world.app).get(`/api/sketches/${sketchId}/report.pdf`).set('Cookie', owner)).status).toBe(200);
  });
});
