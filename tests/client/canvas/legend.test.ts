import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DOMAIN_STEP_LN, PRESSURE_FLOOR, cpFromPressureRatio, pressureDomain, pressureT } from '@/canvas/colors';
import { LEGEND_BAR_PX, LEGEND_LABEL_GAP_PX, labelWidthPx, legendModel, type LegendModel } from '@/canvas/legend';
import { renderHud } from '@/canvas/renderGrid';
import { reached } from '../../helpers/reached';

/** Checks of the legend itself (common practice: a scale states the range shown, labels never overlap). */
function expectLaidOut(m: LegendModel, barPx: number): void {
  const ts = m.ticks.map((k) => k.t);
  expect(ts[0]).toBe(0);
  expect(ts[ts.length - 1]).toBe(1);
  for (let i = 1; i < m.ticks.length; i++) {
    const a = m.ticks[i - 1]!;
    const b = m.ticks[i]!;
    expect(b.t).toBeGreaterThan(a.t);
    expect(b.left - a.right, `"${a.label}" and "${b.label}" overlap`).toBeGreaterThanOrEqual(LEGEND_LABEL_GAP_PX - 1e-9);
    expect(b.label).not.toBe(a.label);
  }
  for (const k of m.ticks) {
    expect(k.left).toBeGreaterThanOrEqual(0);
    expect(k.right).toBeLessThanOrEqual(barPx);
    expect(k.right - k.left).toBeGreaterThanOrEqual(labelWidthPx(k.label) - 1e-9);
  }
}

describe('[C2] the colour range is the range present in the flow', () => {
  it('spans only what is there: a flow from p/p∞ 0.3 to 3.2 is not widened to a mirror image', () => {
    const d = pressureDomain([0.3, 1, 1.7, 3.2]);
    expect(d.min).toBeLessThanOrEqual(0.3);
    expect(d.min).toBeGreaterThan(0.3 * Math.exp(-DOMAIN_STEP_LN));
    expect(d.max).toBeGreaterThanOrEqual(3.2);
    expect(d.max).toBeLessThan(3.2 * Math.exp(DOMAIN_STEP_LN));
    expect(d.below).toBeUndefined();
  });

  it('always holds free stream and is at least 0.8 … 1.25 wide', () => {
    const d = pressureDomain([1.02, 1.05]);
    expect(d.min).toBeLessThanOrEqual(0.8 + 1e-12);
    expect(d.max).toBeGreaterThanOrEqual(1.25 - 1e-12);
    const all = pressureDomain([1.9, 2.4]);
    expect(all.min).toBeLessThanOrEqual(1);
    expect(pressureDomain([]).min).toBeCloseTo(0.8, 1);
  });

  it('an expansion towards vacuum stops the scale at the floor and says lower pressures exist (the 10⁷ top seen at α 80° came from mirroring it)', () => {
    const d = pressureDomain([1e-7, 0.4, 1, 4.6]);
    expect(d.min).toBeCloseTo(PRESSURE_FLOOR, 12);
    expect(d.below).toBe(true);
    expect(d.max).toBeLessThan(4.6 * Math.exp(DOMAIN_STEP_LN));
    expect(pressureDomain([0, 1.2]).below).toBe(true); // a vacuum facet
    // Cp at the floor is within 1 % of 2/(γM²) of the vacuum's Cp (definition of Cp).
    const mach = 2.6;
    const gamma = 1.4;
    expect(Math.abs(cpFromPressureRatio(PRESSURE_FLOOR, mach, gamma) - cpFromPressureRatio(0, mach, gamma))).toBeLessThanOrEqual(0.01 * (2 / (gamma * mach * mach)) + 1e-15);
    expect(pressureT(1e-7, d)).toBe(pressureT(1e-7, d)); // takes the end colour (pressureColourAt clamps)
  });

  it('property: every pressure given lies in the range or (below the floor) is flagged; the range never reaches past the extremes by more than one rounding step', () => {
    const count = reached('domain holds the flow');
    fc.assert(
      fc.property(fc.array(fc.double({ min: 1e-6, max: 500, noNaN: true }), { minLength: 1, maxLength: 12 }), (ps) => {
        const d = pressureDomain(ps);
        const lo = Math.min(1 / 1.25, ...ps);
        const hi = Math.max(1.25, ...ps);
        count.hit();
        expect(d.max).toBeGreaterThanOrEqual(hi * (1 - 1e-12));
        expect(d.max).toBeLessThanOrEqual(hi * Math.exp(DOMAIN_STEP_LN) * (1 + 1e-12));
        if (lo < PRESSURE_FLOOR) {
          expect(d.below).toBe(true);
          expect(d.min).toBeCloseTo(PRESSURE_FLOOR, 12);
        } else {
          expect(d.below).toBeUndefined();
          expect(d.min).toBeLessThanOrEqual(lo * (1 + 1e-12));
          expect(d.min).toBeGreaterThanOrEqual(lo * Math.exp(-DOMAIN_STEP_LN) * (1 - 1e-12));
        }
      }),
      { numRuns: 400 },
    );
    count.expectAtLeast(400);
  });
});

describe('legend tick labels', () => {
  it('the demo fin root at its default condition (M 2.6, Cp): no two labels touch (QA saw "−0.0832" on "−0.0467")', () => {
    const m = legendModel(pressureDomain([0.607, 1, 1.65]), 'cp', 2.6, 1.4);
    expectLaidOut(m, LEGEND_BAR_PX);
    expect(m.ticks.map((k) => k.label)).toContain('0');
  });

  it('α 80°: the ends read the floor ("≤") and the real peak, not 10⁷', () => {
    const m = legendModel(pressureDomain([1e-9, 0.2, 1, 23]), 'cp', 2.6, 1.4);
    expectLaidOut(m, LEGEND_BAR_PX);
    expect(m.ticks[0]!.label.startsWith('≤ −')).toBe(true);
    expect(m.ticks.some((k) => k.label.includes('10'))).toBe(false);
  });

  it('property: for many ranges, Mach numbers and both modes the labels never overlap, keep both ends and repeat nothing', () => {
    const count = reached('legend labels laid out');
    fc.assert(
      fc.property(
        fc.double({ min: 1e-9, max: 1, noNaN: true }),
        fc.double({ min: 1, max: 5000, noNaN: true }),
        fc.double({ min: 1.05, max: 30, noNaN: true }),
        fc.double({ min: 1.05, max: 1.67, noNaN: true }),
        fc.constantFrom('cp' as const, 'pressureRatio' as const),
        fc.integer({ min: 160, max: 400 }),
        (pLow, pHigh, mach, gamma, mode, barPx) => {
          const m = legendModel(pressureDomain([pLow, pHigh]), mode, mach, gamma, barPx);
          count.hit();
          expectLaidOut(m, barPx);
        },
      ),
      { numRuns: 600 },
    );
    count.expectAtLeast(600);
  });

  it('the canvas draws each label where the model placed it (align and x)', () => {
    const m = legendModel(pressureDomain([0.3, 3]), 'pressureRatio', 2, 1.4);
    const hud = renderHud({ scale: 400, originX: 100, originY: 250 }, { width: 900, height: 500 }, m, false);
    const x0 = 900 - LEGEND_BAR_PX - 20;
    for (const k of m.ticks) {
      const text = hud.texts!.find((t) => t.text === k.label)!;
      expect(text.align).toBe(k.align);
      const anchor = k.align === 'left' ? k.left : k.align === 'right' ? k.right : (k.left + k.right) / 2;
      expect(text.x).toBeCloseTo(x0 + anchor, 9);
    }
  });
});
