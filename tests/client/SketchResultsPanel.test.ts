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
import { XCP_UNDEFINED_NOTE } from '@shared/flight/xcp';
import SketchDesignPointsTable from '@/components/SketchDesignPointsTable.vue';
import { analyseDesignPoints } from '@shared/flight/designPoints';

/** The demo's fin root section: a 5 %-thick double wedge, ridge at 40 %, flap hinged at x/c 0.75. */
const FIN_ROOT: [number, number][] = [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]];
const finRoot = (alphaDeg: number, deflectionDeg: number) =>
  oneCondition({ section: { points: FIN_ROOT }, condition: { mach: 1.5, alphaDeg, gamma: 1.4, altitudeM: null }, flap: { hingeXOverC: 0.75, deflectionDeg } });

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

  // x_cp/c by the rule in shared/flight/xcp.ts (|cn| < 1e-4 or outside −1…2 c: a dash). Figures
  // are this solver's own (checked against the study table's 4.309 c case at α 2°).
  it('x_cp/c: a dash with the reason where the flap\'s couple nearly cancels the lift', () => {
    // M 1.5, δ −10° (trailing edge up): the normal force crosses zero near α 2.233°, exact cn ≈ −2.3e-5
    // and the solver's x_cp ≈ 2515 c; linear x_cp ≈ 4.48 c and second-order ≈ −33.9 c (outside the band).
    const doc = finRoot(2.233, -10);
    const a = analyseSketch(sketchCase(doc));
    expect(Math.abs(a.result!.coefficients!.cn)).toBeLessThan(1e-4);
    expect(a.result!.coefficients!.xcpOverC).toBeGreaterThan(2000);
    const w = mountFor(doc);
    for (const t of ['exact', 'linear', 'second']) {
      const cell = w.get(`[data-testid="coef-${t}-xcpOverC"]`);
      expect(cell.text()).toBe('—');
      expect(cell.attributes('title')).toBe(XCP_UNDEFINED_NOTE);
    }
    expect(w.get('[data-testid="results-xcp-note"]').text()).toBe(`— in x_cp/c: ${XCP_UNDEFINED_NOTE}; cm gives the moment there.`);
    // cm is still given: it is what the section does there.
    expect(w.get('[data-testid="coef-exact-cm"]').text()).toBe('0.05842');
    w.unmount();
  });

  it('x_cp/c: a dash for |cn| below 1e-4 even inside the band (α 0, δ 0.003°: x_cp 0.875 c on cn 4.2e-5)', () => {
    const w = mountFor(finRoot(0, 0.003));
    expect(w.get('[data-testid="coef-exact-xcpOverC"]').text()).toBe('—');
    expect(w.get('[data-testid="coef-linear-xcpOverC"]').text()).toBe('—');
    expect(w.find('[data-testid="results-xcp-note"]').exists()).toBe(true);
    w.unmount();
  });

  it('x_cp/c: the number, no tooltip and no note where the normal force is clear (α 4°, δ 0: cn 0.257)', () => {
    const w = mountFor(finRoot(4, 0));
    const cell = w.get('[data-testid="coef-exact-xcpOverC"]');
    expect(cell.text()).toBe('0.4649');
    expect(cell.attributes('title')).toBeUndefined();
    // Linear theory: the pressure of a thin section at α acts at mid-chord (Ackeret; common practice).
    expect(w.get('[data-testid="coef-linear-xcpOverC"]').text()).toBe('0.5');
    expect(w.find('[data-testid="results-xcp-note"]').exists()).toBe(false);
    w.unmount();
  });

  it('design points side by side: the same dash, tooltip and note for the point with near-zero normal force', () => {
    const doc = finRoot(4, 0);
    const near = { ...doc.designPoints[0]!, id: 'point_nearzero000000000000', name: 'near zero', condition: { ...doc.designPoints[0]!.condition, alphaDeg: 2.233 }, flapDeflectionDeg: -10 };
    const two: SketchDocument = { ...doc, designPoints: [doc.designPoints[0]!, near] };
    const w = mount(SketchDesignPointsTable, { props: { document: two, analysis: analyseDesignPoints(two), shownPointId: doc.designPoints[0]!.id, units: 'si' } });
    expect(w.get('[data-testid="dp-xcp-0"]').text()).toBe('0.4649');
    expect(w.get('[data-testid="dp-xcp-1"]').text()).toBe('—');
    expect(w.get('[data-testid="dp-xcp-1"]').attributes('title')).toBe(XCP_UNDEFINED_NOTE);
    expect(w.get('[data-testid="design-points-xcp-note"]').text()).toContain(XCP_UNDEFINED_NOTE);
    w.unmount();
  });
});
