import type { AnalysisStatus } from '../../../shared/model/analysis.ts';
import type { SketchDocument } from '../../../shared/model/sketch.ts';
import { analyseDesignPoints } from '../../../shared/flight/designPoints.ts';
import { selectedAnalysis, type DesignPointsAnalysis } from '../../../shared/flight/storedAnalysis.ts';

/** Sections larger than this are stored without their wave map (it costs O(n²) to trace). */
export const STORED_WAVES_MAX_FACETS = 400;

/**
 * The server's own solve of a stored document: every design point, the selected one with its
 * wave map. Its analysis is what the sketch stores (the browser's live solve is only a preview);
 * the status is the selected point's. Pure and synchronous: called once per batch of edits.
 */
export function solveDocument(document: SketchDocument): { status: AnalysisStatus; result: DesignPointsAnalysis } {
  const all = analyseDesignPoints(document, { waves: document.section.points.length <= STORED_WAVES_MAX_FACETS });
  return { status: selectedAnalysis(all)?.status ?? 'invalid', result: all };
}
