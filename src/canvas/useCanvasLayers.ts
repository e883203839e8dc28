import { computed, onMounted, ref, useTemplateRef, watch } from 'vue';
import type Konva from 'konva';
import type { Context } from 'konva/lib/Context';
import type { Point } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import type { Highlight } from '@shared/protocol/messages';
import { firstItems } from '@shared/util/invariant';
import type { ScenePort } from '@/composables/useLiveSolve';
import { EMPTY_DRAW_LIST, drawList, type DrawList } from './drawPaths';
import type { LayerSettings, LegendMode } from './layers';
import { legendModel } from './legend';
import { notePaint } from './paintTiming';
import { renderHud } from './renderGrid';
import { renderLimits } from './renderLimits';
import { renderPresence, type PresenceMark } from './renderPresence';
import { renderReview, type CompareOutlines } from './renderReview';
import { MEETING_STYLE, SLIP_DASH_PX, WAVE_WIDTH_PX, resultDomain } from './renderWaves';
import type { LineStyleKey } from './renderGrid';
import { paintScene, type SceneContent, type SceneState } from './scenePainter';
import type { PinMarker } from './pins';
import type { ToolId } from './tools';
import type { CanvasHover } from './useCanvasHover';
import type { CanvasTools } from './useCanvasTools';
import type { CanvasView } from './useCanvasView';

/**
 * One Konva layer drawn from draw lists [DR2]: a Shape whose config never changes and whose
 * sceneFunc strokes the current lists, so vue-konva never schedules a draw of its own. The layer
 * is drawn when its lists change. In the template:
 * `<VLayer ref="<refName>"><VShape :config="shape" /></VLayer>`.
 */
export function useDrawLayer(refName: string, lists: () => DrawList | readonly DrawList[]) {
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
  // drawScene: the layers take no pointer events (hit tests are ours), so there is no hit canvas to draw.
  const draw = () => layer.value?.getNode().drawScene();
  watch(lists, draw, { flush: 'post' });
  return { shape, draw };
}

/** What the layers read from the canvas's props. */
export interface LayerSource {
  points: readonly Point[];
  result: SolveResult | null;
  solvedPoints: readonly Point[] | null;
  hinge: Point | null;
  resultSeq: number;
  invalid: boolean;
  selection: readonly number[];
  tool: ToolId;
  layers: LayerSettings;
  legendMode: LegendMode;
  pins: readonly PinMarker[];
  compare: CompareOutlines | null;
  presence: readonly PresenceMark[];
  highlight: Highlight | null;
  /** The solver worker's scene port; absent (tests, an old browser): the page paints the scene. */
  scenePort: ScenePort | null;
}

/** The canvas's props as `useCanvasLayers` reads them (optional ones may be absent). */
export type LayerProps = Omit<LayerSource, 'hinge' | 'pins' | 'compare' | 'presence' | 'highlight' | 'scenePort'> & {
  hinge?: Point | null;
  pins?: readonly PinMarker[];
  compare?: CompareOutlines | null;
  presence?: readonly PresenceMark[];
  highlight?: Highlight | null;
  scenePort?: ScenePort | null;
};

/**
 * The layers' source read lazily from the canvas's (reactive) props: each field is a getter, so
 * a computed that reads `pins` depends on `pins` alone. Built as a plain object of all the props
 * at once, every computed here would depend on every prop — the shown points change with each
 * move of a drag, and the overlay would be redrawn with each move [DR2]. The shown points come
 * through their own getter (`points`): the canvas receives them as one, so that its parent does
 * not re-render with every move [DR9].
 */
export function layerSourceOf(props: Omit<LayerProps, 'points'>, points: () => readonly Point[]): LayerSource {
  return {
    get points() {
      return points();
    },
    get result() {
      return props.result;
    },
    get solvedPoints() {
      return props.solvedPoints;
    },
    get hinge() {
      return props.hinge ?? null;
    },
    get resultSeq() {
      return props.resultSeq;
    },
    get invalid() {
      return props.invalid;
    },
    get selection() {
      return props.selection;
    },
    get tool() {
      return props.tool;
    },
    get layers() {
      return props.layers;
    },
    get legendMode() {
      return props.legendMode;
    },
    get pins() {
      return props.pins ?? NO_PINS;
    },
    get compare() {
      return props.compare ?? null;
    },
    get presence() {
      return props.presence ?? NO_PRESENCE;
    },
    get highlight() {
      return props.highlight ?? null;
    },
    get scenePort() {
      return props.scenePort ?? null;
    },
  };
}

