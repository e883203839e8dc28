import { describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick, reactive, ref, shallowRef } from 'vue';
import { mount } from '@vue/test-utils';
import type { Point } from '@shared/model/sketch';
import { parseSolveInput } from '@shared/model/solveInput';
import { solveSection } from '@shared/solver';
import type { PressureDomain } from '@/canvas/colors';
import { DEFAULT_LAYERS } from '@/canvas/layers';
import { resultDomain } from '@/canvas/renderWaves';
import type { SceneDetail } from '@/canvas/scenePainter';
import { layerSourceOf, useCanvasLayers, type LayerProps } from '@/canvas/useCanvasLayers';
import type { CanvasHover } from '@/canvas/useCanvasHover';
import type { CanvasTools } from '@/canvas/useCanvasTools';
import type { CanvasView } from '@/canvas/useCanvasView';
import type { ScenePort } from '@/composables/useLiveSolve';

const wedge: Point[] = [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]];
const parsed = parseSolveInput({ section: { points: wedge }, flow: { mach: 2, alphaDeg: 2 } });
if (!parsed.ok) throw new Error('bad input');
const result = solveSection(parsed.value);

function canvasProps(): LayerProps {
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

describe('[DR8] the legend states the range of the colours on screen', () => {
  it('useCanvasLayers: with the worker painting, the legend takes the range the worker reports it painted with, else the shown result\'s', async () => {
    const props = canvasProps();
    const painted = shallowRef<{ detail: SceneDetail; domain: PressureDomain } | null>(null);
    const port: ScenePort = { attach: () => true, update: () => {}, picture: async () => null, shown: () => painted.value, flush: () => {} };
    props.scenePort = port;
    const view = { size: ref({ width: 800, height: 500 }), view: ref({ scale: 400, originX: 100, originY: 250 }) } as unknown as CanvasView;
    const hover = { hover: ref({ vertex: null, facet: null, wave: null, tooltip: null }) } as unknown as CanvasHover;
    const tools = { marquee: ref(null), drawPath: ref(null), ghost: ref(null), readout: ref(1) } as unknown as CanvasTools;
    let layers: ReturnType<typeof useCanvasLayers> | null = null;
    const Harness = defineComponent({
      setup() {
        layers = useCanvasLayers(() => layerSourceOf(props, () => props.points), view, hover, tools);
        return () => h('div', [h('canvas', { ref: 'sceneCanvas' }), h('div', { ref: 'overlayLayer' })]);
      },
    });
    const wrapper = mount(Harness);
    await nextTick();
    const shown = layers!;
    // Nothing painted yet: the result's own range.
    expect(shown.domain.value).toEqual(resultDomain(result));
    expect(shown.sceneDetail.value).toBeNull();
    // A scene painted on another range than the page's last answer (the worker says so): the legend follows the picture.
    painted.value = { detail: 'drag', domain: { min: 0.25, max: 4 } };
    expect(shown.domain.value).toEqual({ min: 0.25, max: 4 });
    expect(shown.sceneDetail.value).toBe('drag');
    // The pause: painted in full with the answer's range.
    painted.value = { detail: 'full', domain: resultDomain(result) };
    expect(shown.domain.value).toEqual(resultDomain(result));
    expect(shown.sceneDetail.value).toBe('full');
    wrapper.unmount();
  });
});
