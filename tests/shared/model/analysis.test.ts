import { describe, expect, expectTypeOf, it } from 'vitest';
import type { z } from 'zod';
import { analyseSketch, type SketchAnalysis } from '../../../shared/flight/analyseSketch.ts';
import { analyseDesignPoints } from '../../../shared/flight/designPoints.ts';
import { readStoredAnalysis, type DesignPointsAnalysis } from '../../../shared/flight/storedAnalysis.ts';
import {
  ANALYSIS_STATUSES,
  designPointsAnalysisSchema,
  sketchAnalysisSchema,
  solveResultSchema,
  SOLVE_STATUSES,
  storedAnalysisSchema,
} from '../../../shared/model/analysis.ts';
import { STUDY_STATUSES } from '../../../shared/model/study.ts';
import { caseAt, defaultSketchDocument, type SketchDocument } from '../../../shared/model/sketch.ts';
import type { SolveResult, SolveStatus } from '../../../shared/solver/types.ts';
import { firstItem } from '../../../shared/util/invariant.ts';

/** Our own 5 % double wedge with a flap, two design points and altitudes (loads and friction on). */
function sketch(): SketchDocument {
  return {
    ...defaultSketchDocument(),
    section: { points: [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]] },
    flap: { hingeXOverC: 0.7 },
    designPoints: [
      { id: 'point_climb0000000000000000', name: 'Climb', condition: { mach: 1.6, alphaDeg: 4, gamma: 1.4, altitudeM: 8_000 }, flapDeflectionDeg: 3 },
      { id: 'point_dash00000000000000000', name: 'Dash', condition: { mach: 2.8, alphaDeg: 1, gamma: 1.4, altitudeM: 15_000 }, flapDeflectionDeg: -2 },
    ],
    selectedPointId: 'point_climb0000000000000000',
  };
}

describe('stored analysis schemas', () => {
  it('follow the result types field for field (checked by the type-check, both directions)', () => {
    expectTypeOf<z.output<typeof solveResultSchema>>().toEqualTypeOf<SolveResult>();
    expectTypeOf<z.output<typeof sketchAnalysisSchema>>().toEqualTypeOf<SketchAnalysis>();
    expectTypeOf<z.output<typeof designPointsAnalysisSchema>>().toEqualTypeOf<DesignPointsAnalysis>();
    expectTypeOf<(typeof SOLVE_STATUSES)[number]>().toEqualTypeOf<SolveStatus>();
    expect(STUDY_STATUSES).toBe(ANALYSIS_STATUSES);
  });

  it('[AN1] a stored result read back equals what was stored: wave map, flap, loads and friction included', () => {
    const all = analyseDesignPoints(sketch());
    const selected = firstItem(all.points).analysis;
    expect(selected.result?.waves.some((w) => w.kind === 'fan' && (w.rays?.length ?? 0) > 0)).toBe(true);
    expect(selected.loads?.friction.upper).not.toBeNull();
    const stored = JSON.parse(JSON.stringify(all)) as unknown;
    expect(storedAnalysisSchema.parse(stored)).toEqual(all);
  });

  it('[AN1] a stored result with a field of the wrong kind is not read as a result (no wrong number reaches a view)', () => {
    const all = JSON.parse(JSON.stringify(analyseDesignPoints(sketch()))) as DesignPointsAnalysis;
    const coefficients = firstItem(all.points).analysis.result?.coefficients;
    expect(coefficients).toBeTruthy();
    Object.assign(coefficients ?? {}, { cl: '0.12' }); // what a hand-edited or foreign row could hold
    expect(storedAnalysisSchema.safeParse(all).success).toBe(false);
    const parsed = designPointsAnalysisSchema.safeParse(all);
    expect(parsed.error?.issues.map((i) => i.path.join('.'))).toContain('points.0.analysis.result.coefficients.cl');
    expect(readStoredAnalysis(all)).toBeNull();
  });

  it('[AN1] a bare analysis stored before design points reads as the one upgraded point', () => {
    const doc = defaultSketchDocument();
    const bare = analyseSketch(caseAt(doc, firstItem(doc.designPoints)));
    const read = storedAnalysisSchema.parse(JSON.parse(JSON.stringify(bare)));
    expect(read.points).toHaveLength(1);
    expect(firstItem(read.points).analysis).toEqual(bare);
  });
});
