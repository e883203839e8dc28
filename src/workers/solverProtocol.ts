import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import type { DesignPointsAnalysis } from '@shared/flight/storedAnalysis';
import type { SketchDocument } from '@shared/model/sketch';
import type { PressureDomain } from '@/canvas/colors';
import type { SceneDetail, SceneState } from '@/canvas/scenePainter';

/**
 * Messages between the editor and the solver worker. `seq` pairs an answer with its request.
 * The worker solves only the newest document it has (older ones waiting behind it are
 * skipped), and when the page has handed it the scene canvas it paints the scene right after
 * each solve and after each scene change (src/canvas/scenePainter.ts).
 */
export interface SolveRequest {
  type: 'solve';
  seq: number;
  document: SketchDocument;
  /**
   * Solve only the selected design point (a drag's preview); the release solves them all. The
   * scene is painted at once; the answer waits until the pointer pauses (answerPacer.ts).
   */
  selectedOnly?: boolean;
  /** The scene state of the same moment, when it changed. */
  scene?: SceneState;
}

export type WorkerRequest =
  | SolveRequest
  /** The scene canvas, transferred (once); `bench` turns on paint timing (paintTiming.ts). */
  | { type: 'canvas'; canvas: OffscreenCanvas; bench: boolean }
  | { type: 'scene'; state: SceneState }
  /** A picture of the scene at `pixelRatio` (PNG export); answered with `picture`. */
  | { type: 'picture'; id: number; pixelRatio: number };

export type SolveResponse =
  | {
      type: 'answer';
      seq: number;
      ok: true;
      /** The selected design point's analysis (with its wave map: the one drawn). */
      analysis: SketchAnalysis;
      /** Every design point solved (only the selected one for a `selectedOnly` request). */
      points: DesignPointsAnalysis;
      solveMs: number;
    }
  | { type: 'answer'; seq: number; ok: false; message: string };

export type WorkerResponse =
  | SolveResponse
  /**
   * Bench only: the scene with the answer to `seq` was drawn at `at` (ms since the epoch) after
   * solving, building the draw lists and making the draw calls for these times, and rasterised
   * `rasterMs` later.
   */
  | { type: 'painted'; seq: number; at: number; solveMs: number; listsMs: number; paintMs: number; rasterMs: number }
  | { type: 'picture'; id: number; bitmap: ImageBitmap | null }
  /**
   * What the scene on screen was last painted with, sent when it changes: the detail ([DR6]) and
   * the colour domain, so that the legend states the range of the colours shown — during a drag
   * the preview's, whose answer waits for the pause ([DR8]).
   */
  | { type: 'shown'; detail: SceneDetail; domain: PressureDomain };
