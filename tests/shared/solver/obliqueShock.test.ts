import fc from 'fast-check';
import { reached } from '../../helpers/reached';
import { describe, expect, it } from 'vitest';
import { expectClose, expectPrinted } from '../../helpers/expectClose';
import { machAngle } from '../../../shared/solver/machAngle';
import { cotBetaAtMaxDeflection, maxDeflection } from '../../../shared/solver/maxDeflection';
import { normalShock } from '../../../shared/solver/normalShock';
import { obliqueShock, type AttachedShock } from '../../../shared/solver/obliqueShock';
import { shockDeflection } from '../../../shared/solver/shockDeflection';
import { sonicDeflection } from '../../../shared/solver/sonicDeflection';
import { shockState, thetaMaxSearch, weakBeta } from './independentRelations';

const deg = (r: number) => (r * 180) / Math.PI;
const rad = (d: number) => (d * Math.PI) / 180;

function attached(m: number, thetaDeg: number, g = 1.4, branch: 'weak' | 'strong' = 'weak'): AttachedShock {
  const r = obliqueShock(m, rad(thetaDeg), g, branch);
  if (r.status !== 'attached') throw new Error(`expected an attached shock at M ${m}, θ ${thetaDeg}°`);
  return r;
}

describe('obliqueShock', () => {
  it('obliqueShock(M=2, θ=10°) gives β=39.31°, M2=1.64, p2/p1=1.707 (NACA Report 1135 chart values, from memory)', () => {
    const r = attached(2, 10);
    expectPrinted(deg(r.beta), '39.31');
    expectPrinted(r.mach2, '1.641');
    expectPrinted(r.pRatio, '1.707');
  });

  it.each([
    [2, 39.3139],
    [5, 29.8009],
    [3.5, 50],
  ])('obliqueShock inverts the θ-β-M relation of NACA Report 1135 written out here: M %d, β %d° → θ → the same β to 1e-12 rad', (m, betaDeg) => {
    // tan θ = 2 cot β (M² sin²β − 1) / (M² (γ + cos 2β) + 2), evaluated directly.
    const beta = rad(betaDeg);
    const theta = Math.atan((2 / Math.tan(beta)) * ((m * m * Math.sin(beta) ** 2 - 1) / (m * m * (1.4 + Math.cos(2 * beta)) + 2)));
    expectClose(attached(m, deg(theta)).beta, beta, 1e-12);
  });

  it('obliqueShock(M=3, θ=20°) gives β≈37.8°, p2/p1≈3.77, M2≈1.99 (Anderson, Modern Compressible Flow, worked example, from memory)', () => {
    const r = attached(3, 20);
    expectPrinted(deg(r.beta), '37.8');
    expectPrinted(r.pRatio, '3.77');
    expectPrinted(r.mach2, '1.99');
  });

  it('obliqueShock matches plain bisection on the textbook θ-β-M relation over a grid (independent check)', () => {
    for (const g of [1.2, 1.4, 5 / 3]) {
      for (const m of [1.2, 2, 3.5, 8, 30]) {
        const tMax = maxDeflection(m, g).thetaMax;
        for (const f of [0.01, 0.3, 0.7, 0.95]) {
          const theta = f * tMax;
          const r = obliqueShock(m, theta, g);
          if (r.status !== 'attached') throw new Error('unexpected detachment');
          expectClose(r.beta, weakBeta(m, theta, g), 1e-10);
        }
      }
    }
  });

  it('obliqueShock normal-component ratios equal normalShock(M1 sin β) (NACA Report 1135 identity)', () => {
    const r = attached(3.2, 17, 1.3);
    const n = normalShock(3.2 * Math.sin(r.beta), 1.3);
    expectClose(r.pRatio, n.pRatio, 1e-12 * n.pRatio);
    expectClose(r.rhoRatio, n.rhoRatio, 1e-12 * n.rhoRatio);
    expectClose(r.tRatio, n.tRatio, 1e-12 * n.tRatio);
    expectClose(r.p0Ratio, n.p0Ratio, 1e-12);
    expectClose(r.mach2 * Math.sin(r.beta - r.theta), n.mach2, 1e-12);
  });

  it('[S9] obliqueShock with θ→0 gives the Mach angle (weak) and the normal shock (strong)', () => {
    expectClose(attached(2.5, 0).beta, machAngle(2.5), 1e-15);
    expectClose(attached(2.5, 1e-9).beta, machAngle(2.5), 1e-10);
    const strong = attached(2.5, 0, 1.4, 'strong');
    expectClose(strong.beta, Math.PI / 2, 1e-15);
    expectClose(strong.mach2, normalShock(2.5, 1.4).mach2, 1e-14);
    expectClose(attached(2.5, 0).pRatio, 1, 1e-15);
  });

  it('[S9] strong β > weak β, strong M2 < 1, and both reproduce θ (fast-check)', () => {
    const checked = reached('weak and strong shocks');
    fc.assert(
      fc.property(
        fc.double({ min: 1.05, max: 50, noNaN: true }),
        fc.double({ min: 0.001, max: 0.999, noNaN: true }),
        fc.double({ min: 1.01, max: 5 / 3, noNaN: true }),
        (m, f, g) => {
          const theta = f * maxDeflection(m, g).thetaMax;
          const weak = obliqueShock(m, theta, g, 'weak');
          const strong = obliqueShock(m, theta, g, 'strong');
          if (weak.status !== 'attached' || strong.status !== 'attached') throw new Error('detached');
          checked.hit();
          expect(strong.beta).toBeGreaterThan(weak.beta);
          expect(strong.mach2).toBeLessThan(1);
          expectClose(shockDeflection(m, weak.beta, g), theta, 1e-12);
          expectClose(shockDeflection(m, strong.beta, g), theta, 1e-12);
        },
      ),
      { numRuns: 500 },
    );
    checked.expectAtLeast(500);
  });

  it('[S9] round trip β → θ → β within 1e-12 rad on the weak branch away from θmax (fast-check)', () => {
    const checked = reached('β round trips');
    fc.assert(
      fc.property(
        fc.double({ min: 1.2, max: 20, noNaN: true }),
        fc.double({ min: 0.02, max: 0.9, noNaN: true }),
        (m, f) => {
          const mu = machAngle(m);
          const betaMax = maxDeflection(m, 1.4).betaAtMax;
          const beta = mu + f * (betaMax - mu);
          const theta = shockDeflection(m, beta, 1.4);
          const r = obliqueShock(m, theta, 1.4);
          if (r.status !== 'attached') throw new Error('detached');
          checked.hit();
          expectClose(r.beta, beta, 1e-12);
        },
      ),
      { numRuns: 500 },
    );
    checked.expectAtLeast(500);
  });

  it('obliqueShock above θmax returns status detached with θ and θmax (a result, not an exception)', () => {
    const r = obliqueShock(2, rad(25), 1.4);
    expect(r.status).toBe('detached');
    expectClose(deg(r.thetaMax), 22.97, 0.01);
    expectClose(deg(r.theta), 25, 1e-12);
  });

  it('obliqueShock at M ≤ 1 is detached with θmax = 0 (edge case); θ < 0 is a RangeError', () => {
    expect(obliqueShock(1, 0.01, 1.4).status).toBe('detached');
    expect(() => obliqueShock(2, -0.01, 1.4)).toThrow(RangeError);
  });

  it('obliqueShock at M=50 stays finite and near the hypersonic limit ρ2/ρ1 → (γ+1)/(γ−1) (huge)', () => {
    const r = attached(50, 40);
    expect(Number.isFinite(r.pRatio) && Number.isFinite(r.mach2)).toBe(true);
    expect(r.rhoRatio).toBeLessThan(6);
    expect(r.rhoRatio).toBeGreaterThan(5.5);
  });
});

