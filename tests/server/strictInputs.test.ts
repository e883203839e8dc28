/**
 * Every input that carries numbers for the solver refuses keys it does not know, by name: a
 * misspelt "gama" must never be solved at the default γ. API routes here; the CLI in
 * tests/server/cli/solve.test.ts, the schemas in tests/shared/model/solveInput.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import { CSRF, createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';
import { itemAt } from '../../shared/util/invariant.ts';

describe('unknown keys are refused by name at every solver input', () => {
  let world: World;
  let cookie: string;
  let sketchId: string;
  const post = (url: string, body: unknown) => request(world.app).post(url).set(CSRF).set('Cookie', cookie).send(body as object);
  const put = (url: string, body: unknown) => request(world.app).put(url).set(CSRF).set('Cookie', cookie).send(body as object);

  beforeAll(async () => {
    world = await createWorld();
    cookie = (await signIn(world, 'editor'))!;
    sketchId = await freshSketch(world, world.teamId, 'Strict inputs');
  });
  afterAll(async () => world?.close());

  const diamond = [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]];

  it('POST /api/solve: "gama" in flow is a 400 naming it (and the keys flow takes)', async () => {
    const res = await post('/api/solve', { section: { points: diamond }, flow: { mach: 2, alphaDeg: 1, gama: 1.3 } });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('flow has an unknown key "gama" (it takes mach, alphaDeg, gamma)');
    const top = await post('/api/solve', { section: { points: diamond }, flow: { mach: 2, alphaDeg: 1 }, option: { waves: false } });
    expect(top.status).toBe(400);
    expect(top.body.error.message).toContain('unknown key "option"');
    const good = await post('/api/solve', { section: { points: diamond }, flow: { mach: 2, alphaDeg: 1, gamma: 1.3 } });
    expect(good.status).toBe(200);
    expect(good.body.condition.gamma).toBe(1.3);
  });

  it('PUT /api/sketches/:id/document: a document with "gama" in a condition is refused and nothing is saved (version 1 and 2)', async () => {
    const doc = defaultSketchDocument();
    const point = itemAt(doc.designPoints, 0);
    const res = await put(`/api/sketches/${sketchId}/document`, { document: { ...doc, designPoints: [{ ...point, condition: { ...point.condition, gama: 1.3 } }] }, baseRevision: 0 });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/document\.designPoints\[0\]\.condition.*"gama"/);
    const v1 = { version: 1, section: doc.section, condition: { ...point.condition, gama: 1.3 } };
    const old = await put(`/api/sketches/${sketchId}/document`, { document: v1, baseRevision: 0 });
    expect(old.status).toBe(400);
    expect(old.body.error.message).toMatch(/document\.condition.*"gama"/);
    const named = await put(`/api/sketches/${sketchId}/document`, { document: { ...doc, designPoints: [{ ...point, nmae: 'Cruise' }] }, baseRevision: 0 });
    expect(named.status).toBe(400);
    expect(named.body.error.message).toMatch(/document\.designPoints\[0\].*"nmae"/);
    const loads = await put(`/api/sketches/${sketchId}/document`, { document: { ...doc, loads: { ...doc.loads, fricton: 'laminar' } }, baseRevision: 0 });
    expect(loads.status).toBe(400);
    expect(loads.body.error.message).toMatch(/document\.loads.*"fricton"/);
    const after = await request(world.app).get(`/api/sketches/${sketchId}`).set('Cookie', cookie);
    expect(after.body.revision).toBe(0);
  });

  it('POST /api/teams/:id/sketches: a new sketch whose document has an unknown key is refused', async () => {
    const doc = defaultSketchDocument();
    const res = await post(`/api/teams/${world.teamId}/sketches`, { title: 'Typo', document: { ...doc, flap: { hingeXOverC: 0.7, deflectionDeg: 5, deflection: 5 } } });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/document\.flap.*"deflection"/);
  });

  it('POST /api/sketches/:id/studies: a definition with "machs" or "frictionRegime" is refused by name', async () => {
    const definition = { mach: { kind: 'list', values: [2] }, alpha: { startDeg: 0, endDeg: 2, stepDeg: 1 }, friction: 'none' };
    const typo = await post(`/api/sketches/${sketchId}/studies`, { name: 'Typo', definition: { ...definition, frictionRegime: 'laminar' } });
    expect(typo.status).toBe(400);
    expect(typo.body.error.message).toMatch(/definition.*"frictionRegime"/);
    const nested = await post(`/api/sketches/${sketchId}/studies`, { name: 'Typo', definition: { ...definition, alpha: { ...definition.alpha, stepdeg: 1 } } });
    expect(nested.status).toBe(400);
    expect(nested.body.error.message).toMatch(/definition\.alpha.*"stepdeg"/);
  });

  it('POST /api/sketches/:id/import: a coordinates import with "point" instead of "points" is refused by name', async () => {
    const res = await post(`/api/sketches/${sketchId}/import`, { points: diamond, point: diamond, fileName: 'x.dat' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('"point"');
  });
});
