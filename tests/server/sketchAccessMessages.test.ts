/**
 * Someone outside a sketch's team who opens it by URL learns nothing about it: the answer names
 * the sketch (what they asked for), not a team, and is the same whether the sketch exists or not
 * (as the realtime channel already answers).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { newId } from '../../shared/model/ids.ts';
import { createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';

describe('opening another team’s sketch by URL', () => {
  let world: World;
  let outsider: string;
  beforeAll(async () => {
    world = await createWorld();
    outsider = (await signIn(world, 'outsider'))!;
  });
  afterAll(async () => world?.close());

  it('says "No such sketch, or you are not a member of its team." for an existing sketch and a missing one alike', async () => {
    const existing = await freshSketch(world);
    const theirs = await request(world.app).get(`/api/sketches/${existing}`).set('Cookie', outsider);
    const missing = await request(world.app).get(`/api/sketches/${newId('sketch')}`).set('Cookie', outsider);
    expect(theirs.status).toBe(404);
    expect(theirs.body.error).toMatchObject({ code: 'not_found', message: 'No such sketch, or you are not a member of its team.' });
    expect(missing.status).toBe(404);
    expect(missing.body.error).toEqual(theirs.body.error);
  });

  it('says the same for what belongs to the sketch (its snapshots)', async () => {
    const existing = await freshSketch(world);
    const res = await request(world.app).get(`/api/sketches/${existing}/snapshots`).set('Cookie', outsider);
    expect(res.status).toBe(404);
    expect(res.body.error.message).toBe('No such sketch, or you are not a member of its team.');
  });
});
