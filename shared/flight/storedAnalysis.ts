import { storedAnalysisSchema } from '../model/analysis.ts';
import type { SketchAnalysis } from './analyseSketch.ts';

/**
 * The shape of a sketch's design points solved together, and the readers of a stored result.
 * Kept apart from the solving (designPoints.ts) so that a page that only reads stored results
 * does not load the solver.
 */
export interface DesignPointAnalysis {
  id: string;
  name: string;
  analysis: SketchAnalysis;
}

export interface DesignPointsAnalysis {
  /** Stored shape version (a bare `SketchAnalysis` is version 1: one point). */
  version: 2;
  selectedPointId: string;
  /** One per design point, in the document's order. */
  points: DesignPointAnalysis[];
}

/** The selected point's analysis (the first point's if the selection is not among them). */
export function selectedAnalysis(all: DesignPointsAnalysis): SketchAnalysis | null {
  return (all.points.find((p) => p.id === all.selectedPointId) ?? all.points[0])?.analysis ?? null;
}

/** A point's analysis by id. */
export function pointAnalysis(all: DesignPointsAnalysis | null, pointId: string): SketchAnalysis | null {
  return all?.points.find((p) => p.id === pointId)?.analysis ?? null;
}

/**
 * A stored result read back (sketch rows' `last_result`, snapshots), parsed by
 * `storedAnalysisSchema` [AN1]: version 2 as is; a bare analysis stored before design points
 * becomes the one point a version 1 document upgrades to; anything else (no result, a shape
 * older than both) is null: the editor solves the sketch itself, and the next save stores a
 * fresh result.
 */
export function readStoredAnalysis(raw: unknown): DesignPointsAnalysis | null {
  if (raw === null || raw === undefined) return null;
  const parsed = storedAnalysisSchema.safeParse(raw);
  return parsed.success ? parsed.data : null;
}

/** The selected point's analysis of a stored result (null when there is none in a known shape). */
export function readSelectedAnalysis(raw: unknown): SketchAnalysis | null {
  const stored = readStoredAnalysis(raw);
  return stored ? selectedAnalysis(stored) : null;
}

/** Is there anything to export for this point (loads at its altitude)? */
export function hasFacetLoads(analysis: DesignPointsAnalysis | null, pointId: string): boolean {
  const a = analysis?.points.find((p) => p.id === pointId)?.analysis;
  return !!a?.loads && !!a.result;
}
