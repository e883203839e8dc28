import fc from 'fast-check';
import { reached } from '../../helpers/reached';
import { describe, expect, it } from 'vitest';
import { expectClose, expectCloseRel, expectPrinted } from '../../helpers/expectClose';
import { facetDeflections } from '../../../shared/solver/facetDeflections';
import { integrateLoads, integrateLoadsOfThree } from '../../../shared/solver/integrateLoads';
import { linearTheoryCp } from '../../../shared/solver/linearTheory';
import { marchSurface } from '../../../shared/solver/marchSurface';
import { matchTrailingEdge } from '../../../shared/solver/matchTrailingEdge';
import { maxThicknessRatio } from '../../../shared/solver/maxThicknessRatio';
import { prandtlMeyer, prandtlMeyerMax } from '../../../shared/solver/prandtlMeyer';
import { busemannCoefficients, secondOrderTheoryCp } from '../../../shared/solver/secondOrderTheory';
import { splitSurfaces } from '../../../shared/solver/splitSurfaces';
import { machFromNu, nu, rad, turnState } from './independentRelations';
import { diamond, lens } from './sections';
import { itemAt } from '../../../shared/util/invariant.ts';

describe('splitSurfaces', () => {
  it('splitSurfaces finds nose (min x), tail (max x), chord, and the upper chain over the top for either vertex order', () => {
    const cw = diamond(0.1, 0.4); // nose, top, tail, bottom: clockwise
    const a = splitSurfaces(cw);
    expect([a.noseIndex, a.tailIndex, a.chord]).toEqual([0, 2, 1]);
    expect(a.upper.vertices).toEqual([0, 1, 2]);
    expect(a.lower.vertices).toEqual([0, 3, 2]);
    expect(a.upper.edges).toEqual([0, 1]);
    expect(a.lower.edges).toEqual([3, 2]);
    const ccw = [...cw].reverse(); // bottom, tail, top, nose
    const b = splitSurfaces(ccw);
    expect(b.upper.vertices).toEqual([3, 2, 1]);
    expect(b.lower.vertices).toEqual([3, 0, 1]);
    expect(b.upper.phi).toEqual(a.upper.phi);
    expect(b.lower.length).toEqual(a.lower.length);
  });

  it('splitSurfaces picks the nose (least x, then least y) and the tail (greatest x, then least y, not the nose) as the plain definitions do, ties in x included (fast-check)', () => {
    // The search is one pass over the points; this checks it against the definitions written
    // out plainly, on point lists whose x often tie (a grid of seven columns).
    const checked = reached('nose and tail searches');
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.tuple(fc.integer({ min: 0, max: 6 }), fc.integer({ min: -20, max: 20 })), {
          minLength: 3,
          maxLength: 14,
          selector: ([x, y]) => `${x},${y}`,
        }),
        (raw) => {
          const points = raw.map(([x, y]) => [x / 6, y / 20] as [number, number]);
          const s = splitSurfaces(points);
          if (s.bluntNose || s.bluntTail) return; // a vertical face moves the ends to its lowest vertex
          checked.hit();
          let nose = 0;
          points.forEach(([x, y], i) => {
            const [nx, ny] = itemAt(points, nose);
            if (x < nx || (x === nx && y < ny)) nose = i;
          });
          let tail = -1;
          points.forEach(([x, y], i) => {
            if (i === nose) return;
            if (tail < 0) tail = i;
            const [tx, ty] = itemAt(points, tail);
            if (x > tx || (x === tx && y < ty)) tail = i;
          });
          expect([s.noseIndex, s.tailIndex]).toEqual([nose, tail]);
          expect(s.chord).toBe(Math.max(...points.map((p) => p[0])) - Math.min(...points.map((p) => p[0])));
        },
      ),
      { numRuns: 600 },
    );
    checked.expectAtLeast(150);
  });

  it('splitSurfaces with every vertex on one vertical line: one blunt face at both ends, its lowest vertex the nose and the tail (degenerate)', () => {
    const s = splitSurfaces([
      [0, 0.2],
      [0, -0.1],
      [0, 0.5],
    ]);
    expect(s.chord).toBe(0);
    expect(s.bluntNose).toEqual([0, 1, 2]);
    expect(s.bluntTail).toEqual([0, 1, 2]);
    expect([s.noseIndex, s.tailIndex]).toEqual([1, 1]);
  });

  it('splitSurfaces gives facet angles atan2(dy, dx) and turns that add up to them (common practice)', () => {
    const pts = lens(9, 0.08, 0.03);
    const s = splitSurfaces(pts);
    for (const c of [s.upper, s.lower]) {
      for (let k = 0; k < c.phi.length; k++) {
        expectClose(itemAt(c.phi, k), Math.atan2(itemAt(c.ys, k + 1) - itemAt(c.ys, k), itemAt(c.xs, k + 1) - itemAt(c.xs, k)), 1e-15);
        if (k > 0) expectClose(itemAt(c.turn, k), itemAt(c.phi, k) - itemAt(c.phi, k - 1), 1e-15);
      }
    }
  });

  it('splitSurfaces reports a vertical nose face as bluntNose (an edge within 1e-9 rad of vertical)', () => {
    const s = splitSurfaces([[0, -0.1], [1, 0], [0, 0.1]]);
    expect(s.bluntNose).toEqual([0, 2]);
    expect(s.noseIndex).toBe(0); // the tied vertex of least y
    expect(s.bluntTail).toBeNull();
  });
});

