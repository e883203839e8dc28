/**
 * The worker thread behind solveQueue.ts: solves one stored document at a time and answers with
 * the status and the result already as JSON, so the main thread neither computes nor
 * serialises it (a 2,000-vertex section's stored result is close to a megabyte).
 */
import { parentPort } from 'node:worker_threads';
import { solveDocument } from '../api/sketches/solveDocument.ts';
import type { AnalysisStatus } from '../../shared/model/analysis.ts';
import type { SketchDocument } from '../../shared/model/sketch.ts';

export interface SolveRequest {
  id: number;
  document: SketchDocument;
}
export type SolveAnswer = { id: number; ok: true; status: AnalysisStatus; resultJson: string } | { id: number; ok: false; message: string };

parentPort!.on('message', (req: SolveRequest) => {
  let answer: SolveAnswer;
  try {
    const solved = solveDocument(req.document);
    answer = { id: req.id, ok: true, status: solved.status, resultJson: JSON.stringify(solved.result) };
  } catch (err) {
    answer = { id: req.id, ok: false, message: (err as Error).message };
  }
  parentPort!.postMessage(answer);
});
