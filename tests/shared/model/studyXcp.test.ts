import { describe, expect, it } from 'vitest';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';
import { runStudy } from '../../../shared/flight/study.ts';
import { definedXcpOverC, studyCsv, studyDefinitionSchema, unpackStudyRows, XCP_BAND, XCP_CN_MIN, STUDY_COLUMNS } from '../../../shared/model/study.ts';
import { sketchCase, type SketchDocument } from '../../../shared/model/sketch.ts';
import { RESULTS_CAUTION } from '../../../shared/model/caution.ts';
import { DEMO_SKETCHES } from '../../../server/db/seed.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/**
 * x_cp/c is left out (a dash in the study table, an empty CSV cell) where the normal force is
 * near zero: |cn| < 1e-4 or x_cp outside −1…2 chords from the leading edge (the rule and why in
 * shared/flight/xcp.ts, wrapped for study rows in shared/model/study.ts; an engineer's judgement, common practice to quote x_cp only with a clear
 * normal force). The case the rule is for: the fin root with a flap hinged at x/c 0.75 deflected
 * −10° at M 1.5 crosses cl = 0 between α 2° and 3°, where x_cp came out at 4.309 c.
 */
function finRootWithFlap(): SketchDocument {
  const root = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern fin root'))!;
  return { ...structuredClone(root.document), flap: { hingeXOverC: 0.75 } };
}

describe('x_cp/c where the normal force is near zero', () => {
  const doc = finRootWithFlap();
  const outcome = runStudy(sketchCase(doc), studyDefinitionSchema.parse({ mach: { kind: 'list', values: [1.5] }, alpha: { startDeg: 1, endDeg: 4, stepDeg: 1 }, flapDeg: [-10], altitudeM: null, friction: 'none' }));
  if (outcome.status !== 'done') throw new Error('study did not finish');
  const rows = unpackStudyRows(outcome.results);
  const at = (alphaDeg: number) => rows.find((r) => r.alphaDeg === alphaDeg)!;

  it('the rule: |cn| = |cl·cos α + cd·sin α| below 1e-4, or x_cp outside −1…2 chords, is undefined', () => {
    const row = { cl: 0.1, cd: 0.02, alphaDeg: 0 };
    expect(definedXcpOverC({ ...row, xcpOverC: 0.5 })).toBe(0.5);
    expect(definedXcpOverC({ ...row, xcpOverC: XCP_BAND.min })).toBe(-1);
    expect(definedXcpOverC({ ...row, xcpOverC: XCP_BAND.max })).toBe(2);
    expect(definedXcpOverC({ ...row, xcpOverC: -1.001 })).toBeNull();
    expect(definedXcpOverC({ ...row, xcpOverC: 2.001 })).toBeNull();
    expect(definedXcpOverC({ ...row, xcpOverC: null })).toBeNull();
    // cl 5e-5 at α 0: |cn| below 1e-4 even though x_cp is in the band.
    expect(definedXcpOverC({ cl: XCP_CN_MIN / 2, cd: 0.02, alphaDeg: 0, xcpOverC: 0.5 })).toBeNull();
    // At α 90° the normal force is the drag (cn = cd): cl = 0 with a drag still defines x_cp.
    expect(definedXcpOverC({ cl: 0, cd: 0.02, alphaDeg: 90, xcpOverC: 0.5 })).toBe(0.5);
  });

  it('cn from the study row (cl·cos α + cd·sin α, wind to body axes) is the solver\'s normal force', () => {
    for (const r of rows) {
      const a = analyseSketch(sketchCase(doc), { mach: r.mach, alphaDeg: r.alphaDeg, flapDeg: r.flapDeg, waves: false });
      const c = a.result!.coefficients!;
      const rad = (r.alphaDeg * Math.PI) / 180;
      expect(r.cl! * Math.cos(rad) + r.cd! * Math.sin(rad)).toBeCloseTo(c.cn, 6);
    }
  });

  it('the fin root\'s sweep: 4.309 c at α 2° is undefined, the well-defined neighbours stay', () => {
    expect(at(2).xcpOverC).toBeCloseTo(4.309, 3); // what the solver gives, kept in the stored row
    expect(definedXcpOverC(at(2))).toBeNull();
    // α 3°: cl 0.049, the trailing-edge-up flap's couple puts the resultant 0.695 c ahead of the
    // nose; with cn ≈ 0.05 that is a steady figure (shown).
    expect(definedXcpOverC(at(3))).toBeCloseTo(-0.6952, 4);
    expect(definedXcpOverC(at(1))).toBeCloseTo(at(1).xcpOverC!, 12);
    expect(definedXcpOverC(at(4))).toBeCloseTo(at(4).xcpOverC!, 12);
  });

  it('the CSV leaves the undefined x_cp/c cell empty, says why, and keeps the others', () => {
    const csv = studyCsv({ title: 'fin root', studyName: 'flap', revision: 1, caution: RESULTS_CAUTION }, outcome.results).trimEnd().split('\n');
    expect(csv[1]).toContain('x_cp/c undefined when the normal force is near zero (|cn| < 0.0001 or x_cp outside −1 to 2 chords from the leading edge): empty');
    const header = itemAt(csv, 4).split(',');
    const k = header.indexOf('xcpOverC');
    expect(k).toBe(STUDY_COLUMNS.indexOf('xcpOverC'));
    const cells = csv.slice(5).map((l) => l.split(','));
    const byAlpha = (a: number) => cells.find((c) => Number(c[header.indexOf('alphaDeg')]) === a)!;
    expect(byAlpha(2)[k]).toBe('');
    expect(Number(byAlpha(3)[k])).toBeCloseTo(-0.6952, 4);
    expect(Number(byAlpha(1)[k])).toBe(at(1).xcpOverC);
  });
});
