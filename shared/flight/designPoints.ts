import { caseAt, type SketchDocument } from '../model/sketch.ts';
import { analyseSketch } from './analyseSketch.ts';
import type { DesignPointAnalysis, DesignPointsAnalysis } from './storedAnalysis.ts';

export interface AnalysePointsOptions {
  /** Trace the selected point's wave map (default true). */
  waves?: boolean;
  /** Solve only the selected point (a drag's live preview); the others are left out. */
  selectedOnly?: boolean;
}

/**
 * All design points of a sketch solved together ("solved together" = one call, one answer, one
 * revision). Each point is an ordinary `analyseSketch` of the sketch at that point
 * (`caseAt`), so a point's numbers equal a single analysis at its condition [DP1]. Only the
 * selected point carries its wave map (the canvas draws one wave map at a time); the others are
 * solved with `waves: false`, which changes no coefficient [DP2].
 */
export function analyseDesignPoints(doc: SketchDocument, options: AnalysePointsOptions = {}): DesignPointsAnalysis {
  const waves = options.waves ?? true;
  const points: DesignPointAnalysis[] = [];
  for (const point of doc.designPoints) {
    const selected = point.id === doc.selectedPointId;
    if (options.selectedOnly && !selected) continue;
    points.push({ id: point.id, name: point.name, analysis: analyseSketch(caseAt(doc, point), { waves: waves && selected }) });
  }
  return { version: 2, selectedPointId: doc.selectedPointId, points };
}
