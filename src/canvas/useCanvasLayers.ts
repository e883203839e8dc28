import { computed, onBeforeUnmount, useTemplateRef, watch } from 'vue';
import type Konva from 'konva';
import type { Context } from 'konva/lib/Context';
import type { Point } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import type { Highlight } from '@shared/protocol/messages';
import { MARQUEE, VERTEX_SELECTED } from './colors';
import { EMPTY_DRAW_LIST, drawList, type DrawList, type StrokePath } from './drawPaths';
import type { LayerSettings, LegendMode } from './layers';
import { legendModel } from './legend';
import { notePaint } from './paintTiming';
import { renderGrid, renderHud } from './renderGrid';
import { renderLimits } from './renderLimits';
import { renderPresence, type PresenceMark } from './renderPresence';
import { renderReadout } from './renderReadout';
import { renderReview, type CompareOutlines } from './renderReview';
import { renderSection } from './renderSection';
import { renderWaves, resultDomain } from './renderWaves';
import type { PinMarker } from './pins';
import type { ToolId } from './tools';
import type { CanvasHover } from './useCanvasHover';
import type { CanvasTools } from './useCanvasTools';
import type { CanvasView } from './useCanvasView';
import { toScreen } from './view';

/**
 * One Konva layer drawn from draw lists [D1]: a Shape whose config never changes and whose
 * sceneFunc strokes the current lists, so vue-konva never schedules a draw of its own. The layer
 * is drawn when its lists (or `alsoOn`) change — at once, or through `schedule` (the scene
 * waits for its solve). In the template: `<VLayer ref="<refName>"><VShape :config="shape" /></VLayer>`.
 */
export function useDrawLayer(
  refName: string,
  lists: () => DrawList | readonly DrawList[],
  options: { schedule?: (draw: () => void) => void; alsoOn?: () => unknown } = {},
) {
  const layer = useTemplateRef<{ getNode(): Konva.Layer }>(refName);
  const shape = {
    name: refName,
    listening: false,
    perfectDrawEnabled: false,
    sceneFunc: (ctx: Context) => {
      const l = lists();
      if (Array.isArray(l)) for (const one of l) drawList(ctx._context, one);
      else drawList(ctx._context, l as DrawList);
    },
  };
  const draw = () => layer.value?.getNode().draw();
  const { schedule, alsoOn } = options;
  watch(alsoOn ? [lists, alsoOn] : lists, () => (schedule ? schedule(draw) : draw()), { flush: 'post' });
  return { shape, draw };
}

/** What the layers read from the canvas's props. */
export interface LayerSource {
  points: readonly Point[];
  result: SolveResult | null;
  solvedPoints: readonly Point[] | null;
  hinge: Point | null;
  resultSeq: number;
  requestSeq: number;
  invalid: boolean;
  selection: readonly number[];
  tool: ToolId;
  layers: LayerSettings;
  legendMode: LegendMode;
  pins: readonly PinMarker[];
  compare: CompareOutlines | null;
  presence: readonly PresenceMark[];
  highlight: Highlight | null;
}

/**
 * While the shown section waits for its solve (a drag), its redraw is held until the answer
 * comes, so the section and its wave map are drawn together once per move; a slow solve still
 * lets the section move after this long.
 */
export const SCENE_HOLD_MAX_MS = 40;

/**
 * Every layer of SketchCanvas.vue, bottom to top: grid, scene (wave map, section, the tools'
 * overlay, limit rings), presence, review, HUD (scale bar and legend). Pure renderers
 * (render*.ts) turn (section, result, view, settings) into draw lists; keyed computeds keep an
 * unchanged input from redrawing anything downstream. Limit labels are Konva Text nodes in
 * the template (`limits.labels`).
 */
