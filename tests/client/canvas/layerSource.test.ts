import { describe, expect, it, vi } from 'vitest';
import { computed, defineComponent, h, nextTick } from 'vue';
import { mount } from '@vue/test-utils';
import type { Point } from '@shared/model/sketch';
import { layerSourceOf, useCanvasLayers, type LayerProps } from '@/canvas/useCanvasLayers';
import { canvasProps, layerStandIns, wedge } from './layerHarness';

/** A drag's preview: the shown points move, nothing else. */
function dragMove(props: LayerProps, k: number) {
  props.points = wedge.map((p, i) => (i === 1 ? [p[0], p[1] + 0.001 * k] : p)) as Point[];
  props.resultSeq = 1 + k;
}

describe('[DR2] the overlay is not redrawn while a drag moves the shown points', () => {
  it('layerSourceOf reads each prop lazily: a computed over the pins does not re-run when the points move', () => {
    const props = canvasProps();
    const source = layerSourceOf(props, () => props.points);
    let runs = 0;
    const pins = computed(() => {
      runs++;
      return source.pins;
    });
    expect(pins.value).toEqual([]);
    for (let k = 1; k <= 10; k++) {
      dragMove(props, k);
      void pins.value;
    }
    expect(runs).toBe(1);
    props.pins = [{ id: 'pin_1', at: [0.5, 0.2], status: 'open', selected: false }];
    expect(pins.value).toHaveLength(1);
    expect(runs).toBe(2);
  });

  it('useCanvasLayers: twenty drag moves draw the overlay layer no more; a layer switched off redraws it once', async () => {
    const drawScene = vi.fn();
    // The overlay's Konva layer as the composable reads its template ref: getNode().drawScene().
    const getNode = () => ({ drawScene });
    const props = canvasProps();
    const { view, hover, tools } = layerStandIns();
    const Harness = defineComponent({
      setup() {
        useCanvasLayers(() => layerSourceOf(props, () => props.points), view, hover, tools);
        return () => h('div', [h('canvas', { ref: 'sceneCanvas' }), h('div', { ref: 'overlayLayer', onVnodeMounted: (vnode) => Object.assign(vnode.el as object, { getNode }) })]);
      },
    });
    const wrapper = mount(Harness);
    // A change the overlay shows, to know the watcher draws at all.
    props.layers = { ...props.layers, grid: false };
    await nextTick();
    await nextTick();
    const afterFirst = drawScene.mock.calls.length;
    expect(afterFirst).toBeGreaterThan(0);
    for (let k = 1; k <= 20; k++) {
      dragMove(props, k);
      await nextTick();
    }
    expect(drawScene.mock.calls.length).toBe(afterFirst);
    props.layers = { ...props.layers, grid: true };
    await nextTick();
    await nextTick();
    expect(drawScene.mock.calls.length).toBe(afterFirst + 1);
    wrapper.unmount();
  });
});
