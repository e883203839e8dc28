import { describe, expect, it } from 'vitest';
import { expectClose } from '../../helpers/expectClose';
import { solveSection } from '../../../shared/solver/solveSection';
import type { SolveResult } from '../../../shared/solver/types';
import { cpFromPressure, fanState, rad, shockState, turnState } from './independentRelations';
import { badValues, diamond, input, lens, wedgeNose, type Pts } from './sections';
import { firstItems, itemAt } from '../../../shared/util/invariant.ts';

function ok(r: SolveResult) {
  if (r.status !== 'ok' || !r.coefficients || !r.theories) throw new Error(`status ${r.status}: ${JSON.stringify(r.limits)}`);
  return { c: r.coefficients, t: r.theories };
}

/**
 * Coefficients of a four-facet section from facet Cp values, computed here by hand-written
 * force sums (the test's own integration, independent of integrateLoads).
 */
function fourFacetLoads(pts: Pts, cp: { uf: number; ur: number; lf: number; lr: number }, alphaDeg: number, mp: [number, number]) {
  const [n, u, t, l] = firstItems(pts, 4);
  const facets = [
    { a: n, b: u, cp: cp.uf, out: 1 },
    { a: u, b: t, cp: cp.ur, out: 1 },
    { a: n, b: l, cp: cp.lf, out: -1 },
    { a: l, b: t, cp: cp.lr, out: -1 },
  ];
  let fx = 0;
  let fy = 0;
  let mz = 0;
  for (const f of facets) {
    const dx = f.b[0] - f.a[0];
    const dy = f.b[1] - f.a[1];
    // outward normal × length: (−dy, dx) on top, (dy, −dx) underneath
    const nx = f.out * -dy;
    const ny = f.out * dx;
    const px = -f.cp * nx;
    const py = -f.cp * ny;
    const xm = (f.a[0] + f.b[0]) / 2 - mp[0];
    const ym = (f.a[1] + f.b[1]) / 2 - mp[1];
    fx += px;
    fy += py;
    mz += xm * py - ym * px;
  }
  const a = rad(alphaDeg);
  return { cl: fy * Math.cos(a) - fx * Math.sin(a), cd: fx * Math.cos(a) + fy * Math.sin(a), cm: -mz };
}

