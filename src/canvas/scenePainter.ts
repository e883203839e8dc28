import type { Point } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import { MARQUEE, VERTEX_SELECTED, type PressureDomain } from './colors';
import { drawList, type DrawList, type StrokePath } from './drawPaths';
import type { Rect } from './geometry';
import type { LayerSettings } from './layers';
import { renderGrid } from './renderGrid';
import { renderLimits } from './renderLimits';
import { renderReadout } from './renderReadout';
import { renderSection } from './renderSection';
import { FIELD_ROW_DRAG_PX, FIELD_ROW_PX, renderField } from './renderField';
import { FAN_RAY_GAP_DRAG_PX, FAN_RAY_GAP_PX, renderMeetings, renderWaves, resultDomain } from './renderWaves';
import { toScreen, type Size, type View } from './view';

/**
 * The scene: everything drawn under the labels and people — grid, wave map, section, the
 * tools' marks (marquee, the draw tool's path, the insert ghost), limit rings and the drag
 * readout — painted on one canvas from pure draw lists. The solver worker paints it on a
 * transferred OffscreenCanvas right after each solve, so during a drag the page's main thread
 * never renders, rasterises or waits for it (README "Performance notes"); where a browser
 * cannot transfer a canvas, the page paints it with the same function.
 *
 * State from the page (view, settings, selection, hover, the tools' marks) travels as a
 * `SceneState`; what the solve decides (the section as solved, its result, whether it could be
 * solved) is `SceneContent`. A vertex named by index (selection, hover, readout) is looked up in
 * the content's points, so marks always sit on the outline they are drawn with.
 */
export interface SceneState {
  size: Size;
  /** Device pixels per CSS pixel. */
  pixelRatio: number;
  view: View;
  layers: LayerSettings;
  selection: readonly number[];
  hoverVertex: number | null;
  hoverFacet: number | null;
  /** Vertices get dots (off while moving the whole section). */
  showVertices: boolean;
  marquee: Rect | null;
  drawPath: { points: Point[]; cursor: Point | null } | null;
  ghost: Point | null;
  /** The vertex being dragged, for the t/c and ridge readout beside it; null = no readout. */
  readoutVertex: number | null;
}

export interface SceneContent {
  /** The section as shown (the document solved last, or a drag's preview). */
  points: readonly Point[];
  /** The last result that could be solved (kept while the shown section cannot be). */
  result: SolveResult | null;
  /** The outline the solver saw (differs from `points` with a deflected flap). */
  solvedPoints: readonly Point[] | null;
  hinge: Point | null;
  /** The shown section cannot be solved (not a simple polygon). */
  invalid: boolean;
}

export const EMPTY_SCENE_CONTENT: SceneContent = { points: [], result: null, solvedPoints: null, hinge: null, invalid: false };

/**
 * How much detail the scene is drawn with ([DR6], [DR7]): `full`, or `drag` — painted on every
 * move of a drag, with the pressure field in rows of FIELD_ROW_DRAG_PX, fan rays at least
 * FAN_RAY_GAP_DRAG_PX apart, no meeting marks, vertex dots thinned and the Cp shading in runs
 * of one colour; the worker paints the full detail again when the pointer pauses.
 */
export type SceneDetail = 'full' | 'drag';

/**
 * The scene's draw lists, bottom to top (pure; tests read them). The colours span `domain`, by
 * default the result's own (`resultDomain`); a drag's previews are painted on the range of the
 * last full paint, so that colours and legend hold still while the pointer moves ([DR8]).
 */
