/**
 * The sketches table's thickness is the solver's t/c (normal to the chord line), so a section
 * drawn at an angle shows the thickness it was drawn with.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import { CSRF, createWorld, signIn, type World } from '../helpers/world.ts';
import { expectClose } from '../helpers/expectClose.ts';

describe('GET /api/teams/:id/sketches thickness', () => {
  let world: World;
  let cookie: string;
  beforeAll(async () => {
    world = await createWorld();
    cookie = (await signIn(world, 'editor'))!;
  });
  afterAll(async () => world?.close());

  it('a 4 % double wedge drawn nose-down 5.7° lists t/c 4.0 % (not its vertical extent over the chord, 14 %)', async () => {
    const r = (5.7 * Math.PI) / 180;
    const rot = ([x, y]: [number, number]): [number, number] => [x * Math.cos(r) + y * Math.sin(r), -x * Math.sin(r) + y * Math.cos(r)];
    const points = ([[0, 0], [0.5, 0.02], [1, 0], [0.5, -0.02]] as [number, number][]).map(rot);
    const created = await request(world.app)
      .post(`/api/teams/${world.teamId}/sketches`)
      .set(CSRF)
      .set('Cookie', cookie)
      .send({ title: 'Tilted wedge', document: { ...defaultSketchDocument(), section: { points } } });
    expect(created.status).toBe(201);
    const list = await request(world.app).get(`/api/teams/${world.teamId}/sketches`).set('Cookie', cookie);
    const row = (list.body as { id: string; thicknessRatio: number }[]).find((s) => s.id === created.body.id)!;
    expectClose(row.thicknessRatio, 0.04, 1e-12);
    expect(`${(row.thicknessRatio * 100).toFixed(1)} %`).toBe('4.0 %'); // as the table prints it
  });
});