const NO_PINS: readonly PinMarker[] = [];
const NO_PRESENCE: readonly PresenceMark[] = [];

/**
 * The canvas's two surfaces, bottom to top:
 *
 * - the **scene** (grid, wave map, section, the tools' marks, limit rings, drag readout) on a
 *   plain `<canvas ref="sceneCanvas">`, painted by the solver worker right after each solve
 *   (scenePainter.ts [DR1]); this composable sends it the `SceneState` whenever the view, the
 *   settings, the selection, the hover or the tools' marks change. Without a worker port the
 *   page paints the same scene from its props.
 * - the **overlay**, one Konva layer: limit labels (Konva Text), people's cursors and the
 *   walkthrough highlight, review pins and compared outlines, and the HUD (scale bar, legend).
 *
 * `source` should read its fields lazily (`layerSourceOf`), so that each part depends only on
 * what it reads.
 */
export function useCanvasLayers(source: () => LayerSource, canvas: CanvasView, hover: CanvasHover, tools: CanvasTools) {
  const { view, size } = canvas;
  /** True once the worker paints the scene. */
  const inWorker = ref(false);
  // The colours' range: the one the worker says the scene on screen was painted with (during a
  // drag the preview's, whose answer waits for the pause [DR8]), else the shown result's. Keyed
  // by value so that an unchanged domain keeps its object and nothing downstream redraws.
  const domainKey = computed(() => {
    const painted = inWorker.value ? source().scenePort?.shown()?.domain : undefined;
    const d = painted ?? resultDomain(source().result);
    return `${d.min} ${d.max}`;
  });
  const domain = computed(() => {
    // The key is the two numbers written just above.
    const [min, max] = firstItems(domainKey.value.split(' ').map(Number), 2);
    return { min, max };
  });

  // ---- scene ----
  const pixelRatio = typeof window !== 'undefined' ? window.devicePixelRatio || 1 : 1;
  // Primitives, so that a pointer moving over the same vertex (the tooltip follows it) changes nothing here.
  const hoverVertex = computed(() => hover.hover.value.vertex);
  const hoverFacet = computed(() => hover.hover.value.facet);
  const sceneState = computed<SceneState>(() => {
    const s = source();
    return {
      size: size.value,
      pixelRatio,
      view: view.value,
      layers: s.layers,
      selection: s.selection,
      hoverVertex: hoverVertex.value,
      hoverFacet: hoverFacet.value,
      showVertices: s.tool !== 'moveSection',
      marquee: tools.marquee.value,
      drawPath: tools.drawPath.value,
      ghost: tools.ghost.value,
      readoutVertex: tools.readout.value,
    };
  });
  const sceneCanvas = useTemplateRef<HTMLCanvasElement>('sceneCanvas');

  onMounted(() => {
    const el = sceneCanvas.value;
    const port = source().scenePort;
    inWorker.value = !!el && !!port && port.attach(el);
    if (inWorker.value) port!.update(toRawState(sceneState.value));
    else paintHere();
  });
  // 'sync': the state goes out with the solve of the same pointer event (useLiveSolve batches both).
  watch(sceneState, (state) => {
    if (inWorker.value) source().scenePort?.update(toRawState(state));
  }, { flush: 'sync' });

  // Without a worker: paint from the props (section and result of the same answer).
  const content = computed<SceneContent>(() => {
    const s = source();
    return { points: s.points, result: s.result, solvedPoints: s.solvedPoints, hinge: s.hinge, invalid: s.invalid };
  });
  function paintHere() {
    const el = sceneCanvas.value;
    const ctx = el?.getContext('2d');
    if (!el || !ctx) return;
    const state = sceneState.value;
    const w = Math.round(state.size.width * state.pixelRatio);
    const h = Math.round(state.size.height * state.pixelRatio);
    if (el.width !== w) el.width = w;
    if (el.height !== h) el.height = h;
    paintScene(ctx, state, content.value);
    notePaint(source().resultSeq);
  }
  watch([sceneState, content], () => {
    if (!inWorker.value) paintHere();
  }, { flush: 'post' });

  /** The scene at `ratio` device pixels per CSS pixel, for a PNG. */
  async function scenePicture(ratio: number): Promise<CanvasImageSource | null> {
    if (inWorker.value) return (await source().scenePort?.picture(ratio)) ?? null;
    const state = sceneState.value;
    const out = document.createElement('canvas');
    out.width = Math.round(state.size.width * ratio);
    out.height = Math.round(state.size.height * ratio);
    const ctx = out.getContext('2d');
    if (!ctx) return null;
    paintScene(ctx, { ...state, pixelRatio: ratio }, content.value);
    return out;
  }

  // ---- overlay ----
  const limits = computed(() => {
    const s = source();
    return s.layers.limits && !s.invalid ? renderLimits(s.result, view.value, size.value) : { marks: EMPTY_DRAW_LIST, labels: [], hidden: 0 };
  });
  const legend = computed(() => {
    const r = source().result;
    return r ? legendModel(domain.value, source().legendMode, r.condition.mach, r.condition.gamma) : null;
  });
  // The chord the coefficients are referenced to, in drawing units (not 1 after an import at
  // physical size): the scale bar counts chords of it.
  const referenceChord = computed(() => source().result?.geometry.reference.chord ?? 1);
  const hudList = computed(() => {
    const l = source().layers;
    return renderHud(view.value, size.value, l.shocks || l.fans || l.surfaceCp || l.pressureField ? legend.value : null, l.grid, source().result ? lineStyleKey(l) : [], referenceChord.value);
  });
  const reviewList = computed(() => renderReview(source().pins, source().compare, view.value));
  // The result matters only for a highlighted wave: otherwise a new answer (every move of a
  // drag) must not redraw the overlay.
  const highlightResult = computed(() => {
    const s = source();
    return s.highlight?.kind === 'wave' && !s.invalid ? s.result : null;
  });
  // Likewise the shown points (they change with every move) only when a mark sits on a vertex or facet.
  const presencePoints = computed(() => {
    const s = source();
    const onOutline = (s.highlight && s.highlight.kind !== 'wave') || s.presence.some((m) => m.selection.length > 0);
    return onOutline ? s.points : NO_POINTS;
  });
  const presenceList = computed(() => {
    const s = source();
    return renderPresence(s.presence, presencePoints.value, view.value, s.highlight, highlightResult.value);
  });
  const overlay = useDrawLayer('overlayLayer', () => [presenceList.value, reviewList.value, hudList.value]);

  /** The detail of the scene on screen ([DR6]): as the worker reports it; the page paints in full. */
  const sceneDetail = computed(() => (inWorker.value ? (source().scenePort?.shown()?.detail ?? null) : 'full'));

  return { domain, limits, scenePicture, sceneDetail, shapes: { overlay: overlay.shape } };
}

