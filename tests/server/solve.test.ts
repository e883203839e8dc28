import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import fc from 'fast-check';
import { CSRF, createWorld, signIn, type World } from '../helpers/world.ts';
import { reached } from '../helpers/reached.ts';

describe('POST /api/solve', () => {
  let world: World;
  let cookie: string;
  beforeAll(async () => {
    world = await createWorld();
    cookie = (await signIn(world, 'viewer'))!;
  });
  afterAll(async () => world?.close());

  const post = (body: unknown) => request(world.app).post('/api/solve').set(CSRF).set('Cookie', cookie).send(body as object);
  const diamond = [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]];

  it('solves a valid case: status, coefficients of all three theories, surfaces, waves', async () => {
    const res = await post({ section: { points: diamond }, flow: { mach: 2.2, alphaDeg: 3 } });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('ok');
    expect(res.body.coefficients.cl).toBeGreaterThan(0);
    expect(res.body.theories.linear.cl).toBeGreaterThan(0);
    expect(res.body.theories.secondOrder.cl).toBeGreaterThan(0);
    expect(res.body.surfaces.upper.length + res.body.surfaces.lower.length).toBe(4);
    expect(res.body.waves.length).toBeGreaterThan(0);
  });

  it('answers a theory limit with 200 and the limit in words', async () => {
    const res = await post({ section: { points: [[0, 0], [0.5, 0.2], [1, 0], [0.5, -0.2]] }, flow: { mach: 1.3, alphaDeg: 5 } });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('detached');
    expect(res.body.limits[0].message).toMatch(/detach/i);
  });

  it('names the bad field in a 400', async () => {
    const res = await post({ section: { points: diamond }, flow: { mach: 0.8, alphaDeg: 3 } });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('flow.mach');
    const tangled = await post({ section: { points: [[0, 0], [1, 1], [1, 0], [0, 1]] }, flow: { mach: 2, alphaDeg: 0 } });
    expect(tangled.status).toBe(400);
    expect(tangled.body.error.message).toContain('section.points');
  });

  it('never answers 500, whatever the body (fast-check)', async () => {
    const all = reached('bodies posted');
    const solved = reached('bodies solved (200)');
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          fc.anything(),
          fc.record({
            section: fc.record({ points: fc.array(fc.tuple(fc.double(), fc.double()), { maxLength: 12 }) }),
            flow: fc.record({ mach: fc.double(), alphaDeg: fc.double(), gamma: fc.option(fc.double(), { nil: undefined }) }),
          }),
          // Valid diamonds at random conditions, so that the solve itself runs (any status).
          fc.record({
            section: fc.double({ min: 0.005, max: 0.4, noNaN: true }).map((t) => ({ points: [[0, 0], [0.5, t / 2], [1, 0], [0.5, -t / 2]] })),
            flow: fc.record({ mach: fc.double({ min: 1.01, max: 50, noNaN: true }), alphaDeg: fc.double({ min: -89, max: 89, noNaN: true }) }),
          }),
        ),
        async (body) => {
          const res = await request(world.app).post('/api/solve').set(CSRF).set('Cookie', cookie).set('content-type', 'application/json').send(JSON.stringify(body ?? null));
          all.hit();
          if (res.status === 200) solved.hit();
          expect([200, 400]).toContain(res.status);
        },
      ),
      { numRuns: 150 },
    );
    all.expectAtLeast(150);
    solved.expectAtLeast(25);
  });
});