describe('facetDeflections', () => {
  it('facetDeflections: θ = φ − α on the upper surface and α − φ on the lower; positive = compression', () => {
    const chain = { phi: [0.1, -0.05, -0.2], turn: [0, -0.15, -0.15] };
    const up = facetDeflections(chain, 0.02, 'upper');
    const lo = facetDeflections(chain, 0.02, 'lower');
    [0.08, -0.07, -0.22].forEach((v, k) => expectClose(itemAt(up, k), v, 1e-15));
    [-0.08, 0.07, 0.22].forEach((v, k) => expectClose(itemAt(lo, k), v, 1e-15));
  });

  it('facetDeflections never jumps by 2π when a facet direction crosses ±π (wrapped turns)', () => {
    const chain = { phi: [0.3, 3.1, -3.1], turn: [0, 2.8, 2 * Math.PI - 6.2] };
    const up = facetDeflections(chain, 0, 'upper');
    expectClose(itemAt(up, 2) - itemAt(up, 1), 2 * Math.PI - 6.2, 1e-12);
  });
});

describe('marchSurface', () => {
  it('marchSurface chains one wave per vertex, as the textbook relations do by hand (shock, fan, none, shock)', () => {
    const theta = [rad(6), rad(-4), rad(-4), rad(2)];
    const m = marchSurface(theta, 2.4, 1.4);
    expect(m.limit).toBeNull();
    expect(m.wave).toEqual(['shock', 'fan', 'none', 'shock']);
    let mach = 2.4;
    let p = 1;
    let prev = 0;
    theta.forEach((t, k) => {
      const s = turnState(mach, t - prev, 1.4);
      mach = s.m2;
      p *= s.pRatio;
      prev = t;
      expectClose(itemAt(m.mach, k), mach, 1e-9);
      expectClose(itemAt(m.pRatio, k), p, 1e-10);
    });
  });

  it('marchSurface with a zero first deflection is a Mach line and keeps the free stream', () => {
    const m = marchSurface([0, 0], 3, 1.4);
    expect(m.wave).toEqual(['mach', 'none']);
    expect(m.mach).toEqual([3, 3]);
    expect(m.pRatio).toEqual([1, 1]);
  });

  it('marchSurface stops at the first failing vertex: detached (with θmax), later facets unsolved', () => {
    const m = marchSurface([rad(5), rad(30), rad(0)], 2, 1.4);
    expect(m.solved).toBe(1);
    expect(m.limit?.status).toBe('detached');
    expect(m.limit?.facet).toBe(1);
    expectClose(m.limit!.turn, rad(25), 1e-15);
    expect(m.limit!.thetaMax!).toBeLessThan(rad(25));
  });

  it('marchSurface reports vacuum when an expansion would pass ν_max', () => {
    const m = marchSurface([-(prandtlMeyerMax(1.4) - prandtlMeyer(2, 1.4) + 0.01)], 2, 1.4);
    expect(m.limit?.status).toBe('vacuum');
    expect(m.limit!.nu!).toBeGreaterThan(m.limit!.nuMax!);
  });

  it('marchSurface along 100 small expansions keeps ν equal to ν∞ plus the total turn (no drift)', () => {
    const theta = Array.from({ length: 100 }, (_, k) => -0.004 * (k + 1));
    const m = marchSurface(theta, 2, 1.4);
    expectClose(prandtlMeyer(itemAt(m.mach, 99), 1.4), prandtlMeyer(2, 1.4) + 0.4, 1e-13);
    // Isentropic all the way: p/p∞ from the end Mach alone.
    const x = (mm: number) => 1 + 0.2 * mm * mm;
    expectClose(itemAt(m.pRatio, 99), (x(2) / x(itemAt(m.mach, 99))) ** 3.5, 1e-13);
  });
});

