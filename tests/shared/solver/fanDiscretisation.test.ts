/**
 * The wave map's fan discretisation (shared/solver/traceWaves.ts `fanInteriorRays`, README
 * "Wave map"): a fan is marched and drawn as its head ray, its tail ray and between one and
 * three interior rays, as many as keep neighbouring rays at most FAN_RAY_STEP_DEG_DEFAULT
 * (0.25°) of Prandtl-Meyer turning apart. These checks hold the decision to what it promises:
 * the surface pressures are the march's whatever the rays, the rays are spaced as stated
 * (the Prandtl-Meyer function of NACA Report 1135, from memory, evaluated independently of the solver), and the
 * nose shocks that absorb the rays are where and as strong as with the denser discretisation
 * (three interior rays in every fan, the map before this rule) within a stated tolerance.
 */
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../helpers/expectClose';
import { reached } from '../../helpers/reached';
import { FAN_INTERIOR_RAYS_MAX, FAN_RAY_STEP_DEG_DEFAULT } from '../../../shared/solver/constants';
import { solveSection } from '../../../shared/solver/solveSection';
import { fanInteriorRays } from '../../../shared/solver/fanInteriorRays';
import type { SolveInput } from '../../../shared/model/solveInput';
import type { SolveResult, Wave } from '../../../shared/solver/types';
import { itemAt } from '../../../shared/util/invariant';
import { nu } from './independentRelations';
import { biconvex, input, lens } from './sections';

const DEG = Math.PI / 180;

/** The same input with fans of three interior rays each (the denser discretisation). */
function dense(i: SolveInput): SolveInput {
  return { ...i, options: { fieldExtentChords: i.options?.fieldExtentChords ?? 1.5, waves: true, fanRayStepDeg: 1e-6 } };
}

function byId(r: SolveResult, id: string): Wave {
  const w = r.waves.find((x) => x.id === id);
  if (!w) throw new Error(`no wave ${id}`);
  return w;
}

/** Mean of a shock's p2/p1 − 1 over the heights |y| in [y0, y1], weighted by height; null when
 *  its path does not span the band. */
function meanStrength(w: Wave, y0: number, y1: number): number | null {
  const along = w.pRatioAlong;
  if (!along) throw new Error(`${w.id} has no pRatioAlong`);
  let sum = 0;
  let span = 0;
  for (let k = 0; k + 1 < w.path.length; k++) {
    const a = Math.abs(itemAt(w.path, k)[1]);
    const b = Math.abs(itemAt(w.path, k + 1)[1]);
    const lo = Math.max(y0, Math.min(a, b));
    const hi = Math.min(y1, Math.max(a, b));
    if (hi > lo) {
      sum += (itemAt(along, k) - 1) * (hi - lo);
      span += hi - lo;
    }
  }
  return span > 0.999 * (y1 - y0) ? sum / span : null;
}

/** Where a wave's path is at height |y| (x), or null. */
function xAtHeight(w: Wave, y: number): number | null {
  for (let k = 0; k + 1 < w.path.length; k++) {
    const [xa, ya] = itemAt(w.path, k);
    const [xb, yb] = itemAt(w.path, k + 1);
    const a = Math.abs(ya);
    const b = Math.abs(yb);
    if ((a - y) * (b - y) <= 0 && a !== b) return xa + ((xb - xa) * (y - a)) / (b - a);
  }
  return null;
}