describe('maxDeflection', () => {
  it.each([
    // M, θmax°, β at θmax°
    [1.5, 12.11, 66.59],
    [2, 22.97, 64.67],
    [3, 34.07, 65.24],
  ])('maxDeflection(M=%d) gives θmax=%d° (NACA Report 1135 chart, from memory)', (m, tMax, bMax) => {
    const r = maxDeflection(m, 1.4);
    expectClose(deg(r.thetaMax), tMax, 0.02);
    expectClose(deg(r.betaAtMax), bMax, 0.05);
  });

  it('maxDeflection(M→∞) → asin(1/γ) = 45.58° for γ=1.4 (limit, NACA Report 1135, from memory)', () => {
    expectClose(deg(maxDeflection(1e7, 1.4).thetaMax), deg(Math.asin(1 / 1.4)), 1e-6);
    expectClose(deg(Math.asin(1 / 1.4)), 45.58, 0.01);
  });

  it('maxDeflection agrees with a golden-section search on the textbook θ(β) (independent check)', () => {
    for (const g of [1.1, 1.4, 5 / 3]) {
      for (const m of [1.01, 1.3, 2.2, 6, 40]) {
        const ref = thetaMaxSearch(m, g);
        const r = maxDeflection(m, g);
        expectClose(r.thetaMax, ref.thetaMax, 1e-13);
        expectClose(r.betaAtMax, ref.betaAtMax, 2e-7); // β is flat-topped there: √ε accuracy
      }
    }
  });

  it('maxDeflection agrees with the published sin²β closed form (NACA Report 1135)', () => {
    for (const g of [1.2, 1.4, 5 / 3]) {
      for (const m of [1.1, 2, 5, 20]) {
        const gp = g + 1;
        const sin2 = ((gp / 4) * m * m - 1 + Math.sqrt(gp * (1 + ((g - 1) / 2) * m * m + (gp / 16) * m ** 4))) / (g * m * m);
        expectClose(maxDeflection(m, g).betaAtMax, Math.asin(Math.sqrt(sin2)), 1e-12);
        expectClose(1 / Math.tan(Math.asin(Math.sqrt(sin2))), cotBetaAtMaxDeflection(m, g), 1e-12);
      }
    }
  });

  it('maxDeflection(M ≤ 1) is θmax = 0 at β = 90° (edge case)', () => {
    expect(maxDeflection(1, 1.4)).toEqual({ thetaMax: 0, betaAtMax: Math.PI / 2 });
  });
});