export function sceneLists(state: SceneState, content: SceneContent, detail: SceneDetail = 'full', domain: PressureDomain = resultDomain(content.result)): DrawList[] {
  const { view, size, layers } = state;
  const drag = detail === 'drag';
  // The pressure field's rows and the meeting marks go with the waves: a list draws its row
  // picture first (translucent, over the grid's background and lines), then the lines, then the dots.
  const field = renderField(content.result, content.solvedPoints ?? content.points, view, size, layers.pressureField ?? true, domain, drag ? FIELD_ROW_DRAG_PX : FIELD_ROW_PX);
  // A drag leaves the meeting marks out ([DR7]): specks at hundreds of points nobody reads while moving.
  const meetings = renderMeetings(content.result, view, size, !drag && (layers.meetings ?? true));
  const waves = renderWaves(content.result, view, layers, domain, drag ? FAN_RAY_GAP_DRAG_PX : FAN_RAY_GAP_PX);
  const lists: DrawList[] = [
    renderGrid(view, size, layers.grid),
    // Thin lines whose crossings nobody can tell apart: stroked in batches (drawPaths.ts).
    { ...waves, image: field.image, dots: meetings.dots, unordered: true },
    renderSection(content.points, content.result, view, layers, domain, {
      selection: state.selection,
      invalid: content.invalid,
      hoverVertex: state.hoverVertex,
      hoverFacet: state.hoverFacet,
      showVertices: state.showVertices,
      solvedPoints: content.solvedPoints,
      hinge: content.hinge,
      drag: drag ? { keepVertex: state.readoutVertex } : null,
    }),
    toolMarks(state),
  ];
  if (layers.limits && !content.invalid) lists.push(renderLimits(content.result, view, size).marks);
  const at = state.readoutVertex !== null ? content.points[state.readoutVertex] : undefined;
  if (at) lists.push(renderReadout(content.points, at, view, size));
  return lists;
}

/** Paints the scene on a 2D context whose canvas is `size × pixelRatio` device pixels. */
export function paintScene(ctx: CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D, state: SceneState, content: SceneContent, detail: SceneDetail = 'full'): void {
  paintLists(ctx, state, sceneLists(state, content, detail));
}

/** Paints draw lists built by `sceneLists` (the worker times the two steps apart for the bench). */
export function paintLists(ctx: CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D, state: Pick<SceneState, 'pixelRatio'>, lists: readonly DrawList[]): void {
  const c = ctx as CanvasRenderingContext2D;
  c.setTransform(1, 0, 0, 1, 0, 0);
  c.clearRect(0, 0, c.canvas.width, c.canvas.height);
  c.setTransform(state.pixelRatio, 0, 0, state.pixelRatio, 0, 0);
  for (const list of lists) drawList(c, list);
}

/** The tools' transient drawing: the marquee, the draw tool's open path, the insert ghost. */
export function toolMarks(state: Pick<SceneState, 'view' | 'marquee' | 'drawPath' | 'ghost'>): DrawList {
  const { view } = state;
  const list: DrawList = { paths: [], dots: [] };
  const marquee = state.marquee;
  if (marquee) {
    const [x0, y0] = toScreen(view, [marquee.x0, marquee.y0]);
    const [x1, y1] = toScreen(view, [marquee.x1, marquee.y1]);
    list.paths.push({ points: [x0, y0, x1, y0, x1, y1, x0, y1], colour: MARQUEE, width: 1, dash: [4, 3], closed: true, fill: 'rgba(95, 208, 196, 0.08)' });
  }
  const path = state.drawPath;
  if (path && path.points.length > 0) {
    const pts = path.points.map((p) => toScreen(view, p));
    const line: StrokePath = { points: pts.flat(), colour: VERTEX_SELECTED, width: 1.5 };
    if (path.cursor) line.points.push(...toScreen(view, path.cursor));
    list.paths.push(line);
    pts.forEach(([x, y], i) => list.dots.push({ x, y, radius: i === 0 ? 5 : 3.5, fill: i === 0 ? VERTEX_SELECTED : '#e9f1f2', stroke: '#0c1418' }));
  }
  const ghost = state.ghost;
  if (ghost) {
    const [x, y] = toScreen(view, ghost);
    list.dots.push({ x, y, radius: 5, fill: 'rgba(95, 208, 196, 0.35)', stroke: VERTEX_SELECTED, strokeWidth: 1.5 });
  }
  return list;
}
