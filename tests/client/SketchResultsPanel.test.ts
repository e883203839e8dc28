/**
 * The results panel says what the coefficients are referred to, and what a vacuum result's
 * coefficients contain.
 */
import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { analyseSketch } from '@shared/flight/analyseSketch';
import { defaultSketchDocument, sketchCase, type SketchDocument } from '@shared/model/sketch';
import { oneCondition } from '../helpers/documents';
import SketchResultsPanel from '@/components/SketchResultsPanel.vue';
import { RESULTS_CAUTION, RESULTS_CAUTION_SHORT } from '@shared/model/caution';

function mountFor(doc: SketchDocument) {
  const analysis = analyseSketch(sketchCase(doc));
  return mount(SketchResultsPanel, {
    props: { result: analysis.result, analysis, issues: [], serverAnalysis: null, revision: 1, chartResult: null },
    global: { stubs: { SketchCpChart: true } },
  });
}

describe('SketchResultsPanel', () => {
  it('states the reference: the drawn chord, the moment point and, with a flap, the drawn flap chord', () => {
    const w = mountFor({ ...defaultSketchDocument(), flap: { hingeXOverC: 0.75 } });
    const text = w.get('[data-testid="results-reference"]').text();
    expect(text).toContain('Reference: the section as drawn (the flap deflection does not change it), chord c = 1 drawing units');
    expect(text).toContain('cm over q∞·c² about (0.25, 0), nose up +');
    expect(text).toContain('c_f = 0.25 c (drawn)');
    w.unmount();
  });

  it('a vacuum result shows its coefficients and says they carry p = 0 past the limit', () => {
    // Our own triangle: a 5° nose, then a 30° convex corner at M 10, γ 5/3 (ν_max = 90°).
    const r = Math.PI / 180;
    const top: [number, number] = [0.5, 0.5 * Math.tan(5 * r)];
    const doc: SketchDocument = oneCondition({
      section: { points: [[0, 0], top, [1, top[1] - 0.5 * Math.tan(25 * r)]] },
      condition: { mach: 10, alphaDeg: 0, gamma: 5 / 3, altitudeM: null },
    });
    const w = mountFor(doc);
    expect(w.get('[data-testid="results-status"]').text()).toBe('vacuum');
    expect(w.get('[data-testid="results-validity"]').text()).toContain('Zero pressure past the marked vertex: the exact coefficients include it.');
    expect(w.get('[data-testid="results-validity"]').text()).toContain('p = 0 (Cp = −2/(γM∞²))');
    expect(w.get('[data-testid="coef-exact-cl"]').text()).not.toBe('—');
    w.unmount();
  });

  it('carries the caution with the coefficients: the short form directly under the status line, above the table; the full text at the foot', () => {
    const w = mountFor(defaultSketchDocument());
    const panel = w.get('[data-testid="results-panel"]').element;
    const status = w.get('[data-testid="results-validity"]').element;
    const short = w.get('[data-testid="results-caution-short"]');
    expect(short.text()).toBe(RESULTS_CAUTION_SHORT);
    // The product's caution in short still says all three things.
    expect(RESULTS_CAUTION_SHORT).toMatch(/inviscid preliminary estimate/i);
    expect(RESULTS_CAUTION_SHORT).toMatch(/verify by test or higher-fidelity analysis/);
    expect(RESULTS_CAUTION_SHORT).toMatch(/defer to codes and licensed practice/);
    expect(short.attributes('title')).toBe(RESULTS_CAUTION);
    expect(status.nextElementSibling).toBe(short.element);
    const order = [...panel.querySelectorAll('[data-testid]')].map((e) => e.getAttribute('data-testid'));
    expect(order.indexOf('results-caution-short')).toBeLessThan(order.indexOf('coefficients'));
    expect(w.get('[data-testid="results-caution"]').text()).toBe(RESULTS_CAUTION);
    w.unmount();
  });
});