describe('solveSection worked cases (checked against the textbook relations solved independently in the test)', () => {
  it('diamond t/c = 0.10 at M 2, α 0: front shocks, rear fans, cl = 0, cd from the pressures (shock-expansion by hand)', () => {
    const pts = diamond(0.1);
    const r = solveSection(input(pts, 2, 0));
    const { c } = ok(r);
    const eps = Math.atan(0.1); // half angle of each facet
    const front = shockState(2, eps, 1.4); // weak shock by bisection on θ-β-M
    const rear = fanState(front.m2, 2 * eps, 1.4); // Prandtl-Meyer by bisection on ν(M)
    const cpF = cpFromPressure(front.pRatio, 2, 1.4);
    const cpR = cpFromPressure(front.pRatio * rear.pRatio, 2, 1.4);
    const hand = fourFacetLoads(pts, { uf: cpF, ur: cpR, lf: cpF, lr: cpR }, 0, [0.25, 0]);
    expectClose(c.cl, 0, 1e-14);
    expectClose(c.cd, hand.cd, 1e-10);
    expectClose(c.cd, 0.1 * (cpF - cpR), 1e-10); // cd = t/c·(Cp_front − Cp_rear) for this diamond
    expectClose(c.cm, 0, 1e-14);
    expectClose(itemAt(r.surfaces.upper, 0).cp as number, cpF, 1e-10);
    expectClose(itemAt(r.surfaces.upper, 1).cp as number, cpR, 1e-10);
    expectClose(itemAt(r.surfaces.upper, 0).mach as number, front.m2, 1e-9);
    expectClose(itemAt(r.surfaces.upper, 1).mach as number, rear.m2, 1e-8);
    expect(r.surfaces.upper.map((f) => f.wave)).toEqual(['shock', 'fan']);
  });

  it('diamond t/c = 0.10 at M 2, α 2°: lower surface compressed harder, cl, cd, cm by hand', () => {
    const pts = diamond(0.1);
    const r = solveSection(input(pts, 2, 2));
    const { c } = ok(r);
    const eps = Math.atan(0.1);
    const a = rad(2);
    const uf = shockState(2, eps - a, 1.4);
    const ur = fanState(uf.m2, 2 * eps, 1.4);
    const lf = shockState(2, eps + a, 1.4);
    const lr = fanState(lf.m2, 2 * eps, 1.4);
    const cp = {
      uf: cpFromPressure(uf.pRatio, 2, 1.4),
      ur: cpFromPressure(uf.pRatio * ur.pRatio, 2, 1.4),
      lf: cpFromPressure(lf.pRatio, 2, 1.4),
      lr: cpFromPressure(lf.pRatio * lr.pRatio, 2, 1.4),
    };
    const hand = fourFacetLoads(pts, cp, 2, [0.25, 0]);
    expectClose(c.cl, hand.cl, 1e-10);
    expectClose(c.cd, hand.cd, 1e-10);
    expectClose(c.cm, hand.cm, 1e-10);
    expect(c.cl).toBeGreaterThan(0);
    expect(itemAt(r.surfaces.lower, 0).cp as number).toBeGreaterThan(itemAt(r.surfaces.upper, 0).cp as number);
    expectClose(c.liftToDrag as number, c.cl / c.cd, 1e-12);
    // Linear theory on the same facets: Cp = 2θ/√(M²−1), integrated the same way.
    const b = Math.sqrt(3);
    const lin = fourFacetLoads(pts, { uf: (2 * (eps - a)) / b, ur: (2 * (-eps - a)) / b, lf: (2 * (eps + a)) / b, lr: (2 * (-eps + a)) / b }, 2, [0.25, 0]);
    expectClose(r.theories!.linear.cl, lin.cl, 1e-12);
    expectClose(r.theories!.linear.cd, lin.cd, 1e-12);
    expectClose(r.theories!.linear.cm, lin.cm, 1e-12);
    expectClose(r.theories!.linear.difference.cl as number, (100 * (lin.cl - c.cl)) / Math.abs(c.cl), 1e-8);
  });

  it('[S8] thin diamond (t/c 1e-7) at M 3, α 5° is the flat plate: shock below, fan above (closed form)', () => {
    const r = solveSection(input(diamond(1e-7), 3, 5));
    const { c, t } = ok(r);
    const a = rad(5);
    const cpLower = cpFromPressure(shockState(3, a, 1.4).pRatio, 3, 1.4);
    const cpUpper = cpFromPressure(fanState(3, a, 1.4).pRatio, 3, 1.4);
    // Flat plate: normal force (Cp_l − Cp_u)·c along the plate's normal.
    expectClose(c.cl, (cpLower - cpUpper) * Math.cos(a), 1e-6);
    expectClose(c.cd, (cpLower - cpUpper) * Math.sin(a), 1e-6);
    // Centre of pressure at mid-chord, aft of the quarter-chord moment point: nose down.
    expectClose(c.cm, -(cpLower - cpUpper) * 0.25, 1e-6);
    expectClose(c.xcpOverC as number, 0.5, 1e-6);
    // Linear theory with exact projection: cl = (4α/√(M²−1))·cos α.
    expectClose(t.linear.cl, ((4 * a) / Math.sqrt(8)) * Math.cos(a), 1e-6);
    expectClose(t.linear.cd, ((4 * a) / Math.sqrt(8)) * Math.sin(a), 1e-6);
  });

  it('wedge with a 6° upper and 3° lower nose at M 2.5, α −1°: per-facet states follow one wave each (hand chain)', () => {
    const pts = wedgeNose(6, 3);
    const r = solveSection(input(pts, 2.5, -1));
    ok(r);
    const a = rad(-1);
    const phiU1 = Math.atan2(itemAt(pts, 1)[1], itemAt(pts, 1)[0]);
    const phiU2 = Math.atan2(-itemAt(pts, 1)[1], 0.5);
    const phiL1 = Math.atan2(itemAt(pts, 3)[1], itemAt(pts, 3)[0]);
    const phiL2 = Math.atan2(-itemAt(pts, 3)[1], 0.5);
    const u1 = turnState(2.5, phiU1 - a, 1.4);
    const u2 = turnState(u1.m2, phiU2 - phiU1, 1.4);
    const l1 = turnState(2.5, a - phiL1, 1.4);
    const l2 = turnState(l1.m2, -(phiL2 - phiL1), 1.4);
    expectClose(itemAt(r.surfaces.upper, 0).pRatio as number, u1.pRatio, 1e-10);
    expectClose(itemAt(r.surfaces.upper, 1).pRatio as number, u1.pRatio * u2.pRatio, 1e-10);
    expectClose(itemAt(r.surfaces.lower, 0).pRatio as number, l1.pRatio, 1e-10);
    expectClose(itemAt(r.surfaces.lower, 1).pRatio as number, l1.pRatio * l2.pRatio, 1e-10);
    expectClose(itemAt(r.surfaces.upper, 0).thetaDeg, 6 + 1, 1e-12);
    expectClose(itemAt(r.surfaces.lower, 0).thetaDeg, 3 - 1, 1e-12);
  });

  it('facet records: every facet present nose → tail with input edge indices and shared vertex points', () => {
    const pts = lens(6, 0.05, 0.01);
    const r = solveSection(input(pts, 2, 1));
    ok(r);
    expect(r.surfaces.upper.length + r.surfaces.lower.length).toBe(pts.length);
    const edges = [...r.surfaces.upper, ...r.surfaces.lower].map((f) => f.index).sort((a, b) => a - b);
    expect(edges).toEqual(pts.map((_, i) => i));
    for (const s of [r.surfaces.upper, r.surfaces.lower]) {
      expect(itemAt(s, 0).from).toEqual(r.geometry.nose);
      expect(itemAt(s, s.length - 1).to).toEqual(r.geometry.tail);
      for (let k = 1; k < s.length; k++) expect(itemAt(s, k).from).toEqual(itemAt(s, k - 1).to);
      for (const f of s) {
        expect(f.to[0]).toBeGreaterThan(f.from[0]);
        expectClose(f.xMidOverC, (f.from[0] + f.to[0]) / 2, 1e-15);
        expectClose(f.tRatio! * f.rhoRatio!, f.pRatio!, 1e-12);
      }
    }
    expect(r.geometry.upper[0]).toBe(r.geometry.noseIndex);
    expect(r.geometry.upper.at(-1)).toBe(r.geometry.tailIndex);
    expectClose(r.geometry.maxThicknessRatio, 0.05, 2e-3);
    expectClose(r.geometry.chord, 1, 0);
  });

  it('[S10] p0/p0∞ drops only across shocks and T0 is kept (each facet state follows its wave)', () => {
    const r = solveSection(input(lens(10, 0.06, 0.0), 3, 4));
    ok(r);
    for (const s of [r.surfaces.upper, r.surfaces.lower]) {
      for (let k = 1; k < s.length; k++) {
        if (itemAt(s, k).wave === 'fan' || itemAt(s, k).wave === 'none') expectClose(itemAt(s, k).p0Ratio!, itemAt(s, k - 1).p0Ratio!, 1e-15);
        else expect(itemAt(s, k).p0Ratio!).toBeLessThan(itemAt(s, k - 1).p0Ratio!);
        // T/T∞ = X(M∞)/X(M): the stagnation temperature is the free stream's.
        const x = (m: number) => 1 + 0.2 * m * m;
        expectClose(itemAt(s, k).tRatio!, x(3) / x(itemAt(s, k).mach!), 1e-12);
      }
    }
  });

  it('cm about another moment point follows the transfer rule cm_P = cm_Q + (x_P − x_Q)·cn/c (statics)', () => {
    const pts = lens(8, 0.04, 0.02);
    const a = ok(solveSection(input(pts, 2.2, 3))).c;
    const b = ok(solveSection(input(pts, 2.2, 3, { momentPoint: [0.6, 0] }))).c;
    expectClose(b.cm, a.cm + (0.6 - 0.25) * a.cn, 1e-13);
    expectClose(b.cl, a.cl, 0);
    // and the centre of pressure does not depend on the moment point
    expectClose(b.xcpOverC as number, a.xcpOverC as number, 1e-12);
  });

  it('bySurface sums to the total (exact)', () => {
    const r = solveSection(input(lens(8, 0.04, 0.02), 2.2, 3));
    const { c } = ok(r);
    expectClose(r.bySurface!.upper.cl + r.bySurface!.lower.cl, c.cl, 1e-14);
    expectClose(r.bySurface!.upper.cd + r.bySurface!.lower.cd, c.cd, 1e-14);
    expectClose(r.bySurface!.upper.cm + r.bySurface!.lower.cm, c.cm, 1e-14);
  });
});

