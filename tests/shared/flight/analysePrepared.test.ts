import { describe, expect, it } from 'vitest';
import { analysePrepared, analyseSketch, prepareSketch } from '../../../shared/flight/analyseSketch.ts';
import { defaultSketchDocument, sketchCase, type SketchCase } from '../../../shared/model/sketch.ts';

/** A 6 %-thick diamond with a 25 % flap, at 11 km: every part of the analysis is exercised. */
function flappedDoc(): SketchCase {
  return {
    ...sketchCase(defaultSketchDocument()),
    section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] },
    condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: 11_000 },
    flap: { hingeXOverC: 0.75, deflectionDeg: 4 },
  };
}

describe('prepareSketch + analysePrepared', () => {
  it('analysePrepared(prepareSketch(doc), other flow) equals analyseSketch at that flow, point for point', () => {
    const doc = flappedDoc();
    const prepared = prepareSketch(doc, { waves: false, flapDeg: -6 });
    for (const [mach, alphaDeg, altitudeM] of [[1.6, -3, 0], [2, 2, 11_000], [3.5, 8, 20_000], [1.2, 14, null]] as const) {
      const single = analyseSketch(doc, { waves: false, flapDeg: -6, mach, alphaDeg, altitudeM });
      expect(analysePrepared(prepared, { mach, alphaDeg, altitudeM })).toEqual(single);
    }
  });

  it('a flow outside the solver’s range gives the same invalid answer as a full parse', () => {
    const doc = flappedDoc();
    const prepared = prepareSketch(doc, { waves: false });
    const answer = analysePrepared(prepared, { mach: 0.8, alphaDeg: 2 });
    expect(answer.status).toBe('invalid');
    expect(answer).toEqual(analyseSketch(doc, { waves: false, mach: 0.8, alphaDeg: 2 }));
    expect(answer.problem).toMatch(/^flow\.mach: flow\.mach must be above 1/);
  });

  it('a flap deflection that folds the section is refused once, at preparation', () => {
    const doc = { ...flappedDoc(), section: { points: [[0, 0], [0.6, 0.3], [1, 0], [0.62, -0.3]] as [number, number][] }, flap: { hingeXOverC: 0.6, deflectionDeg: 0 } };
    const prepared = prepareSketch(doc, { flapDeg: 45 });
    expect(prepared.ok).toBe(false);
    expect(analysePrepared(prepared, { mach: 3 })).toEqual(analyseSketch(doc, { flapDeg: 45, mach: 3 }));
  });
});
