/// <reference lib="webworker" />
import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import { analyseDesignPoints } from '@shared/flight/designPoints';
import { selectedAnalysis } from '@shared/flight/storedAnalysis';
import { EMPTY_SCENE_CONTENT, paintLists, paintScene, sceneLists, type SceneContent, type SceneDetail, type SceneState } from '@/canvas/scenePainter';
import type { PressureDomain } from '@/canvas/colors';
import { resultDomain } from '@/canvas/renderWaves';
import { answerPacer } from './answerPacer';
import type { SolveRequest, SolveResponse, WorkerRequest, WorkerResponse } from './solverProtocol';

/**
 * The shared analysis of every design point (flap, shock-expansion solve, both thin-section
 * theories, the selected point's wave map, loads) in a Web Worker, so that solving never blocks drawing. It is the same pure function
 * the server runs on save, so the live preview and the stored result agree.
 *
 * Only the newest document is solved: every message is read before the next solve starts
 * (the solve is scheduled behind the messages already queued), so a fast drag never builds a
 * queue. When the page has transferred the scene canvas, the worker paints the scene right
 * after each solve — the section and its wave map reach the screen together, without the
 * page's main thread [DR1] — and again after each scene change from the page. A drag's
 * previews are painted with less detail and the scene in full when the pointer pauses [DR6].
 */
const scope = self as unknown as DedicatedWorkerGlobalScope;

let latest: SolveRequest | null = null;
let scheduled = false;
let canvas: OffscreenCanvas | null = null;
let context: OffscreenCanvasRenderingContext2D | null = null;
let bench = false;
let scene: SceneState | null = null;
let content: SceneContent = EMPTY_SCENE_CONTENT;
/** The last answer that could be solved: its waves stay on screen while a drag passes through a crossing. */
let lastGood: SketchAnalysis | null = null;
let contentSeq = 0;
/** The scene on screen was painted with a drag's detail ([DR6]): paint it in full at the pause. */
let dragDetailShown = false;
/**
 * Answers to the page: thinned outside a drag, held until the pointer pauses during one
 * (answerPacer.ts). The pause is also when a scene painted with a drag's detail is painted in full.
 */
const ANSWER_INTERVAL_MS = 80;
const answers = answerPacer<SolveResponse>((answer) => {
  post(answer);
  if (dragDetailShown) paint();
}, ANSWER_INTERVAL_MS);
/** What the page was last told the scene on screen shows ([DR8]): detail and colour domain. */
let shown = { detail: '', min: Number.NaN, max: Number.NaN };
/** The colour domain of the last full paint: a drag's previews keep it ([DR8]). */
let fullDomain: PressureDomain | null = null;
/** How long the last solve took (bench timing). */
let lastSolveMs = 0;

// A zero-delay task queued behind the messages already waiting (setTimeout would clamp).
const wake = new MessageChannel();
wake.port1.onmessage = () => {
  scheduled = false;
  const request = latest;
  latest = null;
  if (request) solve(request);
};

scope.onmessage = (event: MessageEvent<WorkerRequest>) => {
  const msg = event.data;
  switch (msg.type) {
    case 'solve':
      latest = msg;
      if (msg.scene) scene = msg.scene;
      if (!scheduled) {
        scheduled = true;
        wake.port2.postMessage(null);
      }
      break;
    case 'canvas':
      canvas = msg.canvas;
      // Opaque: the grid list paints the whole background, and the compositor then need not blend it.
      context = canvas.getContext('2d', { alpha: false });
      bench = msg.bench;
      paint();
      break;
    case 'scene':
      scene = msg.state;
      // A solve waiting to start paints anyway.
      if (!latest) paint();
      break;
    case 'picture':
      post({ type: 'picture', id: msg.id, bitmap: picture(msg.pixelRatio) });
      break;
  }
};

function solve(request: SolveRequest) {
  let answer: SolveResponse;
  try {
    const t0 = performance.now();
    const points = analyseDesignPoints(request.document, { selectedOnly: request.selectedOnly });
    const analysis = selectedAnalysis(points)!;
    lastSolveMs = performance.now() - t0;
    answer = { type: 'answer', seq: request.seq, ok: true, analysis, points, solveMs: lastSolveMs };
    if (analysis.result) lastGood = analysis;
    content = {
      points: request.document.section.points,
      result: lastGood?.result ?? null,
      solvedPoints: analysis.result ? analysis.solvedPoints : null,
      hinge: analysis.flap?.hinge ?? null,
      invalid: !analysis.result,
    };
  } catch (err) {
    // The solver throws only for programmer errors; say so rather than going silent.
    answer = { type: 'answer', seq: request.seq, ok: false, message: `The solver failed unexpectedly: ${(err as Error).message}` };
  }
  contentSeq = request.seq;
  // A drag's preview (only the selected point solved) is painted with a drag's detail, and its
  // answer waits for the pointer to pause (when the scene is painted in full again).
  const drag = request.selectedOnly === true;
  paint(lastSolveMs, drag ? 'drag' : 'full');
  answers.offer(answer, drag);
}

/** Paints the scene; `solveMs` is the solve it follows (0 for a scene change). */
function paint(solveMs = 0, detail: SceneDetail = 'full') {
  if (!canvas || !context || !scene) return;
  const t0 = performance.now();
  const w = Math.max(1, Math.round(scene.size.width * scene.pixelRatio));
  const h = Math.max(1, Math.round(scene.size.height * scene.pixelRatio));
  if (canvas.width !== w) canvas.width = w;
  if (canvas.height !== h) canvas.height = h;
  // A drag's previews keep the last full paint's colour range, so colours and legend hold still
  // while the pointer moves; the pause paints in full on the answer's own range ([DR8]).
  const domain = detail === 'drag' && fullDomain ? fullDomain : resultDomain(content.result);
  if (detail === 'full') fullDomain = domain;
  const lists = sceneLists(scene, content, detail, domain);
  dragDetailShown = detail === 'drag';
  const listed = performance.now();
  paintLists(context, scene, lists);
  tellShown(detail, domain);
  if (bench && contentSeq > 0) {
    const drawn = performance.now();
    // The canvas records the draw calls and rasterises them when it hands the frame on, in a
    // task of its own after this one (a trace shows it as FinalizeFrame; a task queued from here
    // can run before it). Reading a pixel rasterises them now, so the bench sees what it costs.
    context.getImageData(0, 0, 1, 1);
    const rasterised = performance.now();
    post({ type: 'painted', seq: contentSeq, at: performance.timeOrigin + drawn, solveMs, listsMs: listed - t0, paintMs: drawn - listed, rasterMs: rasterised - drawn });
  }
}

/** Tells the page the painted detail and colour domain when they change (the legend follows them). */
function tellShown(detail: SceneDetail, domain: PressureDomain) {
  if (shown.detail === detail && shown.min === domain.min && shown.max === domain.max) return;
  shown = { detail, min: domain.min, max: domain.max };
  post({ type: 'shown', detail, domain: { min: domain.min, max: domain.max } });
}

function picture(pixelRatio: number): ImageBitmap | null {
  if (!scene) return null;
  const out = new OffscreenCanvas(Math.round(scene.size.width * pixelRatio), Math.round(scene.size.height * pixelRatio));
  const ctx = out.getContext('2d');
  if (!ctx) return null;
  paintScene(ctx, { ...scene, pixelRatio }, content);
  return out.transferToImageBitmap();
}

function post(msg: WorkerResponse) {
  if (msg.type === 'picture' && msg.bitmap) scope.postMessage(msg, [msg.bitmap]);
  else scope.postMessage(msg);
}
