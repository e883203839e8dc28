import { describe, expect, it } from 'vitest';
import { incompressibleCf, incompressibleMixedCf, skinFriction } from '../../../shared/flight/skinFriction.ts';
import { expectClose, expectCloseRel } from '../../helpers/expectClose.ts';

describe('skinFriction (reference temperature, Sommer & Short NACA TN 3391)', () => {
  it('incompressibleCf: Blasius 1.328/√Re gives 0.001328 at Re = 10⁶ (Schlichting, Boundary-Layer Theory)', () => {
    expectClose(incompressibleCf(1e6, 'laminar'), 0.001328, 1e-12);
  });

  it('incompressibleCf: Prandtl–Schlichting 0.455/(log10 Re)^2.58 is 0.003004 at Re = 10⁷ and 0.004471 at 10⁶ (the published formula, Schlichting, from memory; evaluated to 4 figures)', () => {
    // 0.455/7^2.58 and 0.455/6^2.58, printed to four significant figures: ± half a unit in the last.
    expectClose(incompressibleCf(1e7, 'turbulent'), 0.003004, 0.5e-6);
    expectClose(incompressibleCf(1e6, 'turbulent'), 0.004471, 0.5e-6);
  });

  it('incompressibleMixedCf: Prandtl\'s transition formula Cf = 0.455/(log Re)^2.58 − A/Re, A = Re_t·(Cf_turb − Cf_lam)(Re_t) = 1614 for Re_t = 5×10⁵ (Schlichting, from memory)', () => {
    const a = 5e5 * (0.455 / Math.log10(5e5) ** 2.58 - 1.328 / Math.sqrt(5e5));
    expectClose(a, 1614, 0.5); // the four figures quoted in the title
    expectCloseRel(incompressibleMixedCf(1e7, 5e5), 0.455 / 7 ** 2.58 - a / 1e7, 1e-13);
    // laminar up to the transition Reynolds number, continuous there
    expect(incompressibleMixedCf(4e5, 5e5)).toBe(incompressibleCf(4e5, 'laminar'));
    expectCloseRel(incompressibleMixedCf(5e5 * (1 + 1e-12), 5e5), incompressibleCf(5e5, 'laminar'), 1e-9);
  });

  it('mixed flow (compressible): laminar below Re_t, continuous at Re_t, between laminar and turbulent above, and → turbulent at Re 10⁹', () => {
    const at = (reynolds: number, regime: 'laminar' | 'turbulent' | 'mixed', transitionReynolds = 1e6) =>
      skinFriction({ reynolds, mach: 2.5, edgeTemperatureK: 220, regime, transitionReynolds })!;
    expect(at(5e5, 'mixed').cf).toBe(at(5e5, 'laminar').cf);
    expect(at(5e5, 'mixed').law).toBe('laminar');
    expectCloseRel(at(1e6 * (1 + 1e-12), 'mixed').cf, at(1e6, 'laminar').cf, 1e-9);
    for (const re of [2e6, 1e7, 1e8]) {
      const m = at(re, 'mixed');
      expect(m.law).toBe('mixed');
      expect(m.cf).toBeGreaterThan(at(re, 'laminar').cf);
      expect(m.cf).toBeLessThan(at(re, 'turbulent').cf);
      expect(m.flags).toEqual([]);
    }
    expectCloseRel(at(1e9, 'mixed').cf, at(1e9, 'turbulent').cf, 0.02);
    // A later transition means less friction.
    expect(at(1e7, 'mixed', 3e6).cf).toBeLessThan(at(1e7, 'mixed', 3e5).cf);
  });

  it('flags a law used outside its range instead of dropping it', () => {
    const f = (reynolds: number, regime: 'laminar' | 'turbulent' | 'mixed') =>
      skinFriction({ reynolds, mach: 2, edgeTemperatureK: 220, regime })!.flags.map((x) => x.code);
    expect(f(500, 'laminar')).toEqual(['laminar-below-range']);
    expect(f(500, 'mixed')).toEqual(['laminar-below-range']);
    expect(f(5e6, 'laminar')).toEqual(['laminar-above-transition']);
    expect(f(2e5, 'turbulent')).toContain('turbulent-below-transition');
    expect(f(2e9, 'turbulent')).toEqual(['turbulent-above-range']);
    expect(f(1e7, 'turbulent')).toEqual([]);
    const tiny = skinFriction({ reynolds: 5, mach: 2, edgeTemperatureK: 220, regime: 'turbulent' })!;
    expect(tiny.law).toBe('laminar');
    expect(tiny.cf).toBeGreaterThan(0);
    expect(tiny.flags.map((x) => x.code)).toContain('turbulent-undefined');
  });

  it('tends to the incompressible value as Mach → 0 on an adiabatic wall', () => {
    const r = skinFriction({ reynolds: 1e7, mach: 1e-4, edgeTemperatureK: 288.15, regime: 'turbulent' })!;
    expectCloseRel(r.cf, r.cfIncompressible, 1e-6);
  });

  it('adiabatic turbulent Cf/Cf_inc ≈ 0.77 at M 2 and ≈ 0.50 at M 4, Re 10⁷ (van Driest II curves in White, Viscous Fluid Flow, from memory; ±6%)', () => {
    const m2 = skinFriction({ reynolds: 1e7, mach: 2, edgeTemperatureK: 216.65, regime: 'turbulent' })!;
    const m4 = skinFriction({ reynolds: 1e7, mach: 4, edgeTemperatureK: 216.65, regime: 'turbulent' })!;
    expectCloseRel(m2.cf / m2.cfIncompressible, 0.77, 0.06);
    expectCloseRel(m4.cf / m4.cfIncompressible, 0.5, 0.06);
  });

  it('the adiabatic wall temperature uses the recovery factor 0.89 (turbulent): Taw/Te = 1.712 at M 2, γ 1.4 (common practice)', () => {
    const r = skinFriction({ reynolds: 1e7, mach: 2, edgeTemperatureK: 200, regime: 'turbulent' })!;
    expectClose(r.wallTemperatureK / 200, 1 + 0.89 * 0.2 * 4, 1e-12);
  });

  it('a cooled wall raises Cf over the adiabatic one (common practice)', () => {
    const adiabatic = skinFriction({ reynolds: 1e7, mach: 3, edgeTemperatureK: 220, regime: 'turbulent' })!;
    const cold = skinFriction({ reynolds: 1e7, mach: 3, edgeTemperatureK: 220, regime: 'turbulent', wallTemperatureK: 300 })!;
    expect(cold.cf).toBeGreaterThan(adiabatic.cf);
  });

  it('refuses input without meaning (Re ≤ 0, M < 0, non-finite), never a silent zero', () => {
    expect(skinFriction({ reynolds: 0, mach: 2, edgeTemperatureK: 220, regime: 'laminar' })).toBeNull();
    expect(skinFriction({ reynolds: Number.NaN, mach: 2, edgeTemperatureK: 220, regime: 'mixed' })).toBeNull();
    expect(skinFriction({ reynolds: 1e6, mach: -1, edgeTemperatureK: 220, regime: 'laminar' })).toBeNull();
    expect(skinFriction({ reynolds: 1e6, mach: 2, edgeTemperatureK: 220, regime: 'mixed', transitionReynolds: 0 })).toBeNull();
  });
});