describe('solveSection limits [S6] [S13]', () => {
  it('nose half-angle 25° at M 2 detaches on both surfaces (θmax 22.97°): status detached, with numbers', () => {
    const r = solveSection(input(wedgeNose(25, 25), 2, 0));
    expect(r.status).toBe('detached');
    expect(r.coefficients).toBeNull();
    expect(r.limits).toHaveLength(2);
    const upper = r.limits.find((l) => l.surface === 'upper')!;
    expect(upper.vertex).toBe(0);
    expect(upper.at).toEqual([0, 0]);
    expectClose(upper.thetaDeg!, 25, 1e-9);
    expectClose(upper.thetaMaxDeg!, 22.97, 0.01);
    expect(upper.message).toBe(
      'Nose shock detaches on the upper surface: deflection 25.0° exceeds the maximum 23.0° at M 2.00.',
    );
    expect(r.surfaces.upper.every((f) => !f.solved && f.cp === null && f.mach === null)).toBe(true);
    expect(r.theories).not.toBeNull();
    expect(r.theories!.linear.difference).toEqual({ cl: null, cd: null, cm: null });
    expect(r.trailingEdge.slipDeg).toBeNull();
    expect(r.waves.filter((w) => w.vertex === 0)).toHaveLength(0);
  });

  it('nose deflection 22.85° at M 2 (between sonic 22.73° and max 22.97°) is subsonic at the nose', () => {
    const r = solveSection(input(wedgeNose(22.85, 5), 2, 0));
    expect(r.status).toBe('subsonic');
    expect(r.limits).toHaveLength(1);
    const l = itemAt(r.limits, 0);
    expect(l.surface).toBe('upper');
    expect(l.machBehind!).toBeLessThan(1);
    expect(l.message).toMatch(/^Flow behind the nose shock on the upper surface is subsonic \(M 0\.\d\d\): deflection 22\.9° lies between the sonic 22\.7° and the maximum 23\.0° at M 2\.00\.$/);
    // the other surface is still marched in full
    expect(r.surfaces.lower.every((f) => f.solved)).toBe(true);
  });

  it('status precedence detached > subsonic when the surfaces fail differently (upper detached, lower subsonic)', () => {
    const r = solveSection(input(wedgeNose(25, 22.85), 2, 0));
    expect(r.status).toBe('detached');
    expect(r.limits.map((l) => l.status).sort()).toEqual(['detached', 'subsonic']);
  });

  it('expansion past ν_max (γ 5/3, M 10, a 30° convex corner) is vacuum at that vertex, with p = 0 from there on', () => {
    // Triangle: 5° nose shock on top, then a 30° convex corner; ν(10) = 73° of a 90° limit.
    const top: [number, number] = [0.5, 0.5 * Math.tan(rad(5))];
    const tail: [number, number] = [1, top[1] - 0.5 * Math.tan(rad(25))];
    const pts: [number, number][] = [[0, 0], top, tail];
    const r = solveSection(input(pts, 10, 0, { gamma: 5 / 3 }));
    expect(r.status).toBe('vacuum');
    const l = itemAt(r.limits, 0);
    expect(l.surface).toBe('upper');
    expect(l.vertex).toBe(1);
    expectClose(l.nuMaxDeg!, 90, 1e-9);
    expect(l.nuDeg!).toBeGreaterThan(90);
    expect(l.message).toMatch(
      /^Expansion at vertex 1 on the upper surface reaches the Prandtl-Meyer limit: turn 30\.0° would need ν \d+\.\d°, beyond the maximum 90\.0° for γ 1\.67; the pressure is zero from there to the trailing edge\.$/,
    );
    expect(itemAt(r.surfaces.upper, 0).solved).toBe(true);
    const v = itemAt(r.surfaces.upper, 1);
    expect(v.solved).toBe(false);
    expect(v.vacuum).toBe(true);
    expect(v.pRatio).toBe(0);
    // Cp at p = 0 is −2/(γM²) (definition of Cp with p = 0).
    expectClose(v.cp!, -2 / ((5 / 3) * 100), 1e-15);
    expect(r.warnings.some((w) => /zero pressure \(p = 0, Cp = -0\.01200\) on the last facet of the upper surface/.test(w))).toBe(true);
    // The coefficients are given, from a hand integration of the facet pressures: force/q∞ =
    // −Σ Cp·n_out·length; the triangle runs clockwise, so n_out·length = (−dy, dx) along
    // nose → top → tail and (dy, −dx) along nose → tail below.
    const c = r.coefficients!;
    expect(c).not.toBeNull();
    const cpTop = itemAt(r.surfaces.upper, 0).cp!;
    const cpLow = itemAt(r.surfaces.lower, 0).cp!;
    const seg = (a: number[], b: number[], cp: number, side: 1 | -1) => [side * cp * (itemAt(b, 1) - itemAt(a, 1)), -side * cp * (itemAt(b, 0) - itemAt(a, 0))];
    const f = [seg(itemAt(pts, 0), top, cpTop, 1), seg(top, tail, v.cp!, 1), seg(itemAt(pts, 0), tail, cpLow, -1)].reduce((s, x) => [itemAt(s, 0) + itemAt(x, 0), itemAt(s, 1) + itemAt(x, 1)], [0, 0]);
    expectClose(c.cl, itemAt(f, 1), 1e-14); // α = 0: lift along +y, over the chord 1
    expectClose(c.cd, itemAt(f, 0), 1e-14);
  });

  it('a vertical nose face is blunt (leading edge), a vertical tail face is blunt (trailing edge); no theory Cp on either', () => {
    const nose = solveSection(input([[0, -0.05], [0, 0.05], [1, 0]], 2, 0));
    expect(nose.status).toBe('blunt');
    expect(itemAt(nose.limits, 0).surface).toBe('leadingEdge');
    expect(itemAt(nose.limits, 0).message).toBe(
      'Blunt nose: vertices 0 and 1 form a vertical face at the minimum x; the shock-expansion method needs a single sharp nose.',
    );
    expect(nose.theories).toBeNull();
    expect(nose.coefficients).toBeNull();
    expect(nose.surfaces.upper.length + nose.surfaces.lower.length).toBe(3);
    for (const f of [...nose.surfaces.upper, ...nose.surfaces.lower]) {
      expect(f.cpLinear).toBeNull();
      expect(f.cpSecondOrder).toBeNull();
    }
    const tail = solveSection(input([[0, 0], [1, 0.05], [1, -0.05]], 2, 0));
    expect(tail.status).toBe('blunt');
    expect(itemAt(tail.limits, 0).surface).toBe('trailingEdge');
    expect(itemAt(tail.limits, 0).vertex).toBe(2); // the face's vertex of least y
  });

  it('blunt is an angular test: a face within 1e-9 rad of vertical is blunt, a tiny sloped facet is not', () => {
    // 1e-11 rad off vertical over a 0.1-chord face: a vertical face drawn with rounding.
    expect(solveSection(input([[0, 0], [1e-12, 0.1], [1, 0]], 2, 0)).status).toBe('blunt');
    // 1e-7 rad off vertical is a (very steep) sharp nose: the shock detaches there.
    expect(solveSection(input([[0, 0], [1e-8, 0.1], [1, 0]], 2, 0)).status).toBe('detached');
    // A nose facet 1e-9 chord long at 45° is not a vertical face, although both its ends lie
    // within 1e-9 chord of the minimum x: its 45° deflection detaches the nose shock at M 2.
    const d = 1e-9 / Math.SQRT2;
    const tiny = solveSection(input([[0, 0], [d, d], [0.5, 0.03], [1, 0], [0.5, -0.03]], 2, 0));
    expect(tiny.status).toBe('detached');
    expect(tiny.limits.some((l) => l.status === 'blunt')).toBe(false);
  });

  it('limit sentences print enough digits to tell the compared numbers apart (never "23.0° exceeds the maximum 23.0°")', () => {
    // θmax(M 2) = 22.9735°: 22.99° detaches, and one decimal would print both as 23.0°.
    const r = solveSection(input(wedgeNose(22.99, 5), 2, 0));
    expect(r.status).toBe('detached');
    const m = itemAt(r.limits, 0).message.match(/deflection (\d+\.\d+)° exceeds the maximum (\d+\.\d+)°/)!;
    expect(m).not.toBeNull();
    expect(Number(m[1])).toBeGreaterThan(Number(m[2]));
    expect(m[1]).toBe('22.99');
    expect(m[2]).toBe('22.97');
    // Subsonic just past the sonic deflection: M behind is 0.99…, never printed as "1.00".
    const sonic = (22.7063 + 0.003) as number; // sonic deflection at M 2 ≈ 22.706° (NACA 1135 sonic relation, see obliqueShock tests)
    const s = solveSection(input(wedgeNose(sonic, 5), 2, 0));
    expect(s.status).toBe('subsonic');
    const mb = itemAt(s.limits, 0).message.match(/subsonic \(M (\d\.\d+)\)/)!;
    expect(Number(mb[1])).toBeLessThan(1);
    const t = itemAt(s.limits, 0).message.match(/deflection (\d+\.\d+)° lies between the sonic (\d+\.\d+)° and the maximum (\d+\.\d+)°/)!;
    expect(Number(t[2])).toBeLessThan(Number(t[1]));
    expect(Number(t[1])).toBeLessThan(Number(t[3]));
  });
});

