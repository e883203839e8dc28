import { describe, expect, it } from 'vitest';
import { incompressibleCf, skinFriction } from '../../../shared/flight/skinFriction.ts';
import { expectClose, expectCloseRel } from '../../helpers/expectClose.ts';

describe('skinFriction (reference temperature, Sommer & Short NACA TN 3391)', () => {
  it('incompressibleCf: Blasius 1.328/√Re gives 0.001328 at Re = 10⁶ (Schlichting, Boundary-Layer Theory)', () => {
    expectClose(incompressibleCf(1e6, 'laminar'), 0.001328, 1e-12);
  });

  it('incompressibleCf: Prandtl–Schlichting gives 0.00301 at Re = 10⁷ and 0.00447 at Re = 10⁶ (Schlichting, from memory)', () => {
    expectCloseRel(incompressibleCf(1e7, 'turbulent'), 0.003007, 2e-3);
    expectCloseRel(incompressibleCf(1e6, 'turbulent'), 0.004468, 2e-3);
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

  it('refuses nonsense input', () => {
    expect(skinFriction({ reynolds: 10, mach: 2, edgeTemperatureK: 220, regime: 'laminar' })).toBeNull();
    expect(skinFriction({ reynolds: 1e6, mach: -1, edgeTemperatureK: 220, regime: 'laminar' })).toBeNull();
  });
});
