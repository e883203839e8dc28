import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { applyOp, withOpId } from '../../../shared/model/ops.ts';
import { isSimplePolygon } from '../../../shared/model/polygon.ts';
import {
  fourDigitMeanLine,
  mirrorSurface,
  moveRidge,
  normaliseSection,
  rotateSection,
  scaleThickness,
  sectionCommandOp,
  setCamber,
  setThicknessRatio,
  type CommandResult,
} from '../../../shared/model/sectionCommands.ts';
import { sectionShape } from '../../../shared/model/sectionShape.ts';
import { defaultSketchDocument, type Point } from '../../../shared/model/sketch.ts';
import { generateSection } from '../../../shared/model/templates.ts';
import { expectClose } from '../../helpers/expectClose.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/** The 5 % double wedge with its ridge at mid-chord (listed nose, upper, tail, lower). */
const wedge5: Point[] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];
/** Ridges at 0.3 (upper) and 0.7 (lower): the surfaces share no vertex x. */
const skewed: Point[] = [[0, 0], [0.3, 0.03], [1, 0], [0.7, -0.03]];

function ok(r: CommandResult): Point[] {
  if (!r.ok) throw new Error(r.reason);
  return r.points;
}

function expectPoints(actual: Point[], expected: Point[], tol = 1e-12) {
  expect(actual).toHaveLength(expected.length);
  actual.forEach((p, i) => {
    expectClose(p[0], itemAt(expected, i)[0], tol);
    expectClose(p[1], itemAt(expected, i)[1], tol);
  });
}

describe('sectionShape (hand-computed)', () => {
  it('sectionShape(5 % double wedge) gives chord 1, t/c 0.05, ridge at 0.5, no camber', () => {
    const s = sectionShape(wedge5);
    expect(s.chord).toBe(1);
    expectClose(s.thicknessRatio, 0.05, 1e-15);
    expectClose(s.ridgeXOverC!, 0.5, 1e-15);
    expect(s.camberRatio).toBe(0);
    expect(s.camberXOverC).toBeNull();
  });

  it('sectionShape(hexagonal, flat from 0.25 to 0.75) puts the ridge in the middle of the flat', () => {
    const hex: Point[] = [[0, 0], [0.25, 0.02], [0.75, 0.02], [1, 0], [0.75, -0.02], [0.25, -0.02]];
    expectClose(sectionShape(hex).ridgeXOverC!, 0.5, 1e-15);
  });

  it('sectionShape(skewed ridges) interpolates the other surface: t = 0.03·10/7 at x 0.3 and 0.7, camber +0.03·2/7 at x 0.3', () => {
    // At x = 0.3 the lower surface is at −0.03·0.3/0.7; thickness 0.03·(1 + 3/7), mean line 0.03·(1 − 3/7)/2.
    const s = sectionShape(skewed);
    expectClose(s.thicknessRatio, (0.03 * 10) / 7, 1e-15);
    expectClose(s.ridgeXOverC!, 0.5, 1e-12); // a tie at 0.3 and 0.7: the middle
    expectClose(s.camberRatio!, (0.03 * 2) / 7, 1e-15);
    expectClose(s.camberXOverC!, 0.3, 1e-15);
  });

  it('sectionShape of a cambered wedge measures camber from the chord line, scaled by the chord', () => {
    // Chord 2 from (1, 1) to (3, 1); at x 2 the surfaces are at 1.12 and 1.04: mean 1.08, camber 0.08 → 4 %.
    const s = sectionShape([[1, 1], [2, 1.12], [3, 1], [2, 1.04]]);
    expect(s.chord).toBe(2);
    expectClose(s.thicknessRatio, 0.04, 1e-12);
    expectClose(s.camberRatio!, 0.04, 1e-12);
  });
});