describe('solveSection reference (what the coefficients are referred to)', () => {
  it('defaults to the outline: its chord, its nose, and the quarter chord on the nose y', () => {
    const r = solveSection(input(lens(6, 0.05, 0.01), 2, 2));
    expect(r.geometry.reference).toEqual({ chord: 1, leadingEdge: [0, 0], source: 'outline' });
    expect(r.geometry.momentPoint).toEqual([0.25, 0]);
  });

  it('a given chord and leading edge scale cl, cd by c_outline/c_ref and cm by its square (same forces)', () => {
    const pts = lens(6, 0.05, 0.01);
    const a = solveSection(input(pts, 2.5, 3, { momentPoint: [0.3, 0] }));
    const b = solveSection({ ...input(pts, 2.5, 3, { momentPoint: [0.3, 0] }), reference: { momentPoint: [0.3, 0], chord: 1.25, leadingEdge: [-0.1, 0] } });
    expect(b.geometry.reference).toEqual({ chord: 1.25, leadingEdge: [-0.1, 0], source: 'input' });
    expectClose(b.coefficients!.cl, a.coefficients!.cl / 1.25, 1e-15);
    expectClose(b.coefficients!.cd, a.coefficients!.cd / 1.25, 1e-15);
    expectClose(b.coefficients!.cm, a.coefficients!.cm / 1.25 ** 2, 1e-15);
    // x_cp measured from the given leading edge over the given chord
    expectClose(b.coefficients!.xcpOverC!, (a.coefficients!.xcpOverC! + 0.1) / 1.25, 1e-12);
    expectClose(itemAt(b.surfaces.upper, 0).xMidOverC, (itemAt(a.surfaces.upper, 0).xMidOverC + 0.1) / 1.25, 1e-15);
    // theories on the same reference
    expectClose(b.theories!.linear.cl, a.theories!.linear.cl / 1.25, 1e-15);
  });
});

