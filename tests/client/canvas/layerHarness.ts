/**
 * What the canvas layer tests mount `useCanvasLayers` with: a 6 % diamond solved at M 2, α 2°
 * (our own test section), the canvas's props around it, and stand-ins for the view, the hover
 * and the tools holding only what the layers read.
 */
import { reactive, ref } from 'vue';
import type { Point } from '@shared/model/sketch';
import { parseSolveInput } from '@shared/model/solveInput';
import { solveSection } from '@shared/solver';
import { DEFAULT_LAYERS } from '@/canvas/layers';
import type { LayerProps } from '@/canvas/useCanvasLayers';
import type { CanvasHover } from '@/canvas/useCanvasHover';
import type { CanvasTools } from '@/canvas/useCanvasTools';
import type { CanvasView } from '@/canvas/useCanvasView';

export const wedge: Point[] = [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]];
const parsed = parseSolveInput({ section: { points: wedge }, flow: { mach: 2, alphaDeg: 2 } });
if (!parsed.ok) throw new Error('bad input');
export const result = solveSection(parsed.value);

export function canvasProps(): LayerProps {
  return reactive({
    points: wedge,
    result,
    solvedPoints: wedge,
    resultSeq: 1,
    invalid: false,
    selection: [1],
    tool: 'select',
    layers: { ...DEFAULT_LAYERS },
    legendMode: 'pressureRatio',
  }) as LayerProps;
}

/** An 800 × 500 view at 400 px per chord, nothing hovered, no tool drawing. */
export function layerStandIns(): { view: CanvasView; hover: CanvasHover; tools: CanvasTools } {
  return {
    view: { size: ref({ width: 800, height: 500 }), view: ref({ scale: 400, originX: 100, originY: 250 }) } as unknown as CanvasView,
    hover: { hover: ref({ vertex: null, facet: null, wave: null, tooltip: null }) } as unknown as CanvasHover,
    tools: { marquee: ref(null), drawPath: ref(null), ghost: ref(null), readout: ref(1) } as unknown as CanvasTools,
  };
}
