/**
 * Property tests (fast-check) over random simple polygons and conditions. Each property names
 * the invariant of shared/solver/README.md it checks. The per-test timeouts are only generous
 * limits for a busy shared machine; nothing here asserts on time.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../helpers/expectClose';
import { isSimplePolygon } from '../../../shared/model/polygon';
import { solveSection } from '../../../shared/solver/solveSection';
import type { Coefficients, SolveResult } from '../../../shared/solver/types';
import { badValues, input, type Pts } from './sections';
import { reached } from '../../helpers/reached';
import { itemAt } from '../../../shared/util/invariant.ts';

/** Star-shaped polygon around the origin: always simple; any shape, any orientation. */
const starPolygon = fc
  .array(fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0.15, max: 1, noNaN: true })), {
    minLength: 3,
    maxLength: 24,
  })
  .map((raw) => {
    const angles = raw.map(([a], i) => (2 * Math.PI * (i + 0.1 + 0.8 * a)) / raw.length);
    return raw.map(([, r], i): [number, number] => [r * Math.cos(itemAt(angles, i)), r * Math.sin(itemAt(angles, i))]);
  })
  .filter((p) => isSimplePolygon(p));

/**
 * Airfoil-like section: x-monotone upper and lower chains over a unit chord, nose at (0, 0),
 * vertices on a 1 %-chord grid (no sliver facets whose direction is rounding noise). Thickness
 * up to `maxThickness`, camber and tail offset up to `maxCamber` (chords).
 */