const NO_POINTS: readonly Point[] = [];

const KEY_COLOUR = '#d7e3e6';

/** The line-style key for the layers shown (colours there are the pressure scale's). */
export function lineStyleKey(l: LayerSettings): LineStyleKey[] {
  const out: LineStyleKey[] = [];
  if (l.shocks) out.push({ label: 'shock', colour: KEY_COLOUR, width: WAVE_WIDTH_PX.shock });
  if (l.fans) out.push({ label: 'expansion fan ray', colour: KEY_COLOUR, width: WAVE_WIDTH_PX.fan });
  if (l.machLines) out.push({ label: 'Mach line', colour: KEY_COLOUR, width: WAVE_WIDTH_PX.mach, alpha: 0.85 });
  if (l.slipLine) out.push({ label: 'slip line', colour: KEY_COLOUR, width: WAVE_WIDTH_PX.slip, dash: SLIP_DASH_PX });
  if (l.meetings) {
    out.push({ label: 'ray absorbed by a shock', colour: KEY_COLOUR, width: 0, dot: { ...MEETING_STYLE.absorbed } });
    out.push({ label: 'shocks merged / waves crossed', colour: KEY_COLOUR, width: 0, dot: { ...MEETING_STYLE.merged } });
  }
  if (l.pressureField) out.push({ label: 'region filled by its p/p∞', colour: KEY_COLOUR, width: 0, swatch: '#6fa8b8', alpha: 0.5 });
  return out;
}

/** A plain copy for postMessage (reactive proxies cannot be cloned). */
function toRawState(state: SceneState): SceneState {
  return {
    ...state,
    size: { ...state.size },
    view: { ...state.view },
    layers: { ...state.layers },
    selection: [...state.selection],
    marquee: state.marquee ? { ...state.marquee } : null,
    drawPath: state.drawPath ? { points: state.drawPath.points.map((p) => [p[0], p[1]] as Point), cursor: state.drawPath.cursor ? [state.drawPath.cursor[0], state.drawPath.cursor[1]] : null } : null,
    ghost: state.ghost ? [state.ghost[0], state.ghost[1]] : null,
  };
}
