/**
 * Unstorable input is refused at the edge, never a 500, and a refused request writes nothing
 * [M5]: NUL characters and unpaired surrogates in every text field, bodies nested absurdly deep,
 * two sign-ups for one address at the same moment, and one bad edit in a batch of several [R9].
 * The fuzz suite (fuzz.test.ts) throws the same kinds of input at every route.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq, sql } from 'drizzle-orm';
import { sketches, sketchEdits, signUps, snapshots, users } from '../../server/db/schema.ts';
import { createEditQueue } from '../../server/realtime/editLog.ts';
import { MAX_JSON_DEPTH, jsonDepth } from '../../server/http/jsonDepth.ts';
import { defaultSketchDocument, FIRST_DESIGN_POINT_ID } from '../../shared/model/sketch.ts';
import { hasUnstorableText, textSchema } from '../../shared/model/text.ts';
import { clientMessageSchema, type EditOp } from '../../shared/protocol/messages.ts';
import { CSRF, createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';
import { firstItems, itemAt } from '../../shared/util/invariant.ts';

const BAD_TEXT: [string, string][] = [
  ['a NUL character', 'Fin\u0000root'],
  ['a lone high surrogate', 'Fin \uD83D root'],
  ['a lone low surrogate', 'Fin \uDE80 root'],
  ['a reversed pair', 'Fin \uDE80\uD83D root'],
];

describe('[M5] the text schema', () => {
  it('refuses NUL and unpaired surrogates, keeps paired ones (emoji) and ordinary text', () => {
    for (const [, s] of BAD_TEXT) expect(hasUnstorableText(s), JSON.stringify(s)).toBe(true);
    for (const s of ['Fin root', 'Fin 🚀 root', 'Ωμέγα', '', 'tab\there']) expect(hasUnstorableText(s), JSON.stringify(s)).toBe(false);
    expect(itemAt(textSchema().safeParse('a\u0000').error!.issues, 0).message).toBe('must not contain a NUL character or an unpaired surrogate');
  });

  it('[R1] a socket edit carrying NUL or an unpaired surrogate is refused by the message schema, naming the field', () => {
    const doc = defaultSketchDocument();
    const edit = (op: unknown) => clientMessageSchema.safeParse({ type: 'edit', sketchId: 'sketch_aaaaaaaaaaaaaaaaaaaa', baseRevision: 0, op });
    const cases: [unknown, string][] = [
      [{ type: 'rename', opId: 'op-1', title: 'Fin\u0000' }, 'op.title'],
      [{ type: 'rename', opId: 'op-\uD800', title: 'Fin' }, 'op.opId'],
      [{ type: 'renameDesignPoint', opId: 'op-2', pointId: FIRST_DESIGN_POINT_ID, name: 'Cruise \uDC00' }, 'op.name'],
      [{ type: 'replaceDocument', opId: 'op-3', document: { ...doc, notes: 'a\u0000b' } }, 'op.document.notes'],
      [{ type: 'setField', opId: 'op-4', field: 'loads.friction', value: 'laminar\u0000' }, 'op.value'],
    ];
    for (const [op, field] of cases) {
      const r = edit(op);
      expect(r.success, field).toBe(false);
      expect(r.error!.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; '), field).toContain(`${field}: must not contain a NUL character or an unpaired surrogate`);
    }
    expect(edit({ type: 'rename', opId: 'op-5', title: 'Fin 🚀' }).success).toBe(true);
  });

  it('jsonDepth counts levels without recursing (a 100 000-deep array is measured, not a stack overflow)', () => {
    expect(jsonDepth(1)).toBe(0);
    expect(jsonDepth({ a: [1, { b: [] }] })).toBe(4);
    const deep = JSON.parse(`${'['.repeat(100_000)}${']'.repeat(100_000)}`);
    expect(jsonDepth(deep)).toBe(100_000);
    expect(jsonDepth(deep, 40)).toBe(41);
  });
});

describe('unstorable text at every kind of route: a 400 naming the field, nothing written', () => {
  let world: World;
  let editor: string;
  let reviewer: string;
  let sketchId: string;
  const send = (method: 'post' | 'put' | 'patch', url: string, cookie: string, body: unknown) =>
    request(world.app)[method](url).set(CSRF).set('Cookie', cookie).send(body as object);

  /** Row counts of every table that a refused request could have written to. */
  async function counts(): Promise<Record<string, number>> {
    const r = await world.database.db.execute<{ t: string; n: string }>(sql`
      select 'sketches' as t, count(*) as n from sketches union all select 'sketch_edits', count(*) from sketch_edits
      union all select 'pins', count(*) from pins union all select 'pin_replies', count(*) from pin_replies
      union all select 'snapshots', count(*) from snapshots union all select 'sketch_events', count(*) from sketch_events
      union all select 'review_outcomes', count(*) from review_outcomes
      union all select 'studies', count(*) from studies union all select 'teams', count(*) from teams
      union all select 'users', count(*) from users union all select 'sign_ups', count(*) from sign_ups`);
    return Object.fromEntries(r.rows.map((x) => [x.t, Number(x.n)]));
  }

  beforeAll(async () => {
    world = await createWorld();
    editor = (await signIn(world, 'editor'))!;
    reviewer = (await signIn(world, 'reviewer'))!;
    sketchId = await freshSketch(world, world.teamId, 'Unstorable text');
  });
  afterAll(async () => world?.close());

  const doc = defaultSketchDocument();
  const cases: { route: string; field: RegExp; call: (bad: string) => Promise<request.Response> }[] = [
    { route: 'POST /api/teams/:id/sketches (title)', field: /title/, call: (bad) => send('post', `/api/teams/${world.teamId}/sketches`, editor, { title: bad }) },
    { route: 'PATCH /api/sketches/:id (title)', field: /title/, call: (bad) => send('patch', `/api/sketches/${sketchId}`, editor, { title: bad }) },
    { route: 'PUT document (notes)', field: /document\.notes/, call: (bad) => send('put', `/api/sketches/${sketchId}/document`, editor, { document: { ...doc, notes: bad }, baseRevision: 0 }) },
    {
      route: 'PUT document (design point name)',
      field: /document\.designPoints\[0\]\.name/,
      call: (bad) => send('put', `/api/sketches/${sketchId}/document`, editor, { document: { ...doc, designPoints: [{ ...doc.designPoints[0], name: bad }] }, baseRevision: 0 }),
    },
    { route: 'POST pins (body)', field: /body/, call: (bad) => send('post', `/api/sketches/${sketchId}/pins`, reviewer, { target: { kind: 'point', at: [0.5, 0] }, body: bad }) },
    { route: 'POST pins (wave label)', field: /target\.label/, call: (bad) => send('post', `/api/sketches/${sketchId}/pins`, reviewer, { target: { kind: 'wave', waveId: 'w1', label: bad, at: [0.5, 0] }, body: 'Look' }) },
    { route: 'POST snapshots (name)', field: /name/, call: (bad) => send('post', `/api/sketches/${sketchId}/snapshots`, editor, { name: bad }) },
    { route: 'POST snapshots (note)', field: /note/, call: (bad) => send('post', `/api/sketches/${sketchId}/snapshots`, editor, { name: 'Fine', note: bad }) },
    {
      route: 'POST import (file name)',
      field: /fileName/,
      call: (bad) => send('post', `/api/sketches/${sketchId}/import`, editor, { points: [[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]], fileName: bad }),
    },
    {
      route: 'POST studies (name)',
      field: /name/,
      call: (bad) => send('post', `/api/sketches/${sketchId}/studies`, editor, { name: bad, definition: { mach: { kind: 'list', values: [2] }, alpha: { startDeg: 0, endDeg: 1, stepDeg: 1 } } }),
    },
    { route: 'POST approvals (note)', field: /note/, call: (bad) => send('post', `/api/sketches/${sketchId}/approvals`, reviewer, { revision: 0, note: bad }) },
    { route: 'POST change-requests (note)', field: /note/, call: (bad) => send('post', `/api/sketches/${sketchId}/change-requests`, reviewer, { revision: 0, note: bad }) },
    { route: 'POST review-requests (message)', field: /message/, call: (bad) => send('post', `/api/sketches/${sketchId}/review-requests`, editor, { reviewerIds: [world.users.reviewer.id], message: bad }) },
    { route: 'POST /api/teams (name)', field: /name/, call: (bad) => send('post', '/api/teams', editor, { name: bad }) },
    { route: 'POST sign-up (name)', field: /name/, call: (bad) => request(world.app).post('/api/auth/sign-up').set(CSRF).send({ name: bad, email: 'new@example.test', password: 'a long password', teamName: 'T' }) },
    { route: 'POST sign-up (team name)', field: /teamName/, call: (bad) => request(world.app).post('/api/auth/sign-up').set(CSRF).send({ name: 'N', email: 'new@example.test', password: 'a long password', teamName: bad }) },
    { route: 'POST sign-up (password)', field: /password/, call: (bad) => request(world.app).post('/api/auth/sign-up').set(CSRF).send({ name: 'N', email: 'new@example.test', password: `${bad} long enough`, teamName: 'T' }) },
    { route: 'POST sign-in (email)', field: /email/, call: (bad) => request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email: `${bad}@example.test`, password: 'x' }) },
    { route: 'POST /api/solve (name)', field: /name/, call: (bad) => send('post', '/api/solve', editor, { name: bad, section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] }, flow: { mach: 2, alphaDeg: 1 } }) },
  ];

  for (const c of cases) {
    it(`${c.route}: NUL and unpaired surrogates are a 400 naming the field`, async () => {
      const before = await counts();
      for (const [what, bad] of BAD_TEXT) {
        const res = await c.call(bad);
        expect(res.status, `${what}: ${JSON.stringify(res.body)}`).toBe(400);
        expect(res.body.error.message, what).toMatch(c.field);
        expect(res.body.error.message, what).toMatch(/NUL character or an unpaired surrogate/);
      }
      expect(await counts()).toEqual(before);
      const row = await world.database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) });
      expect(row!.revision).toBe(0);
    });
  }

  it(`a body nested deeper than ${MAX_JSON_DEPTH} levels is a 400 at /api/solve and everywhere else, never a stack overflow`, async () => {
    // Sent as text: the test's own JSON encoder would overflow its stack on these.
    const deep = `${'['.repeat(50_000)}${']'.repeat(50_000)}`;
    const bodies = [
      `{"section":{"points":${deep}},"flow":{"mach":2,"alphaDeg":1}}`,
      `{"section":{"points":[[0,0],[1,0],[0.5,0.1]]},"flow":{"mach":2,"alphaDeg":1,"gamma":${deep}}}`,
      deep,
      `${'{"a":'.repeat(40)}1${'}'.repeat(40)}`,
    ];
    const raw = (method: 'post' | 'put', url: string, body: string) => request(world.app)[method](url).set(CSRF).set('Cookie', editor).set('Content-Type', 'application/json').send(body);
    for (const body of bodies) {
      const res = await raw('post', '/api/solve', body);
      expect(res.status).toBe(400);
      expect(res.body.error).toEqual({ code: 'too_deep', message: expect.stringMatching(/^body: nested more than 32 levels deep/) });
    }
    const before = await counts();
    const save = await raw('put', `/api/sketches/${sketchId}/document`, `{"document":${JSON.stringify(doc).replace('"notes":""', `"notes":${deep}`)},"baseRevision":0}`);
    expect(save.status).toBe(400);
    expect(await counts()).toEqual(before);
  });

  it('two sign-ups for one address at the same moment get the same neutral answer, and one for an existing address too', async () => {
    const body = (email: string) => ({ name: 'Same Person', email, password: 'a long password', teamName: 'Twins' });
    const answers = await Promise.all([
      request(world.app).post('/api/auth/sign-up').set(CSRF).send(body('same@example.test')),
      request(world.app).post('/api/auth/sign-up').set(CSRF).send(body('same@example.test')),
      request(world.app).post('/api/auth/sign-up').set(CSRF).send(body(world.users.viewer.email)),
      request(world.app).post('/api/auth/sign-up').set(CSRF).send(body(world.users.viewer.email)),
    ]);
    expect(answers.map((a) => a.status)).toEqual([202, 202, 202, 202]);
    expect(answers[1].body).toEqual(answers[0].body);
    expect(JSON.stringify(answers[2].body).replace(world.users.viewer.email, 'X')).toBe(JSON.stringify(answers[0].body).replace('same@example.test', 'X'));
    expect(await world.database.db.select().from(signUps).where(eq(signUps.email, 'same@example.test'))).toHaveLength(2);
    expect(await world.database.db.select().from(users).where(eq(users.email, 'same@example.test'))).toHaveLength(0);
  });

  it('a refused import leaves no automatic snapshot behind', async () => {
    const own = await freshSketch(world, world.teamId, 'Import target');
    const before = await world.database.db.select().from(snapshots).where(eq(snapshots.sketchId, own));
    const crossing = await send('post', `/api/sketches/${own}/import`, editor, { points: [[0, 0], [1, 0.1], [1, 0], [0, 0.1]], fileName: 'bow-tie.csv' });
    expect(crossing.status).toBe(400);
    const bad = await send('post', `/api/sketches/${own}/import`, editor, { points: [[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]], fileName: 'fin\u0000.csv' });
    expect(bad.status).toBe(400);
    expect(await world.database.db.select().from(snapshots).where(eq(snapshots.sketchId, own))).toEqual(before);
  });

  it('[R9] one edit the database refuses in a batch of several is rejected alone; its neighbours (other people’s) are applied', async () => {
    const own = await freshSketch(world, world.teamId, 'Batch');
    const queue = createEditQueue(world.database.db);
    const setMach = (opId: string, mach: number): EditOp => ({ type: 'setCondition', opId, pointId: FIRST_DESIGN_POINT_ID, field: 'mach', value: mach }) as EditOp;
    // The first edit runs alone; the three after it arrive while it is in its transaction and
    // form the next batch. The middle one skipped the edge's validation (a title with NUL).
    const first = queue.submit({ sketchId: own, userId: world.users.editor.id, baseRevision: 0, op: setMach('op-first', 2.1) });
    const batch = [
      queue.submit({ sketchId: own, userId: world.users.editor.id, baseRevision: 0, op: setMach('op-a', 2.2) }),
      queue.submit({ sketchId: own, userId: world.users.owner.id, baseRevision: 0, op: { type: 'rename', opId: 'op-bad', title: 'Broken\u0000title' } }),
      queue.submit({ sketchId: own, userId: world.users.owner.id, baseRevision: 0, op: setMach('op-c', 2.3) }),
    ];
    const [f, a, bad, c] = await Promise.all([first, ...firstItems(batch, 3)]);
    expect(f.status).toBe('applied');
    expect(a.status).not.toBe('rejected');
    expect(c.status).not.toBe('rejected');
    expect(bad).toMatchObject({ status: 'rejected', reason: expect.stringMatching(/could not be stored/) });
    const row = await world.database.db.query.sketches.findFirst({ where: eq(sketches.id, own) });
    expect(row!.revision).toBe(3);
    expect(row!.title).toBe('Batch');
    const applied = await world.database.db.select().from(sketchEdits).where(eq(sketchEdits.sketchId, own));
    expect(applied.map((e) => e.opId).sort()).toEqual(['op-a', 'op-c', 'op-first']);
  });
});
