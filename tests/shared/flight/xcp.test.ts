import { describe, expect, it } from 'vitest';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';
import { normalForceCoefficient, shownXcpOverC, xcpLeftOut, XCP_BAND, XCP_CN_MIN, XCP_UNDEFINED_NOTE } from '../../../shared/flight/xcp.ts';
import { definedXcpOverC } from '../../../shared/model/study.ts';
import { resultJson } from '../../../shared/model/sketchExport.ts';
import { sketchCase } from '../../../shared/model/sketch.ts';
import { oneCondition } from '../../helpers/documents.ts';

/**
 * The one x_cp/c rule every view and export uses (shared/flight/xcp.ts): x_cp/c is a location only
 * with |cn| ≥ 1e-4 and within −1…2 chords of the leading edge (an engineer's judgement, common
 * practice to quote x_cp only with a clear normal force). The study rows' definedXcpOverC is the
 * same rule fed cn = cl·cos α + cd·sin α (its own tests: tests/shared/model/studyXcp.test.ts).
 */
const FIN_ROOT: [number, number][] = [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]];
const finRoot = (alphaDeg: number, deflectionDeg: number) =>
  oneCondition({ section: { points: FIN_ROOT }, condition: { mach: 1.5, alphaDeg, gamma: 1.4, altitudeM: null }, flap: { hingeXOverC: 0.75, deflectionDeg } });

describe('shownXcpOverC: the rule at its edges', () => {
  it('|cn| at the limit is shown, just below it is not, either sign', () => {
    expect(shownXcpOverC(0.5, XCP_CN_MIN)).toBe(0.5);
    expect(shownXcpOverC(0.5, -XCP_CN_MIN)).toBe(0.5);
    expect(shownXcpOverC(0.5, XCP_CN_MIN * 0.999)).toBeNull();
    expect(shownXcpOverC(0.5, -XCP_CN_MIN * 0.999)).toBeNull();
    expect(shownXcpOverC(0.5, 0)).toBeNull();
    expect(shownXcpOverC(0.5, Number.NaN)).toBeNull();
  });

  it('the band −1…2 chords is closed; outside it, or no value, gives null', () => {
    expect(shownXcpOverC(XCP_BAND.min, 0.1)).toBe(-1);
    expect(shownXcpOverC(XCP_BAND.max, 0.1)).toBe(2);
    expect(shownXcpOverC(-1.0001, 0.1)).toBeNull();
    expect(shownXcpOverC(2.0001, 0.1)).toBeNull();
    expect(shownXcpOverC(null, 0.1)).toBeNull();
    expect(shownXcpOverC(undefined, 0.1)).toBeNull();
    expect(shownXcpOverC(0.5, undefined)).toBeNull();
  });

  it('xcpLeftOut: only a solver value the rule drops (null from the solver is no dash to explain)', () => {
    expect(xcpLeftOut(4.309, 0.0152)).toBe(true);
    expect(xcpLeftOut(0.5, 5e-5)).toBe(true);
    expect(xcpLeftOut(0.5, 0.1)).toBe(false);
    expect(xcpLeftOut(null, 0)).toBe(false);
  });

  it('the study rows\' wrapper gives the same answer as the rule fed the solver\'s cn', () => {
    for (const [a, d] of [[2.233, -10], [2, -10], [3, -10], [4, 0], [0, 0.003]] as const) {
      const c = analyseSketch(sketchCase(finRoot(a, d))).result!.coefficients!;
      const rad = (a * Math.PI) / 180;
      expect(normalForceCoefficient(c.cl, c.cd, rad)).toBeCloseTo(c.cn, 12);
      expect(definedXcpOverC({ xcpOverC: c.xcpOverC, cl: c.cl, cd: c.cd, alphaDeg: a })).toBe(shownXcpOverC(c.xcpOverC, c.cn));
    }
  });
});

describe('the result JSON: the solver\'s raw x_cp/c kept, the shown one beside it', () => {
  it('near-zero normal force (fin root, flap −10°, M 1.5, α 2.233°: cn ≈ −2.3e-5, x_cp ≈ 2515 c)', () => {
    const doc = finRoot(2.233, -10);
    const result = analyseSketch(sketchCase(doc)).result!;
    const json = JSON.parse(resultJson('Demo', doc, result));
    expect(json.result.coefficients.xcpOverC).toBeGreaterThan(2000);
    expect(json.xcpOverC).toEqual({ exact: null, linear: null, secondOrder: null, note: XCP_UNDEFINED_NOTE });
  });

  it('a clear normal force (α 4°, δ 0): the shown values equal the raw ones', () => {
    const doc = finRoot(4, 0);
    const result = analyseSketch(sketchCase(doc)).result!;
    const json = JSON.parse(resultJson('Demo', doc, result));
    expect(json.xcpOverC.exact).toBe(result.coefficients!.xcpOverC);
    expect(json.xcpOverC.linear).toBe(result.theories!.linear.xcpOverC);
    expect(json.xcpOverC.secondOrder).toBe(result.theories!.secondOrder.xcpOverC);
    // Linear theory puts a thin section's angle-of-attack load at mid-chord (Ackeret; common practice).
    expect(json.xcpOverC.linear).toBeCloseTo(0.5, 12);
  });
});