describe('solveSection trailing edge and warnings', () => {
  it('[S11] diamond at M 2, α 3°: both tail waves leave at the slip direction with equal pressure', () => {
    const r = solveSection(input(diamond(0.08), 2, 3));
    ok(r);
    const te = r.trailingEdge;
    expect(te.slipDeg).not.toBeNull();
    const upper = r.surfaces.upper.at(-1)!;
    const lower = r.surfaces.lower.at(-1)!;
    expectClose(te.upperWave!.deflectionDeg, te.slipDeg! - upper.phiDeg, 1e-9);
    expectClose(te.lowerWave!.deflectionDeg, lower.phiDeg - te.slipDeg!, 1e-9);
    expectClose(te.upperWave!.pRatioAfter, te.lowerWave!.pRatioAfter, 1e-12);
    // independent: turning each stream by its deflection gives the same pressure
    const pu = upper.pRatio! * turnState(upper.mach!, rad(te.upperWave!.deflectionDeg), 1.4).pRatio;
    const pl = lower.pRatio! * turnState(lower.mach!, rad(te.lowerWave!.deflectionDeg), 1.4).pRatio;
    expectClose(pu, te.pressureRatio!, 1e-9);
    expectClose(pl, te.pressureRatio!, 1e-9);
  });

  it('tail streams meeting at 120° cannot match with attached waves: slipDeg null, message, status still ok', () => {
    // A 10° nose, then 60° down (up) to the tail on each surface.
    const yr = 0.8 * Math.tan(rad(10));
    const xt = 0.8 + yr / Math.tan(rad(60));
    const r = solveSection(input([[0, 0], [0.8, yr], [xt, 0], [0.8, -yr]], 3, 0));
    expect(r.status).toBe('ok');
    expect(r.trailingEdge.slipDeg).toBeNull();
    expect(r.trailingEdge.message).toMatch(/^No attached wave pattern matches the two streams at the trailing edge/);
    expect(r.warnings).toContain(r.trailingEdge.message);
  });

  it('warnings: large deflections, near detachment, barely supersonic flow, hypersonic perfect gas', () => {
    const near = solveSection(input(wedgeNose(22.5, 2), 2, 0));
    expect(near.status).toBe('ok');
    expect(near.warnings.some((w) => /within 1° of detachment/.test(w))).toBe(true);
    expect(near.warnings.some((w) => /barely supersonic/.test(w))).toBe(true);
    expect(near.warnings.some((w) => /Linear and second-order theories assume small deflections/.test(w))).toBe(true);
    const hyper = solveSection(input(diamond(0.05), 8, 1));
    expect(hyper.warnings.some((w) => /perfect gas/.test(w))).toBe(true);
    const quiet = solveSection(input(diamond(0.05), 2, 1));
    expect(quiet.warnings).toEqual([]);
  });

  it('[S5] results carry no NaN, Infinity or undefined, including limits and blunt cases', () => {
    for (const r of [
      solveSection(input(diamond(0.1), 2, 2)),
      solveSection(input(wedgeNose(25, 25), 2, 0)),
      solveSection(input([[0, -0.05], [0, 0.05], [1, 0]], 2, 0)),
      solveSection(input(lens(30, 0.06, 0.02), 50, 30, { gamma: 1.01 })),
    ]) {
      expect(badValues(r)).toEqual([]);
      expect(JSON.parse(JSON.stringify(r))).toEqual(r);
    }
  });

  it('solveSection does not mutate its input', () => {
    const inp = input(lens(5, 0.05, 0.01), 2, 2, { momentPoint: [0.3, 0] });
    const copy = JSON.parse(JSON.stringify(inp));
    solveSection(inp);
    expect(inp).toEqual(copy);
  });

  it('options.waves = false skips the wave map only', () => {
    const a = solveSection(input(lens(5, 0.05, 0.01), 2, 2));
    const b = solveSection(input(lens(5, 0.05, 0.01), 2, 2, { waves: false }));
    expect(b.waves).toEqual([]);
    expect(b.intersections).toEqual([]);
    expect(a.waves.length).toBeGreaterThan(0);
    expect({ ...b, waves: a.waves, intersections: a.intersections }).toEqual(a);
  });
});
