import type { SketchDocument } from '../../../shared/model/sketch.ts';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';

/** Sections larger than this are stored without their wave map (it costs O(n²) to trace). */
export const STORED_WAVES_MAX_FACETS = 400;

/**
 * The server's own solve of a stored document; its analysis is what the sketch stores (the
 * browser's live solve is only a preview). Pure and synchronous: called once per batch of edits.
 */
export function solveDocument(document: SketchDocument): { status: string; result: unknown } {
  const analysis = analyseSketch(document, { waves: document.section.points.length <= STORED_WAVES_MAX_FACETS });
  return { status: analysis.status, result: analysis };
}