describe('marchSurface fan steps (the march inverts ν(M) from the previous fan)', () => {
  // Each fan's Mach number is found from the state before it (Taylor start with coefficients
  // carried from the previous fan, the residual by the atan subtraction formula, one checked
  // Newton step; anything else goes through machParameterAfterExpansion). These check it
  // against the tables and an independent bisection on the textbook ν(M).
  const fans = (machInf: number, totalTurn: number, facets: number) =>
    Array.from({ length: facets + 1 }, (_, k) => (k === 0 ? 0 : -(totalTurn * k) / facets));

  it.each([
    ['26.380', '2.000'],
    ['49.757', '3.000'],
    ['76.920', '5.000'],
    ['102.316', '10.000'],
  ])('marchSurface from M 1.5 (ν 11.905°) through 200 equal fans to ν = %s° reaches M %s (NACA Report 1135, Table I, γ = 1.4, from memory)', (nuDeg, machPrinted) => {
    const theta = fans(1.5, rad(Number(nuDeg)) - prandtlMeyer(1.5, 1.4), 200);
    const m = marchSurface(theta, 1.5, 1.4);
    expect(m.limit).toBeNull();
    expectPrinted(itemAt(m.mach, 200), machPrinted);
  });

  it('marchSurface fan states match bisection on the textbook ν(M) across M 1–10 and γ 1.1–1.67, fine and coarse facets (fast-check)', () => {
    const checked = reached('fan sequences');
    fc.assert(
      fc.property(
        fc.double({ min: 1.1, max: 5 / 3, noNaN: true }),
        fc.double({ min: 1.01, max: 9, noNaN: true }),
        fc.double({ min: 0.01, max: 1, noNaN: true }),
        fc.constantFrom(1, 2, 5, 30, 100, 400),
        (g, machInf, fraction, facets) => {
          // A total turn that ends between machInf and M 10.
          const total = fraction * (nu(10, g) - nu(machInf, g));
          const theta = fans(machInf, total, facets);
          const m = marchSurface(theta, machInf, g);
          checked.hit();
          expect(m.limit).toBeNull();
          // Each fan is solved to 1e-14·max(1, ν) from the state before it, so the error may
          // add up along the march; the textbook closed form itself loses ~1e-13 to
          // cancellation at small γ. Hence 2e-13 + 2e-14 per fan so far (measured: at most
          // 0.4 of it over 3,000 sequences, the same before and after the fan step changed).
          const nuInf = nu(machInf, g);
          for (let k = 1; k <= facets; k++) {
            const target = nuInf - itemAt(theta, k);
            expectClose(nu(itemAt(m.mach, k), g), target, (2e-13 + 2e-14 * k) * Math.max(1, target));
          }
          const last = itemAt(m.mach, facets);
          expectCloseRel(last, machFromNu(nuInf + total, g), 1e-12 + 5e-14 * facets);
        },
      ),
      { numRuns: 300 },
    );
    checked.expectAtLeast(300);
  });

  it('marchSurface fans after a shock start afresh from the state behind it (shock, 50 fans, shock, 50 fans)', () => {
    const theta = [rad(8), ...Array.from({ length: 50 }, (_, k) => rad(8) - 0.003 * (k + 1)), rad(5), ...Array.from({ length: 50 }, (_, k) => rad(5) - 0.003 * (k + 1))];
    const m = marchSurface(theta, 3, 1.4);
    expect(m.limit).toBeNull();
    for (const [shockAt, end] of [[0, 50], [51, 101]] as const) {
      const nuAfterShock = nu(itemAt(m.mach, shockAt), 1.4);
      expectClose(nu(itemAt(m.mach, end), 1.4), nuAfterShock + 0.15, 1e-13);
      const x = (mm: number) => 1 + 0.2 * mm * mm;
      expectClose(itemAt(m.pRatio, end) / itemAt(m.pRatio, shockAt), (x(itemAt(m.mach, shockAt)) / x(itemAt(m.mach, end))) ** 3.5, 1e-12);
    }
  });
});

