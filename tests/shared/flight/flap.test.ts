import { describe, expect, it } from 'vitest';
import { deflectFlap, hingeMoments } from '../../../shared/flight/flap.ts';
import { parseSolveInput } from '../../../shared/model/solveInput.ts';
import { solveSection } from '../../../shared/solver/index.ts';
import type { Point } from '../../../shared/model/sketch.ts';
import { expectClose, expectCloseRel } from '../../helpers/expectClose.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

const diamond: Point[] = [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]];

/** A thin lens (two circular-ish arcs) of thickness t with `k` facets a side: nearly a flat plate. */
function lens(t: number, k: number): Point[] {
  const upper: Point[] = [];
  for (let i = 0; i <= k; i++) upper.push([i / k, 2 * t * (i / k) * (1 - i / k)]);
  return [...upper, ...upper.slice(1, -1).reverse().map(([x, y]) => [x, -y] as Point)];
}

function solve(points: Point[], mach: number, alphaDeg: number) {
  const parsed = parseSolveInput({ section: { points }, flow: { mach, alphaDeg }, options: { waves: false } });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return solveSection(parsed.value);
}

describe('deflectFlap', () => {
  it('inserts hinge vertices on both surfaces and turns the flap trailing edge down for δ > 0', () => {
    const r = deflectFlap(diamond, { hingeXOverC: 0.75, deflectionDeg: 10 });
    if (!r.ok) throw new Error(r.reason);
    expect(r.points).toHaveLength(6);
    expect(r.hinge[0]).toBe(0.75);
    expectClose(r.hinge[1], 0, 1e-15);
    expect(r.flapChord).toBe(0.25);
    const te = itemAt(r.points, itemAt(r.flapVertices, 0));
    expectClose(te[0], 0.75 + 0.25 * Math.cos((10 * Math.PI) / 180), 1e-12);
    expectClose(te[1], -0.25 * Math.sin((10 * Math.PI) / 180), 1e-12);
    expect(diamond).toEqual([[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]]); // input untouched
  });

  it('refuses a deflection that folds the section, and a hinge line that cuts the outline four times', () => {
    // A deep flap just aft of the hinge swings its lower corner forward into the fixed part.
    const folded = deflectFlap([[0, 0], [0.6, 0.3], [1, 0], [0.62, -0.3]], { hingeXOverC: 0.6, deflectionDeg: 45 });
    expect(folded).toEqual({ ok: false, reason: expect.stringMatching(/^A flap deflection of 45° folds the section: facet \d .* would cross/) });
    const wavy = deflectFlap([[0, 0], [0.6, 0.1], [0.4, 0.12], [1, 0.05], [1.02, 0.0], [0.5, -0.05]], { hingeXOverC: 0.45, deflectionDeg: 5 });
    expect(wavy).toEqual({ ok: false, reason: expect.stringContaining('meets the section outline 4 times') });
  });
});

describe('hingeMoments', () => {
  it('a thin flat-plate flap at α = 0 has linear ch = −2δ/√(M²−1) (Ackeret theory for a flap, common practice)', () => {
    const r = deflectFlap(lens(0.002, 12), { hingeXOverC: 0.75, deflectionDeg: 5 });
    if (!r.ok) throw new Error(r.reason);
    const result = solve(r.points, 2, 0);
    const ch = hingeMoments(r, [...result.surfaces.upper, ...result.surfaces.lower]);
    const delta = (5 * Math.PI) / 180;
    expectCloseRel(ch.linear!, (-2 * delta) / Math.sqrt(3), 0.02);
    // Restoring, and the exact theory gives a larger magnitude (shock side dominates).
    expect(ch.exact!).toBeLessThan(0);
    expect(Math.abs(ch.exact!)).toBeGreaterThan(Math.abs(ch.linear!) * 0.98);
  });

  it('a symmetric section with its flap undeflected at α = 0 has no hinge moment', () => {
    const r = deflectFlap(diamond, { hingeXOverC: 0.7, deflectionDeg: 0 });
    if (!r.ok) throw new Error(r.reason);
    const result = solve(r.points, 2.5, 0);
    const ch = hingeMoments(r, [...result.surfaces.upper, ...result.surfaces.lower]);
    expectClose(ch.exact!, 0, 1e-12);
    expectClose(ch.linear!, 0, 1e-12);
  });

  it('deflecting the flap down raises the lift (more cl than the clean section)', () => {
    const clean = solve(lens(0.02, 8), 2.5, 2);
    const r = deflectFlap(lens(0.02, 8), { hingeXOverC: 0.7, deflectionDeg: 8 });
    if (!r.ok) throw new Error(r.reason);
    const flapped = solve(r.points, 2.5, 2);
    expect(flapped.coefficients!.cl).toBeGreaterThan(clean.coefficients!.cl);
  });
});
