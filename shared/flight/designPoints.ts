import { storedAnalysisSchema } from '../model/analysis.ts';
import { caseAt, type SketchDocument } from '../model/sketch.ts';
import { analyseSketch, type SketchAnalysis } from './analyseSketch.ts';

/**
 * All design points of a sketch solved together ("solved together" = one call, one answer, one
 * revision). Each point is an ordinary `analyseSketch` of the sketch at that point
 * (`caseAt`), so a point's numbers equal a single analysis at its condition [DP1]. Only the
 * selected point carries its wave map (the canvas draws one wave map at a time); the others are
 * solved with `waves: false`, which changes no coefficient [DP2].
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

export interface AnalysePointsOptions {
  /** Trace the selected point's wave map (default true). */
  waves?: boolean;
  /** Solve only the selected point (a drag's live preview); the others are left out. */
  selectedOnly?: boolean;
}

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