describe('matchTrailingEdge', () => {
  /** The two streams reaching a trailing edge: Mach 1.3–6 each, the upper's pressure 0.3–3 times the lower's, directions a few degrees either way. */
  const tailStreams = fc
    .tuple(
      fc.double({ min: 1.3, max: 6, noNaN: true }),
      fc.double({ min: 1.3, max: 6, noNaN: true }),
      fc.double({ min: 0.3, max: 3, noNaN: true }),
      fc.double({ min: -0.15, max: 0.05, noNaN: true }),
      fc.double({ min: -0.05, max: 0.15, noNaN: true }),
    )
    .map(([mu, ml, pr, du, dl]) => [{ mach: mu, pRatio: pr, direction: du }, { mach: ml, pRatio: 1, direction: dl }] as const);

  it('matchTrailingEdge balances the pressures found by plain bisection on the textbook relations (independent)', () => {
    const checked = reached('matched trailing edges');
    fc.assert(
      fc.property(tailStreams, ([up, lo]) => {
        const r = matchTrailingEdge(up, lo, 1.4);
        if (r.status !== 'matched') return;
        checked.hit();
        const pu = up.pRatio * turnState(up.mach, r.slip - up.direction, 1.4).pRatio;
        const pl = turnState(lo.mach, lo.direction - r.slip, 1.4).pRatio;
        expectClose(pu / pl, 1, 1e-9);
        expectClose(r.upper.pRatioAfter, pu, 1e-9 * pu);
        expectClose(r.lower.pRatioAfter, pl, 1e-9 * pl);
      }),
      { numRuns: 300 },
    );
    checked.expectAtLeast(250); // about 94 % of these stream pairs match
  });

  it('matchTrailingEdge finds the slip direction to TAIL_ROOT_TOLERANCE_RAD: the pressure mismatch of the textbook relations changes sign across slip ± 1e-13 (independent)', () => {
    const checked = reached('matched trailing edges');
    // ln(p_u/p_l) of the two streams turned to the direction δ, by the plain relations.
    const mismatch = (up: { mach: number; pRatio: number; direction: number }, lo: { mach: number; direction: number }, delta: number) =>
      Math.log(up.pRatio * turnState(up.mach, delta - up.direction, 1.4).pRatio) - Math.log(turnState(lo.mach, lo.direction - delta, 1.4).pRatio);
    fc.assert(
      fc.property(tailStreams, ([up, lo]) => {
        const r = matchTrailingEdge(up, lo, 1.4);
        if (r.status !== 'matched') return;
        checked.hit();
        // ln p_u rises and ln p_l falls with δ: the root lies where the mismatch turns positive.
        expect(mismatch(up, lo, r.slip - 1e-13)).toBeLessThan(0);
        expect(mismatch(up, lo, r.slip + 1e-13)).toBeGreaterThan(0);
      }),
      { numRuns: 200 },
    );
    checked.expectAtLeast(160);
  });

  it('matchTrailingEdge with mirror-image streams puts the slip line on the bisector, with equal shocks', () => {
    const r = matchTrailingEdge({ mach: 2.2, pRatio: 0.7, direction: -0.1 }, { mach: 2.2, pRatio: 0.7, direction: 0.1 }, 1.4);
    if (r.status !== 'matched') throw new Error('unmatched');
    expectClose(r.slip, 0, 1e-13);
    expect(r.upper.kind).toBe('shock');
    expectClose(r.upper.deflection, 0.1, 1e-13);
    expectClose(r.upper.beta, r.lower.beta, 1e-13);
  });

  it('matchTrailingEdge returns unmatched, with the reason, when a stream would need more than θmax', () => {
    const r = matchTrailingEdge({ mach: 1.6, pRatio: 1, direction: -0.6 }, { mach: 1.6, pRatio: 1, direction: 0.6 }, 1.4);
    expect(r.status).toBe('unmatched');
    if (r.status === 'unmatched') expect(r.reason).toMatch(/maximum deflection|too large an angle/);
  });

  it('matchTrailingEdge with a strong pressure difference expands the high-pressure stream through a fan', () => {
    const r = matchTrailingEdge({ mach: 2, pRatio: 3, direction: 0 }, { mach: 2, pRatio: 1, direction: 0 }, 1.4);
    if (r.status !== 'matched') throw new Error('unmatched');
    expect(r.upper.kind).toBe('fan');
    expect(r.lower.kind).toBe('shock');
    expect(r.slip).toBeLessThan(0);
  });
});