describe('fan discretisation of the wave map', () => {
  it('fanInteriorRays: one interior ray up to twice the step, then one per step, three at most (a quarter of a large fan apart)', () => {
    expect(FAN_RAY_STEP_DEG_DEFAULT).toBe(0.25);
    expect(fanInteriorRays(0.14 * DEG)).toBe(1); // a 200-vertex arc's fans
    expect(fanInteriorRays(0.5 * DEG)).toBe(1);
    expect(fanInteriorRays(0.6 * DEG)).toBe(2);
    expect(fanInteriorRays(0.75 * DEG)).toBe(2);
    expect(fanInteriorRays(0.8 * DEG)).toBe(3);
    expect(fanInteriorRays(11.4 * DEG)).toBe(FAN_INTERIOR_RAYS_MAX);
    expect(fanInteriorRays(-0.6 * DEG)).toBe(2); // the sign of the turn does not matter
    expect(fanInteriorRays(2.5 * DEG, 1)).toBe(2);
    expect(fanInteriorRays(0.01 * DEG, 1e-6)).toBe(FAN_INTERIOR_RAYS_MAX);
  });

  it('every fan has head, tail and fanInteriorRays(turn) rays between, evenly spaced in Prandtl-Meyer turning, at most the step apart or a quarter of the fan (ν of NACA Report 1135, from memory, evaluated independently)', () => {
    const gamma = 1.4;
    const checked = reached('fans');
    for (const i of [input(biconvex(100, 0.06), 2.5, 3), input(lens(20, 0.1, 0.01), 2, 2), input(biconvex(16, 0.04), 1.8, 1)]) {
      const r = solveSection(i);
      expect(r.status).toBe('ok');
      for (const w of r.waves) {
        if (w.kind !== 'fan' || !w.rays) continue;
        const turn = Math.abs(w.deflectionDeg) * DEG;
        expect(w.rays).toHaveLength(fanInteriorRays(turn) + 2);
        const gaps = w.rays.slice(1).map((ray, k) => nu(ray.mach, gamma) - nu(itemAt(w.rays ?? [], k).mach, gamma));
        for (const g of gaps) {
          expectClose(g, turn / gaps.length, 1e-9);
          expect(g).toBeLessThanOrEqual(Math.max(FAN_RAY_STEP_DEG_DEFAULT * DEG, turn / 4) + 1e-12);
        }
        checked.hit();
      }
    }
    checked.expectAtLeast(150);
  });

  it('surface pressures, coefficients and the trailing edge do not depend on the fan discretisation (the march is on the surface)', () => {
    for (const i of [input(biconvex(100, 0.06), 2.5, 3), input(lens(24, 0.08, 0.02), 2.4, 3)]) {
      const coarse = solveSection(i);
      const fine = solveSection(dense(i));
      expect(coarse.surfaces).toEqual(fine.surfaces);
      expect(coarse.coefficients).toEqual(fine.coefficients);
      expect(coarse.theories).toEqual(fine.theories);
      expect(coarse.trailingEdge).toEqual(fine.trailingEdge);
      expect(coarse.waves.length).toBe(fine.waves.length);
      expect(coarse.waves.reduce((n, w) => n + (w.rays?.length ?? 0), 0)).toBeLessThan(fine.waves.reduce((n, w) => n + (w.rays?.length ?? 0), 0));
    }
  });

  it('the nose shocks are where and as strong as with three interior rays in every fan: mean p2/p1 − 1 over each band of heights [y/√2, y·√2] within 4 %, the shock within 0.5 % of the height in x', () => {
    // Tolerance: each ray is drawn on the Mach line of the state behind it, so a coarser fan is
    // absorbed a little later and the shock stays a little stronger and steeper in between; the
    // difference is of the order of the ray spacing (measured at most 3.1 % and 0.38 % on these
    // sections; none on sections whose fans already had three interior rays).
    const checked = reached('shock bands');
    const cases: [SolveInput, number[]][] = [
      [input(biconvex(32, 0.06), 2.5, 3, { fieldExtentChords: 10 }), [0.5, 1, 2]], // the 64-vertex drag section
      [input(biconvex(100, 0.06), 2.5, 3, { fieldExtentChords: 10 }), [0.5, 1, 2]], // the 200-vertex one
      [input(biconvex(200, 0.02), 1.5, 0, { fieldExtentChords: 50 }), [1, 5, 20]],
      [input(lens(20, 0.1, 0.01), 2, 2, { fieldExtentChords: 6 }), [0.5, 1, 2]],
    ];
    for (const [i, heights] of cases) {
      const coarse = solveSection(i);
      const fine = solveSection(dense(i));
      for (const id of ['wave_upper_0', 'wave_lower_0']) {
        const a = byId(coarse, id);
        const b = byId(fine, id);
        for (const y of heights) {
          const sa = meanStrength(a, y / Math.SQRT2, y * Math.SQRT2);
          const sb = meanStrength(b, y / Math.SQRT2, y * Math.SQRT2);
          const xa = xAtHeight(a, y);
          const xb = xAtHeight(b, y);
          if (sa === null || sb === null || xa === null || xb === null) continue; // the shock left the field box lower down
          expectClose(sa / sb, 1, 0.04);
          expect(Math.abs(xa - xb)).toBeLessThanOrEqual(0.005 * y);
          checked.hit();
        }
      }
    }
    checked.expectAtLeast(18);
  });
});