const foilSection = (maxThickness: number, maxCamber: number, nose: 'round' | 'sharp' = 'round') =>
  fc
    .record({
      xu: fc.uniqueArray(fc.integer({ min: 1, max: 99 }), { minLength: 1, maxLength: 12 }),
      xl: fc.uniqueArray(fc.integer({ min: 1, max: 99 }), { minLength: 1, maxLength: 12 }),
      tu: fc.array(fc.double({ min: 0.1, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }),
      tl: fc.array(fc.double({ min: 0.1, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }),
      thickness: fc.double({ min: maxThickness / 10, max: maxThickness, noNaN: true }),
      camber: fc.double({ min: -maxCamber, max: maxCamber, noNaN: true }),
      tailY: fc.double({ min: -maxCamber, max: maxCamber, noNaN: true }),
    })
    .map(({ xu, xl, tu, tl, thickness, camber, tailY }) => {
      const c = (x: number) => camber * 4 * x * (1 - x) + tailY * x;
      // 'round': thickness ∝ √(x(1−x)) with a random factor per vertex (steep noses, jagged
      // surfaces); 'sharp': a smooth lens ∝ x(1−x), so that scaling it down makes every
      // deflection small.
      const half = (x: number, f: number) =>
        nose === 'round' ? thickness * f * 2 * Math.sqrt(x * (1 - x)) : thickness * 4 * x * (1 - x);
      const upper = [...xu].sort((a, b) => a - b).map((i, k): [number, number] => [i / 100, c(i / 100) + half(i / 100, itemAt(tu, k))]);
      const lower = [...xl].sort((a, b) => a - b).map((i, k): [number, number] => [i / 100, c(i / 100) - half(i / 100, itemAt(tl, k))]);
      return [[0, 0] as [number, number], ...upper, [1, tailY] as [number, number], ...lower.reverse()];
    })
    .filter((p) => isSimplePolygon(p));

const condition = fc.record({
  mach: fc.double({ min: 1.0001, max: 50, noNaN: true }),
  alphaDeg: fc.double({ min: -89.9, max: 89.9, noNaN: true }),
  gamma: fc.double({ min: 1.0001, max: 5 / 3, noNaN: true }),
});

const anySection = fc.oneof(starPolygon, foilSection(0.3, 0.1));

/**
 * Thin sharp sections at moderate conditions: nose slopes up to 4·(0.05 + 0.02 + 0.02) ≈ 17° plus
 * |α| ≤ 4° stay below the sonic deflection at M 2 (22.7°), and the surfaces only expand behind the
 * nose, so nearly every case is attached and reaches the coefficient checks.
 */
const thinFoil = foilSection(0.05, 0.02, 'sharp');
const moderate = fc.record({
  mach: fc.double({ min: 2, max: 8, noNaN: true }),
  alphaDeg: fc.double({ min: -4, max: 4, noNaN: true }),
  gamma: fc.double({ min: 1.1, max: 5 / 3, noNaN: true }),
});
/** Half any section at any condition, half thin sections at moderate conditions. */
const mixedCase = fc.oneof(fc.tuple(anySection, condition), fc.tuple(thinFoil, moderate));

function coefficientsClose(a: Coefficients, b: Coefficients, rel: number): void {
  for (const k of ['cl', 'cd', 'cm', 'cn', 'ca'] as const) {
    expectClose(a[k], b[k], rel * (1 + Math.abs(b[k])));
  }
}

const STATUS_ORDER = ['blunt', 'detached', 'subsonic', 'vacuum'];

describe('solveSection properties (fast-check)', () => {
  it('[S5] [S6] random simple polygons and conditions: no exception, no NaN/Infinity, and the status explains every refusal', () => {
    const all = reached('[S5] [S6] every case');
    const okCases = reached('[S6] ok cases');
    const limitCases = reached('[S6] limit cases');
    fc.assert(
      fc.property(mixedCase, fc.boolean(), ([pts, flow], waves) => {
        const r = solveSection(input(pts, flow.mach, flow.alphaDeg, { gamma: flow.gamma, waves }));
        all.hit();
        expect(badValues(r)).toEqual([]);
        if (r.status === 'ok') {
          okCases.hit();
          expect(r.limits).toEqual([]);
          expect(r.coefficients).not.toBeNull();
          expect(r.bySurface).not.toBeNull();
          expect([...r.surfaces.upper, ...r.surfaces.lower].every((f) => f.solved && !f.vacuum)).toBe(true);
        } else {
          limitCases.hit();
          // Coefficients exist exactly when the only limits are vacuum ones (p = 0 there).
          expect(r.coefficients !== null).toBe(r.status === 'vacuum');
          expect(r.limits.length).toBeGreaterThan(0);
          // the status is the worst of the limits
          const worst = STATUS_ORDER.find((s) => r.limits.some((l) => l.status === s));
          expect(r.status).toBe(worst);
          for (const l of r.limits) {
            expect(l.vertex).toBeGreaterThanOrEqual(0);
            expect(l.vertex).toBeLessThan(pts.length);
            expect(l.at).toEqual(pts[l.vertex]);
            expect(l.message).toMatch(/\d/);
            expect(l.message.endsWith('.')).toBe(true);
          }
          // Facets past a vacuum limit carry p = 0 and Cp = −2/(γM²); no others do.
          for (const surface of ['upper', 'lower'] as const) {
            const vacuum = r.limits.find((l) => l.surface === surface && l.status === 'vacuum');
            for (const f of r.surfaces[surface]) {
              if (f.vacuum) {
                expect(vacuum).toBeDefined();
                expect(f.pRatio).toBe(0);
                expectClose(f.cp!, -2 / (flow.gamma * flow.mach * flow.mach), 1e-15);
              }
            }
          }
        }
        expect(r.surfaces.upper.length + r.surfaces.lower.length).toBe(pts.length);
      }),
      { numRuns: 600 },
    );
    all.expectAtLeast(600);
    okCases.expectAtLeast(200);
    limitCases.expectAtLeast(100);
  }, 60_000);

  it('[S1] reversing the vertex order changes no coefficient, facet state or slip line', () => {
    const all = reached('[S1] every case');
    const withCoefficients = reached('[S1] cases with coefficients');
    fc.assert(
      fc.property(mixedCase, ([pts, flow]) => {
        const a = solveSection(input(pts, flow.mach, flow.alphaDeg, { gamma: flow.gamma }));
        const b = solveSection(input([...pts].reverse(), flow.mach, flow.alphaDeg, { gamma: flow.gamma }));
        all.hit();
        if (a.coefficients) withCoefficients.hit();
        expect(b.status).toBe(a.status);
        expect(b.coefficients).toEqual(a.coefficients);
        expect(b.theories).toEqual(a.theories);
        expect(b.trailingEdge).toEqual(a.trailingEdge);
        const strip = (r: SolveResult) => [...r.surfaces.upper, ...r.surfaces.lower].map(({ index, ...f }) => f);
        expect(strip(b)).toEqual(strip(a));
        expect(b.waves.map((w) => [w.kind, w.angleDeg, w.end])).toEqual(a.waves.map((w) => [w.kind, w.angleDeg, w.end]));
      }),
      { numRuns: 300 },
    );
    all.expectAtLeast(300);
    withCoefficients.expectAtLeast(120);
  }, 60_000);

  it('[S2] translating and scaling the section (moment point with it) leaves the coefficients, theories and facet pressures unchanged', () => {
    const compared = reached('[S2] cases with exact coefficients compared');
    fc.assert(
      fc.property(
        thinFoil,
        moderate,
        fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
        fc.double({ min: -10, max: 10, noNaN: true }),
        fc.double({ min: -10, max: 10, noNaN: true }),
        fc.tuple(fc.double({ min: -1, max: 2, noNaN: true }), fc.double({ min: -0.5, max: 0.5, noNaN: true })),
        (pts, flow, scale, dx, dy, ref) => {
          // Shifts of up to 10 chords: a far larger shift would round the coordinates
          // themselves, which is not what this property is about.
          const move = ([x, y]: [number, number]): [number, number] => [(x + dx) * scale, (y + dy) * scale];
          const moved: Pts = pts.map(move);
          const a = solveSection(input(pts, flow.mach, flow.alphaDeg, { gamma: flow.gamma, momentPoint: ref }));
          const b = solveSection(input(moved, flow.mach, flow.alphaDeg, { gamma: flow.gamma, momentPoint: move(ref) }));
          expect(b.status).toBe(a.status);
          expect(a.coefficients !== null).toBe(b.coefficients !== null);
          if (!a.coefficients || !b.coefficients) return;
          compared.hit();
          coefficientsClose(b.coefficients, a.coefficients, 1e-9);
          coefficientsClose(b.theories!.linear, a.theories!.linear, 1e-9);
          coefficientsClose(b.theories!.secondOrder, a.theories!.secondOrder, 1e-9);
          const cps = (r: SolveResult) => [...r.surfaces.upper, ...r.surfaces.lower].map((f) => f.cp!);
          cps(b).forEach((cp, i) => expectClose(cp, itemAt(cps(a), i), 1e-9 * (1 + Math.abs(cp))));
        },
      ),
      { numRuns: 300 },
    );
    compared.expectAtLeast(270);
  }, 60_000);

  it('[S3] a section symmetric about its chord line at α = 0 has cl = 0 and cm = 0 about any point on that line', () => {
    const checked = reached('[S3] attached symmetric sections');
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 2, max: 98 }), { minLength: 1, maxLength: 15 }),
        fc.array(fc.double({ min: 0.8, max: 1, noNaN: true }), { minLength: 15, maxLength: 15 }),
        fc.double({ min: 0.002, max: 0.05, noNaN: true }),
        fc.double({ min: 1.8, max: 20, noNaN: true }),
        fc.double({ min: -2, max: 3, noNaN: true }),
        (xs, factors, thickness, mach, xRef) => {
          // Half-thickness t·4x(1−x) times a factor from 0.8 to 1 per vertex: jagged, with small
          // concave corners, nose slopes up to 11°: attached at M ≥ 1.8 nearly always.
          const half = [...xs].sort((a, b) => a - b).map((i, k): [number, number] => [i / 100, thickness * itemAt(factors, k) * 4 * (i / 100) * (1 - i / 100)]);
          const pts: Pts = [[0, 0], ...half, [1, 0], ...half.map(([x, y]): [number, number] => [x, -y]).reverse()];
          const r = solveSection(input(pts, mach, 0, { momentPoint: [xRef, 0] }));
          if (r.status !== 'ok') return;
          checked.hit();
          expectClose(r.coefficients!.cl, 0, 1e-13);
          expectClose(r.coefficients!.cm, 0, 1e-13);
          expectClose(r.theories!.linear.cl, 0, 1e-13);
          expectClose(r.theories!.secondOrder.cl, 0, 1e-13);
          expectClose(r.theories!.secondOrder.cm, 0, 1e-13);
        },
      ),
      { numRuns: 300 },
    );
    checked.expectAtLeast(270);
  }, 60_000);

  it('[S4] cd > 0 for any closed section in attached flow', () => {
    const attached = reached('[S4] attached cases');
    fc.assert(
      fc.property(mixedCase, ([pts, flow]) => {
        const r = solveSection(input(pts, flow.mach, flow.alphaDeg, { gamma: flow.gamma, waves: false }));
        if (r.status !== 'ok') return;
        attached.hit();
        expect(r.coefficients!.cd).toBeGreaterThan(0);
      }),
      { numRuns: 1500 },
    );
    attached.expectAtLeast(600);
  }, 60_000);

  it('[S7] exact → linear as thickness and α → 0: pressure differences shrink like ε, force differences like the dropped C2θ² term', () => {
    const checked = reached('[S7] thin sections');
    fc.assert(
      fc.property(
        foilSection(0.04, 0.01, 'sharp'),
        fc.double({ min: 1.5, max: 4, noNaN: true }),
        fc.double({ min: 0.5, max: 2, noNaN: true }),
        (pts, mach, alphaDeg) => {
          // Busemann's coefficients: linear theory keeps C1θ and drops C2θ².
          const b2 = mach * mach - 1;
          const c1 = 2 / Math.sqrt(b2);
          const c2 = (2.4 * mach ** 4 - 4 * b2) / (2 * b2 * b2);
          const at = (s: number) => {
            const scaled: Pts = pts.map(([x, y]) => [x, y * s]);
            const r = solveSection(input(scaled, mach, alphaDeg * s, { waves: false }));
            if (r.status !== 'ok') throw new Error('thin section not attached');
            const facets = [...r.surfaces.upper, ...r.surfaces.lower];
            const rad = (f: (typeof facets)[number]) => (f.thetaDeg * Math.PI) / 180;
            const c = r.coefficients!;
            const l = r.theories!.linear;
            return {
              cp: cpNorm(r, (f) => f.cpLinear! - f.cp!) / cpNorm(r, (f) => f.cp!),
              thetaMax: Math.max(...facets.map((f) => Math.abs(rad(f)))),
              force: Math.hypot(l.cl - c.cl, l.cd - c.cd),
              dropped: facets.reduce((sum, f) => sum + f.length * c2 * rad(f) ** 2, 0),
            };
          };
          const runs = [at(0.5), at(0.25), at(0.125)];
          checked.hit();
          for (let k = 0; k < runs.length; k++) {
            const r = itemAt(runs, k);
            // Pressures: relative difference about (C2/C1)·|θ| (factor 2 for higher orders) …
            expect(r.cp).toBeLessThan(2 * (c2 / c1) * r.thetaMax);
            // … so it halves with each halving of the section and α (first-order convergence).
            if (k > 0) expect(r.cp).toBeLessThan(0.6 * itemAt(runs, k - 1).cp);
            // Forces: the difference is bounded by the integrated C2θ² that linear theory drops,
            // which falls like ε² while the forces fall like ε.
            expect(r.force).toBeLessThan(2 * r.dropped);
          }
        },
      ),
      { numRuns: 200 },
    );
    checked.expectAtLeast(200);
  }, 60_000);

  it('[S7] second-order is closer to exact than linear for thin sections (surface pressures, length-weighted)', () => {
    // Busemann's law adds the θ² term the exact Cp has, so its error is O(θ³) against
    // linear theory's O(θ²).
    const checked = reached('[S7] thin sections');
    fc.assert(
      fc.property(
        // Thin: lenses up to 2 % thick with up to 0.5 % camber, so that even a coarse nose
        // facet at M 1.5 and |α| 3° stays well inside attached flow.
        foilSection(0.02, 0.005, 'sharp'),
        fc.double({ min: 1.5, max: 4, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        (pts, mach, alphaDeg) => {
          const r = solveSection(input(pts, mach, alphaDeg, { waves: false }));
          if (r.status !== 'ok') throw new Error('thin section not attached');
          checked.hit();
          const e2 = cpNorm(r, (f) => f.cpSecondOrder! - f.cp!);
          const e1 = cpNorm(r, (f) => f.cpLinear! - f.cp!);
          // Over the whole surface, not facet by facet: a facet with almost no deflection of its
          // own keeps the third-order entropy change of the shocks ahead of it, which neither
          // theory models, so there the two errors are equally small.
          expect(e2).toBeLessThan(e1);
        },
      ),
      { numRuns: 300 },
    );
    checked.expectAtLeast(300);
  }, 60_000);

  it('[S7] for a section symmetric about its chord line and fore and aft, second-order cl and cd equal the linear ones', () => {
    // Busemann's θ² terms: upper θ = φ − α, lower θ = α + φ (mirrored facets), so in the normal
    // force they give C2·Σ(θl² − θu²)·dx = 4αC2·Σφ·dx, zero when the slopes are antisymmetric
    // fore and aft; in the axial force C2·Σ(θu² + θl²)·dy, zero for the same reason.
    const checked = reached('[S7] symmetric sections');
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 1, max: 49 }), { minLength: 1, maxLength: 8 }),
        fc.array(fc.double({ min: 0.8, max: 1, noNaN: true }), { minLength: 8, maxLength: 8 }),
        fc.double({ min: 0.005, max: 0.05, noNaN: true }),
        fc.double({ min: 2, max: 6, noNaN: true }),
        fc.double({ min: -4, max: 4, noNaN: true }),
        (xs, factors, thickness, mach, alphaDeg) => {
          const front = [...xs].sort((a, b) => a - b).map((i, k): [number, number] => [i / 100, thickness * itemAt(factors, k) * 4 * (i / 100) * (1 - i / 100)]);
          const mid: [number, number] = [0.5, thickness];
          const back = [...front].reverse().map(([x, y]): [number, number] => [1 - x, y]);
          const upper = [...front, mid, ...back];
          const pts: Pts = [[0, 0], ...upper, [1, 0], ...upper.map(([x, y]): [number, number] => [x, -y]).reverse()];
          const r = solveSection(input(pts, mach, alphaDeg, { waves: false }));
          if (r.status !== 'ok') return;
          checked.hit();
          const lin = r.theories!.linear;
          const sec = r.theories!.secondOrder;
          expectClose(sec.cl, lin.cl, 1e-12 * (1 + Math.abs(lin.cl)));
          expectClose(sec.cd, lin.cd, 1e-12 * (1 + Math.abs(lin.cd)));
        },
      ),
      { numRuns: 200 },
    );
    checked.expectAtLeast(180);
  }, 60_000);

  it('[S7] for such a section with M∞·θmax ≤ 0.4 and |α| > 0.5°, second-order cm is closer to exact than linear in all but a rare few cases, and typically by a factor of ten or more', () => {
    // cm improves where Busemann's expansion is a good one: it is a series in θ whose second
    // coefficient grows like M (C2/C1 → (γ+1)M/4), i.e. in the hypersonic similarity parameter
    // K = M∞·θmax (common practice). With K not small the third-order terms it drops are as
    // large as the one it adds, and cm, which cancels between the surfaces, can come out closer
    // in linear theory: seed -1970200818 found such a section (5 % thick, M 3.8) when this was
    // checked over the whole range above; sampling 25 000 of those sections found none below
    // K 0.49. So the sections here are thinner and slower, and K is checked.
    // Even there it is not true of every section: seed 489258948 found one at M 1.968, α 0.5°,
    // t/c 1 % where the exact cm is −0.005040, linear −0.005149 (error 1.1e-4) and second-order
    // −0.004814 (error 2.3e-4) — a genuine exception (the two errors' leading terms cross as α/θ
    // varies), not a rounding tie. Over 4,588 sections of this family 2 were such exceptions
    // (0.04 %) and the median ratio of the second-order to the linear error was 0.054 (95th
    // percentile 0.14). So the check is the statement that holds: at most 1 % of the sections
    // reached are exceptions, and the median ratio is below 0.25.
    const checked = reached('[S7] symmetric sections, cm compared (K = M∞·θmax ≤ 0.4)');
    let exceptions = 0;
    const ratios: number[] = [];
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 1, max: 49 }), { minLength: 1, maxLength: 8 }),
        fc.array(fc.double({ min: 0.8, max: 1, noNaN: true }), { minLength: 8, maxLength: 8 }),
        fc.double({ min: 0.005, max: 0.02, noNaN: true }),
        fc.double({ min: 1.5, max: 3.5, noNaN: true }),
        fc.double({ min: 0.5, max: 3, noNaN: true }),
        fc.boolean(),
        (xs, factors, thickness, mach, alphaSize, negative) => {
          const alphaDeg = negative ? -alphaSize : alphaSize;
          const front = [...xs].sort((a, b) => a - b).map((i, k): [number, number] => [i / 100, thickness * itemAt(factors, k) * 4 * (i / 100) * (1 - i / 100)]);
          const mid: [number, number] = [0.5, thickness];
          const back = [...front].reverse().map(([x, y]): [number, number] => [1 - x, y]);
          const upper = [...front, mid, ...back];
          const pts: Pts = [[0, 0], ...upper, [1, 0], ...upper.map(([x, y]): [number, number] => [x, -y]).reverse()];
          const r = solveSection(input(pts, mach, alphaDeg, { waves: false }));
          if (r.status !== 'ok') return;
          const thetaMax = Math.max(...[...r.surfaces.upper, ...r.surfaces.lower].map((f) => Math.abs(f.thetaDeg) * (Math.PI / 180)));
          if (!(Math.abs(alphaDeg) > 0.5 && mach * thetaMax <= 0.4)) return;
          checked.hit();
          const lin = r.theories!.linear;
          const sec = r.theories!.secondOrder;
          const exact = r.coefficients!.cm;
          // Where the two errors meet they are equal to within the exact solution's own accuracy
          // (seed 866028690: both 0.00488183169934071, 5e-16 apart; the march solves its shocks
          // and fans to 1e-14 rad): a difference below 1e-12 is a tie, not an exception.
          const errSecond = Math.abs(sec.cm - exact);
          const errLinear = Math.abs(lin.cm - exact);
          if (errSecond > errLinear + 1e-12) exceptions += 1;
          ratios.push(errLinear > 0 ? errSecond / errLinear : errSecond > 1e-12 ? Infinity : 0);
        },
      ),
      { numRuns: 300 },
    );
    checked.expectAtLeast(150);
    expect(exceptions).toBeLessThanOrEqual(Math.floor(ratios.length / 100));
    ratios.sort((a, b) => a - b);
    expect(itemAt(ratios, Math.floor(ratios.length / 2))).toBeLessThan(0.25);
  }, 60_000);
});

/** √(Σ len·v²) over all facets. */
function cpNorm(r: SolveResult, v: (f: SolveResult['surfaces']['upper'][number]) => number): number {
  let s = 0;
  for (const f of [...r.surfaces.upper, ...r.surfaces.lower]) s += f.length * v(f) ** 2;
  return Math.sqrt(s);
}