describe('integrateLoads', () => {
  const sq = { xs: [0, 0.5, 1], ys: [0, 0.05, 0] };
  const sqLow = { xs: [0, 0.5, 1], ys: [0, -0.05, 0] };

  it('integrateLoads of a uniform Cp over a closed section is zero force and zero moment (divergence theorem)', () => {
    const r = integrateLoads(sq, [0.7, 0.7], sqLow, [0.7, 0.7], rad(7), [0.3, 0.2], [0, 0], 1);
    for (const v of [r.total.cl, r.total.cd, r.total.cm, r.total.cn, r.total.ca]) expectClose(v, 0, 1e-15);
  });

  it('integrateLoads: pressure on the lower front facet lifts and drags; its drag below c/4 pitches the nose down', () => {
    const r = integrateLoads(sq, [0, 0], sqLow, [1, 0], 0, [0.25, 0], [0, 0], 1);
    // Force on the lower front facet: −Cp·n·len = −(−0.05, −0.5) = (0.05, 0.5) at (0.25, −0.025).
    expectClose(r.total.cn, 0.5, 1e-15);
    expectClose(r.total.ca, 0.05, 1e-15);
    expectClose(r.total.cl, 0.5, 1e-15);
    expectClose(r.total.cd, 0.05, 1e-15);
    // moment about (0.25, 0): r × F = 0·0.5 − (−0.025)·0.05 = +0.00125 (counter-clockwise,
    // nose down) → cm = −0.00125
    expectClose(r.total.cm, -0.00125, 1e-15);
    // the line of action (0.25, −0.025) + t·(0.05, 0.5) crosses y = 0 at x = 0.2525
    expectClose(r.total.xcpOverC!, 0.25 + 0.025 * (0.05 / 0.5), 1e-15);
    expectClose(r.lower.cl, 0.5, 1e-15);
    expectClose(r.upper.cl, 0, 1e-15);
  });

  it('integrateLoads rotates into wind axes: cl = cn cos α − ca sin α, cd = ca cos α + cn sin α', () => {
    const a = rad(12);
    const r = integrateLoads(sq, [-0.3, -0.4], sqLow, [0.6, 0.2], a, [0.25, 0], [0, 0], 1);
    expectClose(r.total.cl, r.total.cn * Math.cos(a) - r.total.ca * Math.sin(a), 1e-15);
    expectClose(r.total.cd, r.total.ca * Math.cos(a) + r.total.cn * Math.sin(a), 1e-15);
    expectClose(r.total.liftToDrag!, r.total.cl / r.total.cd, 1e-12);
  });

  it('integrateLoads scales with the chord: coefficients of a section twice as large are the same', () => {
    const big = { xs: sq.xs.map((x) => 2 * x), ys: sq.ys.map((y) => 2 * y) };
    const bigLow = { xs: sqLow.xs.map((x) => 2 * x), ys: sqLow.ys.map((y) => 2 * y) };
    const a = integrateLoads(sq, [0.1, -0.2], sqLow, [0.3, 0.05], 0.05, [0.25, 0], [0, 0], 1);
    const b = integrateLoads(big, [0.1, -0.2], bigLow, [0.3, 0.05], 0.05, [0.5, 0], [0, 0], 2);
    expectClose(b.total.cl, a.total.cl, 1e-15);
    expectClose(b.total.cm, a.total.cm, 1e-15);
  });

  it('integrateLoads with no normal force reports xcpOverC null, and with no drag liftToDrag null (edge cases)', () => {
    const r = integrateLoads(sq, [0, 0], sqLow, [0, 0], 0, [0.25, 0], [0, 0], 1);
    expect(r.total.xcpOverC).toBeNull();
    expect(r.total.liftToDrag).toBeNull();
  });

  it('integrateLoadsOfThree gives the three integrateLoads results bit for bit, for random sections and Cp (fast-check)', () => {
    // The core solve integrates its exact, linear and second-order Cp in one pass; the numbers
    // must be those of three separate integrations (the same operations in the same order).
    const checked = reached('three Cp sets in one pass');
    const coordinate = fc.double({ min: -2, max: 2, noNaN: true });
    const cp = fc.double({ min: -3, max: 3, noNaN: true });
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }),
        fc.integer({ min: 1, max: 12 }),
        fc.array(coordinate, { minLength: 52, maxLength: 52 }),
        fc.array(cp, { minLength: 72, maxLength: 72 }),
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        (mu, ml, xy, cps, alpha) => {
          const chain = (m: number, at: number) => ({ xs: xy.slice(at, at + m + 1), ys: xy.slice(at + 13, at + 14 + m) });
          const up = chain(mu, 0);
          const low = chain(ml, 26);
          const sets = (m: number, at: number) => [cps.slice(at, at + m), cps.slice(at + 12, at + 12 + m), cps.slice(at + 24, at + 24 + m)] as const;
          const cpU = sets(mu, 0);
          const cpL = sets(ml, 36);
          const together = integrateLoadsOfThree(up, cpU, low, cpL, alpha, [0.3, 0.01], [0, 0], 1.7);
          checked.hit();
          for (let i = 0; i < 3; i++) {
            expect(together[i]).toStrictEqual(integrateLoads(up, itemAt(cpU, i), low, itemAt(cpL, i), alpha, [0.3, 0.01], [0, 0], 1.7));
          }
        },
      ),
      { numRuns: 300 },
    );
    checked.expectAtLeast(300);
  });
});

