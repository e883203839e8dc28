import fc from 'fast-check';
import { reached } from '../../helpers/reached';
import { describe, expect, it } from 'vitest';
import { expectClose, expectPrinted } from '../../helpers/expectClose';
import { machAngle } from '../../../shared/solver/machAngle';
import {
  machAfterExpansion,
  machFromPrandtlMeyer,
  prandtlMeyer,
  prandtlMeyerMax,
} from '../../../shared/solver/prandtlMeyer';
import { machFromNu, nu } from './independentRelations';

const deg = (r: number) => (r * 180) / Math.PI;
const rad = (d: number) => (d * Math.PI) / 180;

describe('prandtlMeyer', () => {
  // NACA Report 1135, Table I (ν column, γ = 1.4), from memory; within half a unit of the last
  // printed digit.
  it.each([
    [1.5, '11.905'],
    [2, '26.380'],
    [2.5, '39.124'],
    [3, '49.757'],
    [4, '65.785'],
    [5, '76.920'],
  ])('prandtlMeyer(M=%d) gives ν=%s° (NACA Report 1135, from memory)', (m, nuDeg) => {
    expectPrinted(deg(prandtlMeyer(m, 1.4)), nuDeg);
  });

  it('prandtlMeyerMax(1.4) = 130.454° and (5/3) = 90° (ν_max = (π/2)(√((γ+1)/(γ−1)) − 1), NACA Report 1135; exact for 5/3)', () => {
    expectPrinted(deg(prandtlMeyerMax(1.4)), '130.454');
    expectClose(deg(prandtlMeyerMax(1.4)), 90 * (Math.sqrt(6) - 1), 1e-12);
    expectClose(deg(prandtlMeyerMax(5 / 3)), 90, 1e-12);
  });

  it('prandtlMeyer(M=1) = 0 and a huge M approaches ν_max (edge cases)', () => {
    expect(prandtlMeyer(1, 1.4)).toBe(0);
    expectClose(prandtlMeyer(1e9, 1.4), prandtlMeyerMax(1.4), 1e-8);
  });

  it('prandtlMeyer agrees with the textbook form written independently (NACA Report 1135)', () => {
    for (const g of [1.1, 1.3, 1.4, 5 / 3]) for (const m of [1.001, 1.3, 2, 4.4, 20]) expectClose(prandtlMeyer(m, g), nu(m, g), 1e-14);
  });

  it('machFromPrandtlMeyer(26.38°) gives M = 2.000 (NACA Report 1135, from memory)', () => {
    expectClose(machFromPrandtlMeyer(rad(26.3798), 1.4), 2, 1e-4);
  });

  it('[S9] machFromPrandtlMeyer round trip ν → M → ν within 1e-12 rad, for random ν and γ (fast-check)', () => {
    const checked = reached('ν round trips');
    fc.assert(
      fc.property(
        fc.double({ min: 1e-9, max: 1 - 1e-7, noNaN: true }),
        fc.double({ min: 1.01, max: 5 / 3, noNaN: true }),
        (frac, g) => {
          const target = frac * prandtlMeyerMax(g);
          const m = machFromPrandtlMeyer(target, g);
          checked.hit();
          expectClose(prandtlMeyer(m, g), target, 1e-12);
        },
      ),
      { numRuns: 400 },
    );
    checked.expectAtLeast(400);
  });

  it('[S9] machFromPrandtlMeyer round trip M → ν → M to 1e-12 relative away from M = 1', () => {
    for (const m of [1.1, 1.5, 2, 3.3, 8, 20, 50]) expectClose(machFromPrandtlMeyer(prandtlMeyer(m, 1.4), 1.4), m, 1e-12 * m);
  });

  it('machFromPrandtlMeyer agrees with plain bisection on the textbook ν(M) (independent check)', () => {
    for (const d of [0.5, 10, 45, 100]) expectClose(machFromPrandtlMeyer(rad(d), 1.4), machFromNu(rad(d), 1.4), 1e-9);
  });

  it('machFromPrandtlMeyer edge cases: ν=0 → 1, ν ≥ ν_max → Infinity (vacuum), ν<0 → RangeError', () => {
    expect(machFromPrandtlMeyer(0, 1.4)).toBe(1);
    expect(machFromPrandtlMeyer(prandtlMeyerMax(1.4), 1.4)).toBe(Number.POSITIVE_INFINITY);
    expect(() => machFromPrandtlMeyer(-0.1, 1.4)).toThrow(RangeError);
  });

  it('machAfterExpansion steps from a known state and agrees with the direct inverse (fast-check)', () => {
    // The step is drawn as a fraction of what the state allows (back to M 1, on to 0.999·ν_max),
    // so every case is a possible turn and reaches the check.
    const checked = reached('expansion steps');
    fc.assert(
      fc.property(
        fc.double({ min: 1.0001, max: 30, noNaN: true }),
        fc.double({ min: 0.001, max: 0.999, noNaN: true }),
        fc.boolean(),
        fc.double({ min: 1.05, max: 5 / 3, noNaN: true }),
        (m, f, compress, g) => {
          const nu0 = prandtlMeyer(m, g);
          const room = compress ? nu0 : prandtlMeyerMax(g) * 0.999 - nu0;
          const dNu = (compress ? -1 : 1) * f * Math.min(room, 0.8);
          const target = nu0 + dNu;
          const m2 = machAfterExpansion(m, nu0, dNu, g);
          checked.hit();
          expectClose(prandtlMeyer(m2, g), target, 1e-12);
        },
      ),
      { numRuns: 400 },
    );
    checked.expectAtLeast(400);
  });

  it('machAfterExpansion over 100 small steps keeps ν within 1e-13 of the sum of the turns (accumulation)', () => {
    let m = 1.8;
    let total = prandtlMeyer(m, 1.4);
    for (let i = 0; i < 100; i++) {
      m = machAfterExpansion(m, total, 0.004, 1.4);
      total += 0.004;
    }
    expectClose(prandtlMeyer(m, 1.4), total, 1e-13);
  });
});

describe('machAngle', () => {
  it('machAngle(M=2) = 30° and machAngle(M=1.5) = 41.81° (NACA Report 1135, from memory; 30° exact)', () => {
    expectClose(deg(machAngle(2)), 30, 1e-12);
    expectClose(deg(machAngle(1.5)), 41.81, 1e-2);
  });

  it('machAngle(M=1) = 90° and machAngle(M<1) throws (edge cases)', () => {
    expectClose(deg(machAngle(1)), 90, 1e-12);
    expect(() => machAngle(0.5)).toThrow(RangeError);
  });
});
