import { describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick, shallowRef } from 'vue';
import { mount } from '@vue/test-utils';
import type { PressureDomain } from '@/canvas/colors';
import { resultDomain } from '@/canvas/renderWaves';
import type { SceneDetail } from '@/canvas/scenePainter';
import { layerSourceOf, useCanvasLayers } from '@/canvas/useCanvasLayers';
import { canvasProps, layerStandIns, result } from './layerHarness';
import type { ScenePort } from '@/composables/useLiveSolve';

describe('[DR8] the legend states the range of the colours on screen', () => {
  it('useCanvasLayers: with the worker painting, the legend takes the range the worker reports it painted with, else the shown result\'s', async () => {
    const props = canvasProps();
    const painted = shallowRef<{ detail: SceneDetail; domain: PressureDomain } | null>(null);
    const port: ScenePort = { attach: () => true, update: () => {}, picture: async () => null, shown: () => painted.value, flush: () => {} };
    props.scenePort = port;
    const { view, hover, tools } = layerStandIns();
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
