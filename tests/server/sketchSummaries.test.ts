/**
 * [T6] The home table's list reads no documents: each sketch's summary (vertex count, t/c, the
 * selected point's Mach, α and name, how many design points) is stored beside its document, by
 * every writer, in the statement that writes the document, tagged with the revision it belongs
 * to; the database refuses a write of this version that leaves it behind, and accepts one from an
 * instance of the version before (which writes no summary) during an upgrade.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import fc from 'fast-check';
import pg from 'pg';
import { defaultSketchDocument, normalizeDocument, type SketchDocument } from '../../shared/model/sketch.ts';
import { newId } from '../../shared/model/ids.ts';
import type { SketchSummary } from '../../shared/model/sketchApi.ts';
import { summarizeDocument } from '../../shared/flight/sketchSummary.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';
import { CSRF, createWorld, signIn, type World } from '../helpers/world.ts';
import { expectClose } from '../helpers/expectClose.ts';
import { backfillSketchSummaries } from '../../server/db/sketchSummary.ts';
import { reached } from '../helpers/reached.ts';
import { prng, randomEdit } from '../helpers/simClient.ts';

/** A design point of the default document with another id, name and condition. */
function point(name: string, mach: number, alphaDeg: number, id = newId('point')) {
  const base = firstItem(defaultSketchDocument().designPoints);
  return { ...base, id, name, condition: { ...base.condition, mach, alphaDeg } };
}

/** A closed thin ellipse of n vertices, t/c `t`, rotated by `turnDeg` about the origin. */
function ellipse(n: number, t: number, turnDeg: number): [number, number][] {
  const r = (turnDeg * Math.PI) / 180;
  const out: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    const a = (2 * Math.PI * i) / n;
    const x = 0.5 - 0.5 * Math.cos(a);
    const y = (t / 2) * Math.sin(a);
    out.push([Math.round((x * Math.cos(r) + y * Math.sin(r)) * 1e6) / 1e6, Math.round((-x * Math.sin(r) + y * Math.cos(r)) * 1e6) / 1e6]);
  }
  return out;
}

const documentArb = fc
  .record({
    n: fc.integer({ min: 4, max: 48 }),
    t: fc.double({ min: 0.01, max: 0.2, noNaN: true }),
    turnDeg: fc.double({ min: -10, max: 10, noNaN: true }),
    points: fc.array(fc.record({ mach: fc.double({ min: 1.2, max: 5, noNaN: true }), alphaDeg: fc.double({ min: -5, max: 10, noNaN: true }) }), { minLength: 1, maxLength: 4 }),
    selected: fc.nat(),
  })
  .map(({ n, t, turnDeg, points, selected }): SketchDocument => {
    const designPoints = points.map((p, i) => point(`Point ${i + 1}`, Math.round(p.mach * 100) / 100, Math.round(p.alphaDeg * 10) / 10));
    return { ...defaultSketchDocument(), section: { points: ellipse(n, t, turnDeg) }, designPoints, selectedPointId: itemAt(designPoints, selected % designPoints.length).id };
  });

type Write =
  | { kind: 'create'; document: SketchDocument }
  | { kind: 'duplicate'; target: number }
  | { kind: 'save'; target: number; document: SketchDocument }
  | { kind: 'rename'; target: number }
  | { kind: 'edits'; target: number; seed: number; count: number }
  | { kind: 'restore'; target: number; document: SketchDocument }
  | { kind: 'import'; target: number; n: number; t: number };

const writeArb: fc.Arbitrary<Write> = fc.oneof(
  fc.record({ kind: fc.constant('create' as const), document: documentArb }),
  fc.record({ kind: fc.constant('duplicate' as const), target: fc.nat() }),
  fc.record({ kind: fc.constant('save' as const), target: fc.nat(), document: documentArb }),
  fc.record({ kind: fc.constant('rename' as const), target: fc.nat() }),
  fc.record({ kind: fc.constant('edits' as const), target: fc.nat(), seed: fc.nat(), count: fc.integer({ min: 1, max: 6 }) }),
  fc.record({ kind: fc.constant('restore' as const), target: fc.nat(), document: documentArb }),
  fc.record({ kind: fc.constant('import' as const), target: fc.nat(), n: fc.integer({ min: 4, max: 40 }), t: fc.double({ min: 0.02, max: 0.15, noNaN: true }) }),
);