describe('setThicknessRatio / scaleThickness', () => {
  it('setThicknessRatio(5 % double wedge, 8 %) moves the ridges to ±0.04 and nothing else', () => {
    expectPoints(ok(setThicknessRatio(wedge5, 0.08)), [[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]]);
  });

  it('setThicknessRatio keeps the mean line: (0.5, 0.06)/(0.5, 0.02) at 8 % becomes (0.5, 0.08)/(0.5, 0)', () => {
    expectPoints(ok(setThicknessRatio([[0, 0], [0.5, 0.06], [1, 0], [0.5, 0.02]], 0.08)), [[0, 0], [0.5, 0.08], [1, 0], [0.5, 0]]);
  });

  it('setThicknessRatio(skewed ridges, 6 %) finds k = 1.56 by search: ridges at (0.3, 0.042) and (0.7, −0.042)', () => {
    // By hand: the new upper ridge is 0.06/7 + k·0.15/7 and t(0.3) = (0.6 + 1.5k)/49, so 6 % needs
    // k = 1.56 (k = 0.06/t₀ = 1.4 would give only 5.51 %).
    const out = ok(setThicknessRatio(skewed, 0.06));
    expectPoints(out, [[0, 0], [0.3, 0.042], [1, 0], [0.7, -0.042]], 1e-11);
    expectClose(sectionShape(out).thicknessRatio, 0.06, 1e-12);
  });

  it('scaleThickness(5 % double wedge, 2) doubles the half-thickness about the mean line', () => {
    expectPoints(ok(scaleThickness(wedge5, 2)), [[0, 0], [0.5, 0.05], [1, 0], [0.5, -0.05]]);
  });

  it('refuses with a sentence: zero or negative targets, a section that doubles back in x', () => {
    expect(setThicknessRatio(wedge5, 0)).toEqual({ ok: false, reason: 'The thickness ratio must be above 0 %.' });
    expect(scaleThickness(wedge5, -1).ok).toBe(false);
    const hook: Point[] = [[0, 0], [0.6, 0.1], [0.4, 0.2], [1, 0], [0.5, -0.05]];
    const r = setThicknessRatio(hook, 0.1);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/without turning back/);
  });

  it('[SC2] property: on faceted biconvex sections the target is met, nose and tail stay and the outline stays simple', () => {
    let reached = 0;
    fc.assert(
      fc.property(fc.double({ min: 1, max: 20, noNaN: true }), fc.integer({ min: 2, max: 40 }), fc.double({ min: 0.005, max: 0.25, noNaN: true }), (tPercent, facets, target) => {
        const g = generateSection('biconvex', { thicknessPercent: tPercent, facetsPerSide: facets });
        if (!g.ok) return;
        const out = ok(setThicknessRatio(g.points, target));
        expectClose(sectionShape(out).thicknessRatio, target, 1e-9 * target);
        expect(out[0]).toEqual(g.points[0]);
        expect(out[facets]).toEqual(g.points[facets]);
        expect(isSimplePolygon(out)).toBe(true);
        reached++;
      }),
      { numRuns: 150 },
    );
    expect(reached).toBeGreaterThanOrEqual(140);
  });
});

describe('moveRidge', () => {
  it('moveRidge(5 % double wedge, 0.3) moves both ridge vertices to x 0.3, y unchanged', () => {
    expectPoints(ok(moveRidge(wedge5, 0.3)), [[0, 0], [0.3, 0.025], [1, 0], [0.3, -0.025]]);
  });

  it('moveRidge stretches x piecewise linearly: 0.25 → 0.2 and 0.75 → 0.7 when the ridge goes 0.5 → 0.4', () => {
    const arc: Point[] = [[0, 0], [0.25, 0.02], [0.5, 0.025], [0.75, 0.02], [1, 0], [0.75, -0.02], [0.5, -0.025], [0.25, -0.02]];
    const out = ok(moveRidge(arc, 0.4));
    expectPoints(out, [[0, 0], [0.2, 0.02], [0.4, 0.025], [0.7, 0.02], [1, 0], [0.7, -0.02], [0.4, -0.025], [0.2, -0.02]]);
    expectClose(sectionShape(out).ridgeXOverC!, 0.4, 1e-12);
    expectClose(sectionShape(out).thicknessRatio, 0.05, 1e-12);
  });

  it('moveRidge on a section of chord 2 from x 1 takes x/c from the nose', () => {
    expectPoints(ok(moveRidge([[1, 0], [2, 0.05], [3, 0], [2, -0.05]], 0.25)), [[1, 0], [1.5, 0.05], [3, 0], [1.5, -0.05]]);
  });

  it('refuses a position outside the chord and a section whose thickest point is the tail', () => {
    expect(moveRidge(wedge5, 1).ok).toBe(false);
    expect(moveRidge([[0, 0], [1, 0.1], [1, -0.1]], 0.5).ok).toBe(false);
  });
});