describe('thin-airfoil theories', () => {
  it('linearTheoryCp(θ=2°, M=2) = 2θ/√3 (Ackeret)', () => {
    expectClose(linearTheoryCp(rad(2), 2), (2 * rad(2)) / Math.sqrt(3), 1e-16);
  });

  it('busemannCoefficients(M=2, γ=1.4): C1 = 1.155, C2 = 1.467 (Busemann second-order table, from memory)', () => {
    const { c1, c2 } = busemannCoefficients(2, 1.4);
    expectClose(c1, 1.155, 5e-4);
    expectClose(c2, 1.467, 5e-4);
  });

  it('busemannCoefficients(M→∞) → C1 → 0, C2 → (γ+1)/2 (limit)', () => {
    const { c1, c2 } = busemannCoefficients(1e6, 1.4);
    expectClose(c1, 0, 1e-5);
    expectClose(c2, 1.2, 1e-6);
  });

  it('secondOrderTheoryCp matches the exact oblique-shock and fan Cp to O(θ³) (Busemann expansion check)', () => {
    for (const t of [0.02, 0.01, 0.005]) {
      for (const sign of [1, -1]) {
        const th = sign * t;
        const exact = (turnState(2.5, th, 1.4).pRatio - 1) / (0.7 * 2.5 * 2.5);
        expect(Math.abs(secondOrderTheoryCp(th, 2.5, 1.4) - exact)).toBeLessThan(3 * t ** 3);
      }
    }
  });
});

describe('maxThicknessRatio', () => {
  it('maxThicknessRatio of a diamond t/c = 0.1 is 0.1; of a lens it is the thickness at the widest point', () => {
    const s = splitSurfaces(diamond(0.1, 0.3));
    expectClose(maxThicknessRatio(s.upper, s.lower), 0.1, 1e-15);
    const l = splitSurfaces(lens(20, 0.06, 0.02));
    expectClose(maxThicknessRatio(l.upper, l.lower), 0.06, 1e-12);
  });

  it('maxThicknessRatio interpolates the other surface between its vertices', () => {
    // Upper vertex at x 0.25, lower at 0.75: at x 0.25 the lower surface is at −0.05·0.25/0.75.
    const s = splitSurfaces([[0, 0], [0.25, 0.1], [1, 0], [0.75, -0.05]]);
    expectClose(maxThicknessRatio(s.upper, s.lower), 0.1 + 0.05 / 3, 1e-15);
  });

  it('maxThicknessRatio is measured normal to the chord line: a 4 % double wedge drawn nose-down 5.7° is 4 % thick', () => {
    // Rotating the section about its nose rotates the chord line with it; vertical extent over
    // max x − min x would read (0.04·cos r + sin r)/cos r ≈ 14 % here.
    const r = (5.7 * Math.PI) / 180;
    const rot = (p: [number, number]): [number, number] => [p[0] * Math.cos(r) + p[1] * Math.sin(r), -p[0] * Math.sin(r) + p[1] * Math.cos(r)];
    const s = splitSurfaces(diamond(0.04).map(rot));
    expectClose(maxThicknessRatio(s.upper, s.lower), 0.04, 1e-15);
  });

  it('maxThicknessRatio of a section whose surface doubles back uses the extent at each vertex', () => {
    const s = splitSurfaces([[0, 0], [0.6, 0.1], [0.4, 0.2], [1, 0], [0.5, -0.1]]);
    expectClose(maxThicknessRatio(s.upper, s.lower), 0.2 + 0.1 * (0.4 / 0.5), 1e-12);
  });
});
