/**
 * The editor's Cp charts (the results panel's and the snapshot comparison's) plot Cp negative up
 * (suction up) and say so on the axis, as the PDF report does — common practice for pressure
 * distributions. The values stay the true Cp (only the axis is inverted), so tooltips read Cp.
 */
import { describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { mount } from '@vue/test-utils';
import { analyseSketch } from '@shared/flight/analyseSketch';
import { sketchCase, type SketchDocument } from '@shared/model/sketch';
import { oneCondition } from '../helpers/documents';

// ECharts draws on a canvas happy-dom does not have: the chart is a stand-in that keeps its option.
vi.mock('vue-echarts', () => ({
  default: defineComponent({ name: 'VChart', props: { option: { type: Object, required: true } }, setup: () => () => h('div', { class: 'chart-stub' }) }),
}));

const { default: SketchCpChart } = await import('@/components/SketchCpChart.vue');
const { default: SketchCompareCpChart } = await import('@/components/SketchCompareCpChart.vue');

/** Our own 5 % double wedge, ridge at mid-chord, at α 4°: the upper surface is in suction aft. */
function result(alphaDeg: number) {
  const doc: SketchDocument = oneCondition({ section: { points: [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]] }, condition: { mach: 2, alphaDeg, gamma: 1.4, altitudeM: null } });
  return analyseSketch(sketchCase(doc)).result!;
}

interface Option {
  yAxis: { inverse?: boolean; name: string };
  series: { name: string; data: [number, number | null][] }[];
}
const optionOf = (w: ReturnType<typeof mount>) => w.getComponent({ name: 'VChart' }).props('option') as Option;

describe('Cp charts', () => {
  it('the results panel chart plots Cp negative up, labelled so, with the true Cp values', () => {
    const r = result(4);
    const w = mount(SketchCpChart, { props: { result: r, showLinear: true, showSecondOrder: true } });
    const o = optionOf(w);
    expect(o.yAxis.inverse).toBe(true);
    expect(o.yAxis.name).toBe('Cp (negative up)');
    // The upper aft facet's Cp is negative (expansion at α 4°) and is plotted as such, not negated.
    const upper = o.series.find((s) => s.name === 'upper, exact')!;
    const aft = r.surfaces.upper[1]!.cp!;
    expect(aft).toBeLessThan(0);
    expect(upper.data.at(-1)).toEqual([1, aft]);
    w.unmount();
  });

  it('the comparison chart plots Cp negative up, labelled so', () => {
    const w = mount(SketchCompareCpChart, { props: { a: result(2), b: result(4) }, global: { stubs: { 'a-radio-group': true } } });
    const o = optionOf(w);
    expect(o.yAxis.inverse).toBe(true);
    expect(o.yAxis.name).toBe('Cp (negative up)');
    expect(w.text()).toContain('(thick: upper surface)');
    w.unmount();
  });
});
