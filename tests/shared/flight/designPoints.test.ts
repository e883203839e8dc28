import { describe, expect, it } from 'vitest';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';
import { analyseDesignPoints } from '../../../shared/flight/designPoints.ts';
import { pointAnalysis, readStoredAnalysis, selectedAnalysis } from '../../../shared/flight/storedAnalysis.ts';
import { caseAt, defaultSketchDocument, FIRST_DESIGN_POINT_ID, type SketchDocument } from '../../../shared/model/sketch.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/** Our own 6 % fin with a 25 % flap and three design points (invented for the tests). */
function fin(): SketchDocument {
  return {
    ...defaultSketchDocument(),
    section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] },
    flap: { hingeXOverC: 0.75 },
    designPoints: [
      { id: 'point_cruise00000000000000', name: 'Cruise', condition: { mach: 2.5, alphaDeg: 1, gamma: 1.4, altitudeM: 12_000 }, flapDeflectionDeg: 0 },
      { id: 'point_pullup00000000000000', name: 'Pull-up', condition: { mach: 1.8, alphaDeg: 8, gamma: 1.4, altitudeM: 6_000 }, flapDeflectionDeg: 6 },
      { id: 'point_hot00000000000000000', name: 'Hot gas', condition: { mach: 3, alphaDeg: 2, gamma: 1.3, altitudeM: null }, flapDeflectionDeg: -4 },
    ],
    selectedPointId: 'point_pullup00000000000000',
  };
}

describe('analyseDesignPoints', () => {
  it('[DP1] each point equals a single analysis of the sketch at that point, in the document’s order', () => {
    const doc = fin();
    const all = analyseDesignPoints(doc);
    expect(all.selectedPointId).toBe('point_pullup00000000000000');
    expect(all.points.map((p) => [p.id, p.name])).toEqual(doc.designPoints.map((p) => [p.id, p.name]));
    for (const p of doc.designPoints) {
      const selected = p.id === doc.selectedPointId;
      expect(pointAnalysis(all, p.id)).toEqual(analyseSketch(caseAt(doc, p), { waves: selected }));
    }
    expect(selectedAnalysis(all)!.flap!.deflectionDeg).toBe(6);
    expect(pointAnalysis(all, 'point_hot00000000000000000')!.result!.condition.gamma).toBe(1.3);
  });

  it('[DP2] only the selected point carries a wave map, and leaving the others’ out changes no coefficient', () => {
    const doc = fin();
    const all = analyseDesignPoints(doc);
    for (const p of all.points) expect(p.analysis.result!.waves.length > 0).toBe(p.id === 'point_pullup00000000000000');
    const cruiseWithWaves = analyseSketch(caseAt(doc, itemAt(doc.designPoints, 0)), { waves: true });
    expect(pointAnalysis(all, 'point_cruise00000000000000')!.result!.coefficients).toEqual(cruiseWithWaves.result!.coefficients);
    expect(pointAnalysis(all, 'point_cruise00000000000000')!.loads).toEqual(cruiseWithWaves.loads);
  });

  it('selectedOnly solves just the selected point (a drag’s preview)', () => {
    const all = analyseDesignPoints(fin(), { selectedOnly: true });
    expect(all.points.map((p) => p.id)).toEqual(['point_pullup00000000000000']);
  });

  it('reads a stored result of either shape: version 2 as is, a bare analysis as the one upgraded point', () => {
    const doc = fin();
    const all = analyseDesignPoints(doc);
    expect(readStoredAnalysis(JSON.parse(JSON.stringify(all)))).toEqual(all);
    const bare = analyseSketch(caseAt(defaultSketchDocument(), itemAt(defaultSketchDocument().designPoints, 0)));
    const old = readStoredAnalysis(bare);
    expect(old).toEqual({ version: 2, selectedPointId: FIRST_DESIGN_POINT_ID, points: [{ id: FIRST_DESIGN_POINT_ID, name: 'Design point 1', analysis: bare }] });
    expect(readStoredAnalysis(null)).toBeNull();
    expect(readStoredAnalysis({ status: 'ok' })).toBeNull();
    expect(readStoredAnalysis({ version: 2, selectedPointId: 'x', points: [{ id: 'x' }] })).toBeNull();
  });
});