export function useCanvasLayers(source: () => LayerSource, canvas: CanvasView, hover: CanvasHover, tools: CanvasTools) {
  const { view, size } = canvas;
  // Keyed by value so that an unchanged domain keeps its object and nothing downstream redraws.
  const domainKey = computed(() => {
    const d = resultDomain(source().result);
    return `${d.min} ${d.max}`;
  });
  const domain = computed(() => {
    const [min, max] = domainKey.value.split(' ').map(Number);
    return { min, max };
  });

  const gridList = computed(() => renderGrid(view.value, size.value, source().layers.grid));
  const waveList = computed(() => renderWaves(source().result, view.value, source().layers, domain.value));
  const sectionList = computed(() => {
    const s = source();
    return renderSection(s.points, s.result, view.value, s.layers, domain.value, {
      selection: s.selection,
      invalid: s.invalid,
      hoverVertex: hover.hover.value.vertex,
      hoverFacet: hover.hover.value.facet,
      showVertices: s.tool !== 'moveSection',
      solvedPoints: s.solvedPoints,
      hinge: s.hinge,
    });
  });
  const overlayList = computed(() => overlay(tools, view.value));
  const readoutList = computed(() => renderReadout(source().points, tools.readout.value, view.value, size.value));
  const limits = computed(() => {
    const s = source();
    return s.layers.limits && !s.invalid ? renderLimits(s.result, view.value, size.value) : { marks: EMPTY_DRAW_LIST, labels: [] };
  });
  const legend = computed(() => {
    const r = source().result;
    return r ? legendModel(domain.value, source().legendMode, r.condition.mach, r.condition.gamma) : null;
  });
  const hudList = computed(() => {
    const l = source().layers;
    return renderHud(view.value, size.value, l.shocks || l.fans || l.surfaceCp ? legend.value : null, l.grid);
  });
  const reviewList = computed(() => renderReview(source().pins, source().compare, view.value));
  const presenceList = computed(() => {
    const s = source();
    return renderPresence(s.presence, s.points, view.value, s.highlight, s.invalid ? null : s.result);
  });

  // The scene: held while a solve of the shown section is running (see SCENE_HOLD_MAX_MS).
  let heldDraw: ReturnType<typeof setTimeout> | null = null;
  function drawSceneNow(draw: () => void) {
    if (heldDraw) clearTimeout(heldDraw);
    heldDraw = null;
    draw();
    notePaint(source().resultSeq);
  }
  const scene = useDrawLayer('sceneLayer', () => [waveList.value, sectionList.value, overlayList.value, limits.value.marks, readoutList.value], {
    // A result that changes nothing on screen still ends a hold (and counts as its paint).
    alsoOn: () => source().resultSeq,
    schedule: (draw) => {
      const s = source();
      if (s.requestSeq > s.resultSeq) {
        heldDraw ??= setTimeout(() => drawSceneNow(draw), SCENE_HOLD_MAX_MS);
        return;
      }
      drawSceneNow(draw);
    },
  });
  onBeforeUnmount(() => {
    if (heldDraw) clearTimeout(heldDraw);
  });

  const grid = useDrawLayer('gridLayer', () => gridList.value);
  const presence = useDrawLayer('presenceLayer', () => presenceList.value);
  const review = useDrawLayer('reviewLayer', () => reviewList.value);
  const hud = useDrawLayer('hudLayer', () => hudList.value);

  return {
    domain,
    limits,
    shapes: { grid: grid.shape, scene: scene.shape, presence: presence.shape, review: review.shape, hud: hud.shape },
  };
}

/** The tools' transient drawing: the marquee, the draw tool's open path, the insert ghost. */
function overlay(tools: CanvasTools, view: CanvasView['view']['value']): DrawList {
  const list: DrawList = { paths: [], dots: [] };
  const marquee = tools.marquee.value;
  if (marquee) {
    const [x0, y0] = toScreen(view, [marquee.x0, marquee.y0]);
    const [x1, y1] = toScreen(view, [marquee.x1, marquee.y1]);
    list.paths.push({ points: [x0, y0, x1, y0, x1, y1, x0, y1], colour: MARQUEE, width: 1, dash: [4, 3], closed: true, fill: 'rgba(95, 208, 196, 0.08)' });
  }
  const path = tools.drawPath.value;
  if (path && path.points.length > 0) {
    const pts = path.points.map((p) => toScreen(view, p));
    const line: StrokePath = { points: pts.flat(), colour: VERTEX_SELECTED, width: 1.5 };
    if (path.cursor) line.points.push(...toScreen(view, path.cursor));
    list.paths.push(line);
    pts.forEach(([x, y], i) => list.dots.push({ x, y, radius: i === 0 ? 5 : 3.5, fill: i === 0 ? VERTEX_SELECTED : '#e9f1f2', stroke: '#0c1418' }));
  }
  const ghost = tools.ghost.value;
  if (ghost) {
    const [x, y] = toScreen(view, ghost);
    list.dots.push({ x, y, radius: 5, fill: 'rgba(95, 208, 196, 0.35)', stroke: VERTEX_SELECTED, strokeWidth: 1.5 });
  }
  return list;
}