describe('mirrorSurface', () => {
  it('mirrorSurface(upper) of an asymmetric wedge reflects the upper ridge about the chord line', () => {
    const out = ok(mirrorSurface([[0, 0], [0.3, 0.04], [1, 0], [0.6, -0.01]], 'upper'));
    expectPoints(out, [[0, 0], [0.3, 0.04], [1, 0], [0.3, -0.04]]);
  });

  it('mirrorSurface(lower) keeps the lower surface and may change the vertex count', () => {
    const out = ok(mirrorSurface([[0, 0], [0.5, 0.05], [1, 0], [0.7, -0.02], [0.3, -0.03]], 'lower'));
    expectPoints(out, [[0, 0], [0.3, 0.03], [0.7, 0.02], [1, 0], [0.7, -0.02], [0.3, -0.03]]);
  });

  it('mirrorSurface about a slanted chord line: (0.5, 0.1) about y = 0.1x lands at (0.50990…, 0.00099…)', () => {
    // Reflection of p about the line along d = (1, 0.1): 2(p·d)/(d·d)·d − p = (1.00990 − 0.5, 0.100990 − 0.1).
    const out = ok(mirrorSurface([[0, 0], [0.5, 0.1], [1, 0.1], [0.5, 0.0]], 'upper'));
    expectClose(itemAt(out, 3)[0], (2 * 0.51) / 1.01 - 0.5, 1e-12);
    expectClose(itemAt(out, 3)[1], (2 * 0.051) / 1.01 - 0.1, 1e-12);
  });

  it('refuses a blunt nose', () => {
    expect(mirrorSurface([[0, -0.01], [0, 0.01], [1, 0]], 'upper').ok).toBe(false);
  });
});

describe('setCamber', () => {
  it('fourDigitMeanLine(m 0.02, p 0.4): 0.02 at 0.4, 0.015 at 0.2 and at 0.7, 0 at nose and tail (NACA Report 460 equations, hand-computed)', () => {
    expectClose(fourDigitMeanLine(0.4, 0.02, 0.4), 0.02, 1e-15);
    expectClose(fourDigitMeanLine(0.2, 0.02, 0.4), 0.015, 1e-15);
    expectClose(fourDigitMeanLine(0.7, 0.02, 0.4), 0.015, 1e-15);
    expectClose(fourDigitMeanLine(0, 0.02, 0.4), 0, 1e-15);
    expectClose(fourDigitMeanLine(1, 0.02, 0.4), 0, 1e-15);
  });

  it('setCamber(5 % double wedge, 2 % at 0.5) lifts both ridge vertices by 0.02', () => {
    const out = ok(setCamber(wedge5, 0.02, 0.5));
    expectPoints(out, [[0, 0], [0.5, 0.045], [1, 0], [0.5, -0.005]]);
    expectClose(sectionShape(out).camberRatio!, 0.02, 1e-12);
    expectClose(sectionShape(out).thicknessRatio, 0.05, 1e-12);
  });

  it('setCamber(…, 0) makes a cambered wedge symmetric again', () => {
    expectPoints(ok(setCamber([[0, 0], [0.5, 0.045], [1, 0], [0.5, -0.005]], 0, 0.5)), wedge5);
  });

  it('refuses a camber beyond 20 % and a position outside the chord', () => {
    expect(setCamber(wedge5, 0.3, 0.5).ok).toBe(false);
    expect(setCamber(wedge5, 0.02, 0).ok).toBe(false);
  });
});

