import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import type { SketchDocument } from '@shared/model/sketch';

/** Messages between the editor and the solver worker. `seq` pairs an answer with its request. */
export interface SolveRequest {
  seq: number;
  document: SketchDocument;
}

export type SolveResponse =
  | { seq: number; ok: true; analysis: SketchAnalysis; solveMs: number }
  | { seq: number; ok: false; message: string };