describe('sonicDeflection', () => {
  it('sonicDeflection(M=2) = 22.706°, just below θmax = 22.974° (the sonic-point relation of NACA Report 1135, written out here; from memory)', () => {
    // sin²β* = [(γ+1)M² − (3−γ) + √((γ+1)((γ+1)M⁴ − 2(3−γ)M² + γ + 9))] / (4γM²), then θ from
    // the θ-β-M relation; M2 = 1 behind it by the independent normal-shock relations.
    const g = 1.4;
    const m = 2;
    const s2 = ((g + 1) * m * m - (3 - g) + Math.sqrt((g + 1) * ((g + 1) * m ** 4 - 2 * (3 - g) * m * m + g + 9))) / (4 * g * m * m);
    const betaStar = Math.asin(Math.sqrt(s2));
    const thetaStar = Math.atan((2 / Math.tan(betaStar)) * ((m * m * s2 - 1) / (m * m * (g + Math.cos(2 * betaStar)) + 2)));
    expectClose(shockState(m, thetaStar, g).m2, 1, 1e-9);
    const s = sonicDeflection(2, 1.4);
    expectClose(s.thetaSonic, thetaStar, 1e-10);
    expectClose(deg(s.thetaSonic), 22.706, 0.0005); // three decimals, as quoted
    expect(s.thetaSonic).toBeLessThan(maxDeflection(2, 1.4).thetaMax);
  });

  it('sonicDeflection gives M2 = 1 behind the shock, weak branch (definition)', () => {
    for (const g of [1.2, 1.4, 5 / 3]) {
      for (const m of [1.1, 1.5, 2, 4, 12]) {
        const s = sonicDeflection(m, g);
        const r = obliqueShock(m, s.thetaSonic, g);
        if (r.status !== 'attached') throw new Error('detached');
        expectClose(r.mach2, 1, 1e-9);
        expectClose(r.beta, s.betaSonic, 1e-7);
      }
    }
  });
});