describe('rotateSection / normaliseSection', () => {
  it('rotateSection by 90° nose up about the origin takes the tail (1, 0) to (0, −1)', () => {
    expectPoints(ok(rotateSection([[0, 0], [1, 0], [0.5, 0.1]], 90, [0, 0])), [[0, 0], [0, -1], [0.1, -0.5]]);
  });

  it('rotateSection by 10° about the quarter chord: the tail goes to (0.25 + 0.75 cos 10°, −0.75 sin 10°)', () => {
    const out = ok(rotateSection(wedge5, 10, [0.25, 0]));
    const c = Math.cos((10 * Math.PI) / 180);
    const s = Math.sin((10 * Math.PI) / 180);
    expectClose(itemAt(out, 2)[0], 0.25 + 0.75 * c, 1e-12);
    expectClose(itemAt(out, 2)[1], -0.75 * s, 1e-12);
    expectClose(itemAt(out, 0)[0], 0.25 - 0.25 * c, 1e-12);
    expectClose(itemAt(out, 0)[1], 0.25 * s, 1e-12);
  });

  it('normaliseSection((2,1),(3,1.05),(4,1),(3,0.95)) gives the unit 5 % double wedge', () => {
    expectPoints(ok(normaliseSection([[2, 1], [3, 1.05], [4, 1], [3, 0.95]])), wedge5);
  });

  it('normaliseSection levels a chord line drawn at 5° and undoes a scale and a shift', () => {
    const moved = ok(rotateSection(wedge5, -5, [0.3, 0.2])).map(([x, y]) => [2 * x + 7, 2 * y - 3] as Point);
    expectPoints(ok(normaliseSection(moved)), wedge5, 1e-11);
    // Without levelling the chord line stays slanted (chord 1 still).
    const kept = ok(normaliseSection(moved, { level: false }));
    expect(kept[0]).toEqual([0, 0]);
    expectClose(sectionShape(kept).chord, 1, 1e-12);
    expect(Math.abs(itemAt(kept, 2)[1])).toBeGreaterThan(0.05);
  });
});

describe('a section drawn at an angle: measured and edited along its chord line', () => {
  // The 5 % double wedge turned 10° nose down about its nose: t/c is still 5 % (measured
  // normal to the chord line, as the solver's maxThicknessRatio does).
  const tilted = ok(rotateSection(wedge5, -10, [0, 0]));

  it('sectionShape of the tilted wedge: t/c 0.05, ridge at 0.5 of the chord line, no camber', () => {
    const s = sectionShape(tilted);
    expectClose(s.thicknessRatio, 0.05, 1e-12);
    expectClose(s.ridgeXOverC!, 0.5, 1e-12);
    expectClose(s.camberRatio!, 0, 1e-12);
  });

  it('thickness, ridge and camber commands on the tilted wedge equal the tilted results of the level ones', () => {
    const tilt = (pts: Point[]) => ok(rotateSection(pts, -10, [0, 0]));
    expectPoints(ok(setThicknessRatio(tilted, 0.08)), tilt(ok(setThicknessRatio(wedge5, 0.08))), 1e-11);
    expectPoints(ok(moveRidge(tilted, 0.3)), tilt(ok(moveRidge(wedge5, 0.3))), 1e-11);
    expectPoints(ok(setCamber(tilted, 0.02, 0.5)), tilt(ok(setCamber(wedge5, 0.02, 0.5))), 1e-11);
  });
});

describe('sectionCommandOp', () => {
  it('[SC1] names only the vertices that moved, as one moveVertices edit the store can apply and undo', () => {
    const op = sectionCommandOp(wedge5, ok(setThicknessRatio(wedge5, 0.08)));
    expect(op).toEqual({ type: 'moveVertices', indices: [1, 3], to: [[0.5, 0.04], [0.5, -0.04]] });
    const doc = defaultSketchDocument();
    const applied = applyOp(doc, withOpId(op!));
    expect(applied.ok && applied.doc.section.points).toEqual([[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]]);
  });

  it('uses replaceSection when the vertex count changes, and nothing when nothing moved', () => {
    const mirrored = ok(mirrorSurface([[0, 0], [0.5, 0.05], [1, 0], [0.7, -0.02], [0.3, -0.03]], 'upper'));
    expect(sectionCommandOp([[0, 0], [0.5, 0.05], [1, 0], [0.7, -0.02], [0.3, -0.03]], mirrored)?.type).toBe('replaceSection');
    expect(sectionCommandOp(wedge5, wedge5.map((p) => [p[0], p[1]] as Point))).toBeNull();
  });
});
