import { computed, shallowRef } from 'vue';
import type { Point } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import type { Highlight } from '@shared/protocol/messages';
import { hitFacet, hitVertex, hitWave } from './geometry';
import type { LayerSettings, LegendMode } from './layers';
import { facetPressures } from './renderSection';
import { waveVisible } from './renderWaves';
import { facetTooltip, waveTooltip, type Tooltip } from './tooltips';
import type { ToolId } from './tools';
import type { CanvasView } from './useCanvasView';
import { isotropic } from './view';

/** How close (pixels) the pointer must be to a vertex, facet or wave for hover and pins. */
export const HOVER_TOLERANCE_PX = 6;

export interface HoverState {
  vertex: number | null;
  facet: number | null;
  tooltip: Tooltip | null;
  /** Pointer on the canvas, pixels (where the tooltip goes). */
  x: number;
  y: number;
}

export interface HoverSource {
  points: readonly Point[];
  result: SolveResult | null;
  invalid: boolean;
  tool: ToolId;
  layers: LayerSettings;
  legendMode: LegendMode;
}

/**
 * What the pointer is over while no button is held (SketchCanvas.vue): a vertex, a facet (with
 * its pressures) or a visible wave, by the pure hit tests of geometry.ts on the shown data.
 * `onTarget` hears each change of target (a walkthrough lead's highlight).
 */
export function useCanvasHover(source: () => HoverSource, canvas: CanvasView, onTarget: (target: Highlight) => void) {
  const hover = shallowRef<HoverState>({ vertex: null, facet: null, tooltip: null, x: 0, y: 0 });
  let hoverWaveId: string | null = null;

  function setHover(vertex: number | null, facet: number | null, tooltip: Tooltip | null, x: number, y: number, waveId: string | null = null) {
    const h = hover.value;
    if (h.vertex !== vertex || h.facet !== facet || hoverWaveId !== waveId) {
      hoverWaveId = waveId;
      onTarget(vertex !== null ? { kind: 'vertex', id: vertex } : facet !== null ? { kind: 'facet', id: facet } : waveId !== null ? { kind: 'wave', id: waveId } : null);
    }
    if (h.vertex === vertex && h.facet === facet && h.tooltip === tooltip && h.x === x && h.y === y) return;
    hover.value = { vertex, facet, tooltip, x, y };
  }

  function clearHover() {
    setHover(null, null, null, 0, 0);
  }

  function updateHover(world: Point, screen: readonly [number, number]) {
    const s = source();
    const tol = HOVER_TOLERANCE_PX / canvas.view.value.scale;
    const metric = isotropic(canvas.view.value);
    const [x, y] = screen;
    const vertex = s.tool === 'moveSection' ? null : hitVertex(s.points, world, tol, metric);
    if (vertex !== null) return setHover(vertex, null, null, x, y);
    const result = s.result;
    const facetHit = hitFacet(s.points, world, tol, metric);
    if (facetHit) {
      const tip = result && facetPressures(result, s.points.length) ? facetTooltip(facetHit.index, result) : null;
      return setHover(null, facetHit.index, tip, x, y);
    }
    if (result && !s.invalid) {
      const w = hitWave(result.waves, world, tol, (wave) => waveVisible(wave, s.layers), metric);
      if (w) return setHover(null, null, waveTooltip(w.wave, w.ray, result, s.legendMode, w.segment), x, y, w.wave.id);
    }
    setHover(null, null, null, x, y);
  }

  /** The tooltip beside the pointer, flipped to stay inside the canvas. */
  const tooltipStyle = computed(() => {
    const { x, y } = hover.value;
    const size = canvas.size.value;
    const left = x + 260 > size.width ? x - 256 : x + 16;
    const top = y + 110 > size.height ? y - 104 : y + 16;
    return { left: `${left}px`, top: `${top}px` };
  });

  return { hover, clearHover, updateHover, tooltipStyle };
}

export type CanvasHover = ReturnType<typeof useCanvasHover>;
