import { selectedPoint, type SketchDocument } from '../model/sketch.ts';
import type { SketchSummary } from '../model/sketchApi.ts';
import { thicknessRatio } from '../solver/thicknessRatio.ts';

/** What the sketches table shows of a document (the rest of a row comes from the sketch's other columns). */
export type DocumentSummary = Pick<SketchSummary, 'vertexCount' | 'thicknessRatio' | 'mach' | 'alphaDeg' | 'designPointCount' | 'selectedPointName'>;

/**
 * The sketches table's summary of a document: vertex count, the section's t/c (the solver's own
 * measure, normal to the chord line; null for a degenerate section), the selected design point's
 * Mach, α and name, and how many design points it holds. The server stores it beside the document
 * in the same statement that writes the document (`sketches.vertex_count` …), so the list never
 * reads documents.
 */
export function summarizeDocument(doc: SketchDocument): DocumentSummary {
  const point = selectedPoint(doc);
  return {
    vertexCount: doc.section.points.length,
    thicknessRatio: thicknessRatio(doc.section.points),
    mach: point.condition.mach,
    alphaDeg: point.condition.alphaDeg,
    designPointCount: doc.designPoints.length,
    selectedPointName: point.name,
  };
}
