import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { parseCoordinates } from '../../shared/model/coordinatesFile.ts';
import { planImport } from '../../shared/model/coordinatesImport.ts';
import { applyOp, withOpId } from '../../shared/model/ops.ts';
import { normalizeDocument } from '../../shared/model/sketch.ts';
import { CSRF, createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';

const fixture = (name: string) => readFileSync(path.resolve(import.meta.dirname, '../fixtures/coordinates', name), 'utf8');

describe('POST /api/sketches/:id/import (coordinates files)', () => {
  let world: World;
  const cookie = {} as Record<'editor' | 'viewer', string>; // filled in beforeAll
  let sketchId: string;

  const as = (who: 'editor' | 'viewer') => ({
    get: (url: string) => request(world.app).get(url).set('Cookie', cookie[who]),
    post: (url: string, body: object) => request(world.app).post(url).set(CSRF).set('Cookie', cookie[who]).send(body),
    put: (url: string, body: object) => request(world.app).put(url).set(CSRF).set('Cookie', cookie[who]).send(body),
  });

  beforeAll(async () => {
    world = await createWorld();
    for (const who of ['editor', 'viewer'] as const) cookie[who] = (await signIn(world, who))!;
    sketchId = await freshSketch(world, world.teamId, 'Tern fin root, before the import');
  });
  afterAll(async () => world?.close());

  it('a two-block file in mm kept at its physical chord: snapshot first, the section and the loads chord (0.32 m) in one edit, and what it replaced', async () => {
    const before = (await as('viewer').get(`/api/sketches/${sketchId}`)).body;
    const read = parseCoordinates(fixture('tern-fin-root-two-blocks-mm.dat'));
    if (!read.ok) throw new Error('fixture not read');
    const plan = planImport(read.points, { unit: 'mm', scale: 'physical', loadsChordFromFile: false });
    if (!plan.ok) throw new Error(plan.reason);

    const res = await as('editor').post(`/api/sketches/${sketchId}/import`, {
      points: plan.plan.points,
      fileName: 'tern-fin-root-two-blocks-mm.dat',
      loadsChordM: plan.plan.loadsChordM,
    });

    expect(res.status).toBe(200);
    expect(res.body.document.section.points).toEqual(plan.plan.points);
    expect(plan.plan.points[4]).toEqual([0.16, 0.008]);
    expect(res.body.document.loads).toEqual({ ...before.document.loads, chordM: 0.32 });
    // Everything but the section and the loads chord is as it was (design points, flap, notes).
    expect({ ...res.body.document, section: null, loads: null }).toEqual({ ...before.document, section: null, loads: null });
    expect(res.body.revision).toBe(before.revision + 1);
    expect(res.body.imported).toEqual({ revision: before.revision + 1, before: { points: before.document.section.points, loadsChordM: before.document.loads.chordM } });
    const snaps = (await as('viewer').get(`/api/sketches/${sketchId}/snapshots`)).body;
    expect(snaps.items[0]).toMatchObject({ name: 'Before importing tern-fin-root-two-blocks-mm.dat', kind: 'before_import', revision: before.revision });
    const kept = (await as('viewer').get(`/api/snapshots/${snaps.items[0].id}`)).body;
    expect(kept.document).toEqual(normalizeDocument(before.document));
    const activity = (await as('viewer').get(`/api/sketches/${sketchId}/activity`)).body;
    expect(JSON.stringify(activity.items)).toContain('tern-fin-root-two-blocks-mm.dat');
  });

  it('one undo step (the answer\'s "before" as one edit) gives back the section and the loads chord, saved for everyone', async () => {
    const now = (await as('viewer').get(`/api/sketches/${sketchId}`)).body;
    const snaps = (await as('viewer').get(`/api/sketches/${sketchId}/snapshots`)).body;
    const kept = (await as('viewer').get(`/api/snapshots/${snaps.items[0].id}`)).body;
    // What the editor's undo does without a realtime channel: apply the inverse, save the document.
    const undone = applyOp(normalizeDocument(now.document), withOpId({ type: 'replaceSection', points: kept.document.section.points, loadsChordM: kept.document.loads.chordM }));
    if (!undone.ok) throw new Error(undone.reason);
    const saved = await as('editor').put(`/api/sketches/${sketchId}/document`, { document: undone.doc, baseRevision: now.revision });
    expect(saved.status).toBe(200);
    const after = (await as('viewer').get(`/api/sketches/${sketchId}`)).body;
    expect(after.document).toEqual(kept.document);
  });

  it('refuses a chord of 0 m and a tangled outline by name, and writes nothing (no snapshot, same revision)', async () => {
    const start = (await as('viewer').get(`/api/sketches/${sketchId}`)).body;
    const snapsBefore = (await as('viewer').get(`/api/sketches/${sketchId}/snapshots`)).body.total;
    const zero = await as('editor').post(`/api/sketches/${sketchId}/import`, { points: [[0, 0], [0.5, 0.02], [1, 0]], fileName: 'x.dat', loadsChordM: 0 });
    expect(zero.status).toBe(400);
    expect(zero.body.error.message).toMatch(/loadsChordM/);
    const tangled = await as('editor').post(`/api/sketches/${sketchId}/import`, { points: [[0, 0], [1, 1], [1, 0], [0, 1]], fileName: 'bow-tie.dat', loadsChordM: 0.3 });
    expect(tangled.status).toBe(400);
    expect(tangled.body.error.code).toBe('invalid_section');
    const end = (await as('viewer').get(`/api/sketches/${sketchId}`)).body;
    expect(end.revision).toBe(start.revision);
    expect(end.document).toEqual(start.document);
    expect((await as('viewer').get(`/api/sketches/${sketchId}/snapshots`)).body.total).toBe(snapsBefore);
  });

  it('a viewer cannot import', async () => {
    const res = await as('viewer').post(`/api/sketches/${sketchId}/import`, { points: [[0, 0], [0.5, 0.02], [1, 0]], fileName: 'x.dat' });
    expect(res.status).toBe(403);
  });
});
