import { reached } from '../../helpers/reached.ts';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isSimplePolygon } from '../../../shared/model/polygon.ts';
import {
  SECTION_TEMPLATES,
  TEMPLATE_IDS,
  checkTemplateParams,
  defaultTemplateParams,
  generateSection,
  templateTitle,
  type TemplateId,
} from '../../../shared/model/templates.ts';
import { parseSolveInput } from '../../../shared/model/solveInput.ts';
import { solveSection } from '../../../shared/solver/index.ts';
import { expectClose, expectCloseRel } from '../../helpers/expectClose.ts';
import { cpFromPressure, fanState, shockState } from '../solver/independentRelations.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

function points(id: TemplateId, params: Record<string, number> = defaultTemplateParams(id)) {
  const r = generateSection(id, params);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.points;
}

function solve(pts: [number, number][], mach: number, alphaDeg: number) {
  const parsed = parseSolveInput({ section: { points: pts }, flow: { mach, alphaDeg } });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return solveSection(parsed.value);
}

/** Largest vertical extent of the polygon over its x extent. */
function thickness(pts: [number, number][]): number {
  const ys = pts.map((p) => p[1]);
  return Math.max(...ys) - Math.min(...ys);
}

describe('section templates', () => {
  it.each(TEMPLATE_IDS)('[T1] %s with default parameters is a simple polygon, nose (0,0), tail (1,0)', (id) => {
    const pts = points(id);
    expect(isSimplePolygon(pts)).toBe(true);
    const xs = pts.map((p) => p[0]);
    expect(Math.min(...xs)).toBe(0);
    expect(Math.max(...xs)).toBe(1);
    expect(pts[0]).toEqual([0, 0]);
    expect(pts.filter((p) => p[0] === 1)).toEqual([[1, 0]]);
  });

  it.each(TEMPLATE_IDS)('%s with default parameters solves with status ok at M 2, α 2°', (id) => {
    const r = solve(points(id), 2, 2);
    expect(r.status).toBe('ok');
    expect(r.coefficients?.cl).toBeGreaterThan(0);
  });

  it.each(TEMPLATE_IDS)('[T1] %s stays a simple polygon over its whole parameter range', (id) => {
    const t = SECTION_TEMPLATES[id];
    const arbs = t.params.map((p) =>
      p.integer ? fc.integer({ min: p.min, max: Math.min(p.max, 60) }) : fc.double({ min: p.min, max: p.max, noNaN: true }),
    );
    const checked = reached(`[T1] ${id} parameter sets`);
    fc.assert(
      fc.property(fc.tuple(...arbs), (values) => {
        const params = Object.fromEntries(t.params.map((p, i) => [p.key, itemAt(values, i)]));
        checked.hit();
        expect(isSimplePolygon(points(id, params))).toBe(true);
      }),
      { numRuns: 100 },
    );
    checked.expectAtLeast(100);
  });

  it('double wedge: thickness ratio and ridge position as asked', () => {
    const pts = points('doubleWedge', { thicknessPercent: 8, ridgePercent: 30 });
    expect(pts).toEqual([[0, 0], [0.3, 0.04], [1, 0], [0.3, -0.04]]);
  });

  it('hexagonal: flat top of the asked length, centred, at the asked thickness', () => {
    const pts = points('hexagonal', { thicknessPercent: 4, flatPercent: 50 });
    expect(pts).toEqual([[0, 0], [0.25, 0.02], [0.75, 0.02], [1, 0], [0.75, -0.02], [0.25, -0.02]]);
  });

  it('wedge: the ramp rises at the asked angle over a flat underside', () => {
    const pts = points('wedge', { rampDeg: 10, ridgePercent: 60 });
    expect(pts).toHaveLength(3);
    expectClose(Math.atan2(itemAt(pts, 1)[1], itemAt(pts, 1)[0]) * (180 / Math.PI), 10, 1e-9);
    expect(pts[2]).toEqual([1, 0]);
  });

  it('faceted biconvex: 2n facets with vertices on circular arcs of the asked thickness', () => {
    const pts = points('biconvex', { thicknessPercent: 6, facetsPerSide: 10 });
    expect(pts).toHaveLength(20);
    expectClose(thickness(pts), 0.06, 1e-12); // n even: a vertex sits at mid-chord
    // All upper vertices are equidistant from the arc's centre (0.5, h − R).
    const h = 0.03;
    const R = (0.25 + h * h) / (2 * h);
    for (const [x, y] of pts.slice(0, 11)) expectClose(Math.hypot(x - 0.5, y - (h - R)), R, 1e-9);
    // Symmetric: the lower surface mirrors the upper one.
    const upperYs = pts.slice(1, 10).map((p) => p[1]);
    const lowerYs = pts.slice(11).reverse().map((p) => -p[1]);
    expect(lowerYs).toEqual(upperYs);
  });

  it('flat plate (thin lens): at α = 0 cl is 0 and cd is Ackeret\'s double-wedge thickness drag 4(t/c)²/√(M²−1) (2.31e-6 at M 2)', () => {
    // A symmetric double wedge at α = 0: both surfaces see ±ε with ε = atan(t/c) (half-thickness
    // over half-chord); Ackeret's cd = 4ε²/√(M²−1) (Liepmann & Roshko, thin-airfoil drag of a
    // double wedge, from memory). The exact value agrees to (t/c)⁴.
    for (const mach of [1.5, 2, 2.5, 3]) {
      const r = solve(points('flatPlate'), mach, 0);
      expect(r.status).toBe('ok');
      expectClose(r.coefficients!.cl, 0, 1e-15);
      const eps = Math.atan(0.001);
      expectCloseRel(r.coefficients!.cd, (4 * eps * eps) / Math.sqrt(mach * mach - 1), 1e-3);
    }
  });

  it('flat plate (thin lens): against the exact flat plate (oblique shock below, Prandtl-Meyer fan above) cl differs by under 4e-5 relative at 0.1 % thickness, falling like t/c', () => {
    // The exact plate from the independent textbook relations (NACA Report 1135 forms):
    // cn = (Cp_lower − Cp_upper), cl = cn·cos α, cd = cn·sin α.
    const plate = (mach: number, alphaDeg: number) => {
      const a = (alphaDeg * Math.PI) / 180;
      const cn = cpFromPressure(shockState(mach, a, 1.4).pRatio, mach, 1.4) - cpFromPressure(fanState(mach, a, 1.4).pRatio, mach, 1.4);
      return { cl: cn * Math.cos(a), cd: cn * Math.sin(a) };
    };
    let checked = 0;
    for (const mach of [1.5, 2, 3]) {
      for (const alphaDeg of [1, 4, 10]) {
        const p = plate(mach, alphaDeg);
        const lens = (tPercent: number) => solve(points('flatPlate', { thicknessPercent: tPercent }), mach, alphaDeg).coefficients!;
        const e1 = Math.abs(lens(0.1).cl - p.cl) / p.cl;
        const e2 = Math.abs(lens(0.01).cl - p.cl) / p.cl;
        // The lens's lower rear facet sits behind a shock of α + ε and a fan of 2ε instead of a
        // shock of α: an entropy difference of order ε·α², so the error is first order in t/c.
        expect(e1).toBeLessThan(4e-5);
        expect(e2).toBeLessThan(0.3 * e1); // a tenth to a quarter: first order, plus an (t/c)² part
        // cd: thickness drag plus that entropy term, a few 1e-6 at most.
        expect(Math.abs(lens(0.1).cd - p.cd)).toBeLessThan(6e-6);
        checked++;
      }
    }
    expect(checked).toBe(9);
  });

  it('flat plate (thin lens): at α = 4° cl hardly depends on the lens thickness (a plate in the limit)', () => {
    const thin = solve(points('flatPlate', { thicknessPercent: 0.1 }), 2.5, 4);
    const thinner = solve(points('flatPlate', { thicknessPercent: 0.01 }), 2.5, 4);
    const clThin = thin.coefficients!.cl;
    const clThinner = thinner.coefficients!.cl;
    expect(Math.abs(clThin - clThinner) / clThinner).toBeLessThan(1e-3);
    // Ackeret: a plate's normal force cn = 4α/√(M²−1), independent of thickness, and
    // cl = cn·cos α (from memory).
    const alpha = (4 * Math.PI) / 180;
    const plateLinear = ((4 * alpha) / Math.sqrt(2.5 ** 2 - 1)) * Math.cos(alpha);
    expectClose(thin.theories!.linear.cl, plateLinear, 1e-3 * plateLinear);
  });

  it('refuses out-of-range and missing parameters with a message per field', () => {
    expect(checkTemplateParams('doubleWedge', { thicknessPercent: 40, ridgePercent: 50 })).toEqual({
      thicknessPercent: 'Thickness ratio must be from 0.5 to 30 % c.',
    });
    expect(checkTemplateParams('biconvex', { thicknessPercent: 6, facetsPerSide: 2.5 })).toEqual({
      facetsPerSide: 'Facets per side must be a whole number.',
    });
    const r = generateSection('hexagonal', { thicknessPercent: Number.NaN });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(Object.keys(r.errors).sort()).toEqual(['flatPercent', 'thicknessPercent']);
  });

  it('names a sketch after the template and its parameters', () => {
    expect(templateTitle('doubleWedge', { thicknessPercent: 5, ridgePercent: 40 })).toBe(
      'Double wedge — thickness ratio 5 % c, ridge position 40 % c',
    );
    expect(templateTitle('wedge', { rampDeg: 6, ridgePercent: 70 })).toBe('Wedge — ramp angle 6°, ridge position 70 % c');
  });
});