describe('[T6] the sketches table’s summary is stored with the document', () => {
  let world: World;
  let cookie: string;
  const list = async (teamId = world.teamId, as = cookie) => {
    const res = await request(world.app).get(`/api/teams/${teamId}/sketches`).set('Cookie', as);
    expect(res.status).toBe(200);
    return res.body as SketchSummary[];
  };
  const create = async (title: string, document: SketchDocument, teamId = world.teamId) => {
    const res = await request(world.app).post(`/api/teams/${teamId}/sketches`).set(CSRF).set('Cookie', cookie).send({ title, document });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body as { id: string; revision: number; document: SketchDocument };
  };
  /** Every stored row of a team: its revision, its document and its summary columns. */
  const storedRows = async (teamId: string) =>
    (
      await world.database.pool.query<{
        id: string;
        revision: number;
        document: unknown;
        vertex_count: number | null;
        thickness_ratio: number | null;
        selected_mach: number | null;
        selected_alpha_deg: number | null;
        design_point_count: number | null;
        selected_point_name: string | null;
        summary_revision: number | null;
      }>(
        `select id, revision, document, vertex_count, thickness_ratio, selected_mach, selected_alpha_deg, design_point_count, selected_point_name, summary_revision
           from sketches where team_id = $1 order by id`,
        [teamId],
      )
    ).rows;

  beforeAll(async () => {
    world = await createWorld();
    cookie = (await signIn(world, 'editor'))!;
  });
  afterAll(async () => world?.close());

  it('a 5 % double wedge at its second design point lists 4 vertices, t/c 0.05 (thickness 0.05 over chord 1, by hand), that point’s Mach, α and name, and 3 points', async () => {
    const pullUp = point('Pull-up', 2.4, 9);
    const document: SketchDocument = {
      ...defaultSketchDocument(),
      section: { points: [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]] },
      designPoints: [point('Burnout', 2.6, 4), pullUp, point('Max q', 2.2, 2)],
      selectedPointId: pullUp.id,
    };
    const created = await create('Fin root, 5 % wedge', document);
    const row = (await list()).find((s) => s.id === created.id)!;
    expect(row).toMatchObject({ title: 'Fin root, 5 % wedge', revision: 0, vertexCount: 4, mach: 2.4, alphaDeg: 9, designPointCount: 3, selectedPointName: 'Pull-up' });
    expectClose(row.thicknessRatio!, 0.05, 1e-12);
  });

  it('the list answers from the summary columns, not the document: a summary changed behind the document’s back is what it shows', async () => {
    const created = await create('Columns, not documents', defaultSketchDocument());
    // Only the summary changes (no trigger fires: neither the document nor the revision is written).
    await world.database.pool.query(`update sketches set vertex_count = 12345, selected_point_name = 'From the column' where id = $1`, [created.id]);
    const row = (await list()).find((s) => s.id === created.id)!;
    expect(row).toMatchObject({ vertexCount: 12345, selectedPointName: 'From the column' });
  });

  it('a row whose summary is not of its revision (stored before the columns, not filled yet) is summarised from its document', async () => {
    const created = await create('Older row', { ...defaultSketchDocument(), section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] } });
    await world.database.pool.query(`update sketches set summary_revision = null, vertex_count = null, selected_mach = null where id = $1`, [created.id]);
    const row = (await list()).find((s) => s.id === created.id)!;
    expect(row).toMatchObject({ vertexCount: 4, mach: 2, alphaDeg: 2, designPointCount: 1 });
    expectClose(row.thicknessRatio!, 0.06, 1e-12); // 0.06 thick over chord 1, by hand
  });

  it('the database refuses a document or revision written without its summary, and a document changed without a new revision; nothing is changed', async () => {
    const created = await create('Guarded', defaultSketchDocument());
    const refused = async (text: string, values: unknown[], message: RegExp) => {
      const err = (await world.database.pool.query(text, values).then(
        () => null,
        (e: unknown) => e,
      )) as { message?: string } | null;
      expect(err, text).not.toBeNull();
      expect(err?.message).toMatch(message);
    };
    const moved = JSON.stringify({ ...defaultSketchDocument(), section: { points: [[0, 0], [0.5, 0.1], [1, 0], [0.5, -0.1]] } });
    await refused(`update sketches set document = $2, revision = revision + 1 where id = $1`, [created.id, moved], /with the summary of revision 0/);
    await refused(`update sketches set document = $2 where id = $1`, [created.id, moved], /changed without a new revision/);
    await refused(
      `insert into sketches (id, team_id, title, document) values ($1, $2, 'No summary', $3)`,
      [newId('sketch'), world.teamId, JSON.stringify(defaultSketchDocument())],
      /with the summary of revision none/,
    );
    const [stored] = (await storedRows(world.teamId)).filter((r) => r.id === created.id);
    expect(stored).toMatchObject({ revision: 0, summary_revision: 0, vertex_count: defaultSketchDocument().section.points.length });
    expect(normalizeDocument(stored!.document)).toEqual(defaultSketchDocument());
  });

  it('an instance of the version before 0011 (a connection that does not say it writes the summary) keeps saving during an upgrade: its writes are accepted, the list summarises those rows from their documents, and this version’s next write or the next start’s data step fills the columns', async () => {
    // The previous version's own statements: a save (document and a new revision) and a create,
    // neither naming the summary columns.
    const created = await create('Saved by an older instance', defaultSketchDocument());
    const wedge = { ...defaultSketchDocument(), section: { points: [[0, 0], [0.5, 0.05], [1, 0], [0.5, -0.05]] } };
    const older = new pg.Client({ connectionString: world.database.url });
    await older.connect();
    const insertedId = newId('sketch');
    try {
      await older.query(`update sketches set document = $2, revision = revision + 1, updated_at = now() where id = $1`, [created.id, JSON.stringify(wedge)]);
      await older.query(`insert into sketches (id, team_id, title, document) values ($1, $2, 'Created by an older instance', $3)`, [insertedId, world.teamId, JSON.stringify(wedge)]);
      // Even so, a document changed without a new revision is refused from any connection.
      const err = await older.query(`update sketches set document = $2 where id = $1`, [created.id, JSON.stringify(defaultSketchDocument())]).then(
        () => null,
        (e: unknown) => e as Error,
      );
      expect(err?.message).toMatch(/changed without a new revision/);
    } finally {
      await older.end();
    }
    const byId = async () => new Map((await storedRows(world.teamId)).map((r) => [r.id, r]));
    let stored = await byId();
    expect(stored.get(created.id)).toMatchObject({ revision: 1, summary_revision: 0 });
    expect(stored.get(insertedId)).toMatchObject({ revision: 0, summary_revision: null });
    // The list reads those two rows' documents: 4 vertices, t/c 0.1 (0.1 thick over chord 1, by hand).
    const rows = await list();
    for (const id of [created.id, insertedId]) {
      const row = rows.find((s) => s.id === id)!;
      expect(row).toMatchObject({ vertexCount: 4, designPointCount: 1 });
      expectClose(row.thicknessRatio!, 0.1, 1e-12);
    }
    // This version saves the first: the columns are written with its document again.
    const saved = await request(world.app).put(`/api/sketches/${created.id}/document`).set(CSRF).set('Cookie', cookie).send({ document: wedge, baseRevision: 1 });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    // The next start's data step fills the second.
    const { filled } = await backfillSketchSummaries(world.database.db);
    expect(filled).toBeGreaterThanOrEqual(1);
    stored = await byId();
    for (const id of [created.id, insertedId]) {
      const row = stored.get(id)!;
      expect(row.summary_revision).toBe(row.revision);
      expect(row).toMatchObject({ vertex_count: 4 });
      expectClose(row.thickness_ratio!, 0.1, 1e-12);
    }
  });

  it('property: after every kind of write (create, duplicate, save, rename, live edits, snapshot restore, import) each stored summary is its stored document’s, at its revision, and the list says the same', { timeout: 240_000 }, async () => {
    const hits = reached('summary after writes');
    const owner = (await signIn(world, 'owner'))!;
    let run = 0;
    let editsApplied = 0;
    await fc.assert(
      fc.asyncProperty(documentArb, fc.array(writeArb, { minLength: 3, maxLength: 8 }), async (first, writes) => {
        // Each run in its own team, so the list holds only this run's sketches.
        const teamRes = await request(world.app).post('/api/teams').set(CSRF).set('Cookie', owner).send({ name: `Summaries ${++run}` });
        expect(teamRes.status, JSON.stringify(teamRes.body)).toBe(201);
        const teamId = (teamRes.body as { teamId: string }).teamId;
        const ownerApi = (path: string, body?: object) => request(world.app).post(path).set(CSRF).set('Cookie', owner).send(body);
        const made = async (path: string, body?: object) => {
          const res = await ownerApi(path, body);
          expect(res.status, JSON.stringify(res.body)).toBe(201);
          return (res.body as { id: string }).id;
        };
        const ids = [await made(`/api/teams/${teamId}/sketches`, { title: 'First', document: first })];
        const current = async (id: string) => (await request(world.app).get(`/api/sketches/${id}`).set('Cookie', owner)).body as { revision: number; document: SketchDocument };
        for (const w of writes) {
          const target = 'target' in w ? itemAt(ids, w.target % ids.length) : '';
          if (w.kind === 'create') {
            ids.push(await made(`/api/teams/${teamId}/sketches`, { title: 'Created', document: w.document }));
          } else if (w.kind === 'duplicate') {
            ids.push(await made(`/api/sketches/${target}/duplicate`));
          } else if (w.kind === 'save') {
            const now = await current(target);
            const res = await request(world.app).put(`/api/sketches/${target}/document`).set(CSRF).set('Cookie', owner).send({ document: w.document, baseRevision: now.revision });
            expect(res.status, JSON.stringify(res.body)).toBe(200);
          } else if (w.kind === 'rename') {
            const res = await request(world.app).patch(`/api/sketches/${target}`).set(CSRF).set('Cookie', owner).send({ title: `Renamed ${newId('op').slice(-4)}` });
            expect(res.status, JSON.stringify(res.body)).toBe(200);
          } else if (w.kind === 'edits') {
            // The live edit path: what a socket's edits go through.
            const rand = prng(w.seed);
            for (let k = 0; k < w.count; k++) {
              const now = await current(target);
              const outcome = await world.built.context.edits.submit({ sketchId: target, userId: world.users.owner.id, baseRevision: now.revision, op: randomEdit(now.document, rand, newId('op')) });
              if (outcome.status !== 'rejected') editsApplied += 1;
            }
          } else if (w.kind === 'restore') {
            // Snapshot now, change the document, restore the snapshot.
            const snap = await ownerApi(`/api/sketches/${target}/snapshots`, { name: 'Before the change' });
            expect(snap.status, JSON.stringify(snap.body)).toBe(201);
            const now = await current(target);
            await request(world.app).put(`/api/sketches/${target}/document`).set(CSRF).set('Cookie', owner).send({ document: w.document, baseRevision: now.revision });
            const restored = await ownerApi(`/api/snapshots/${(snap.body as { id: string }).id}/restore`);
            expect(restored.status, JSON.stringify(restored.body)).toBe(200);
          } else {
            const res = await ownerApi(`/api/sketches/${target}/import`, { points: ellipse(w.n, w.t, 0), fileName: 'fin.dat' });
            expect(res.status, JSON.stringify(res.body)).toBe(200);
          }
          const rows = await storedRows(teamId);
          expect(rows.length).toBe(ids.length);
          for (const r of rows) {
            const s = summarizeDocument(normalizeDocument(r.document));
            expect(r.summary_revision, r.id).toBe(r.revision);
            expect({
              vertexCount: r.vertex_count,
              thicknessRatio: r.thickness_ratio,
              mach: r.selected_mach,
              alphaDeg: r.selected_alpha_deg,
              designPointCount: r.design_point_count,
              selectedPointName: r.selected_point_name,
            }).toEqual(s);
          }
        }
        const listed = await list(teamId, owner);
        const rows = await storedRows(teamId);
        hits.hit();
        expect(listed.map((s) => s.id).sort()).toEqual(rows.map((r) => r.id).sort());
        for (const r of rows) expect(listed.find((s) => s.id === r.id)).toMatchObject({ revision: r.revision, ...summarizeDocument(normalizeDocument(r.document)) });
      }),
      { numRuns: 12 },
    );
    hits.expectAtLeast(12);
    expect(editsApplied, 'live edits that applied').toBeGreaterThan(0);
  });
});
