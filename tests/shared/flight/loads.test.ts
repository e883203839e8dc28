import { describe, expect, it } from 'vitest';
import { computeLoads } from '../../../shared/flight/loads.ts';
import { skinFriction } from '../../../shared/flight/skinFriction.ts';
import { expectClose, expectCloseRel } from '../../helpers/expectClose.ts';

const base = {
  mach: 2,
  gamma: 1.4,
  altitudeM: 0,
  chordM: 0.4,
  spanM: 0.3,
  wettedUpperOverC: 1,
  wettedLowerOverC: 1,
  frictionRegime: 'turbulent' as const,
  coefficients: { cl: 0.1, cd: 0.01, cm: -0.02 },
};

describe('computeLoads', () => {
  it('q∞ = ½·γ·p∞·M² = 283 710 Pa at Mach 2 at sea level (definition; p∞ from the 1976 standard)', () => {
    const r = computeLoads(base);
    if (!r.ok) throw new Error(r.reason);
    expectCloseRel(r.loads.dynamicPressurePa, 0.5 * 1.4 * 101_325 * 4, 1e-12);
    // a = 340.294 m/s at sea level (1976 standard Table I, from memory; 6 significant figures).
    expectClose(r.loads.velocityMS, 2 * 340.294, 2 * 0.0005);
  });

  it('one gas model at γ ≠ 1.4: a = √(γRT), V = M·a, q = ½ρV² = ½γpM², Re = ρVc/μ, all from the condition\'s γ (hand computation from the 1976 standard)', () => {
    // Sea level, defined by the standard: T 288.15 K, p 101 325 Pa; R* = 8314.32 J/(kmol·K),
    // M0 = 28.9644 kg/kmol, so R = R*/M0 and ρ = p/(R·T); Sutherland β = 1.458e-6, S = 110.4 K.
    const R = 8314.32 / 28.9644;
    const T = 288.15;
    const p = 101_325;
    const rho = p / (R * T);
    const mu = (1.458e-6 * T ** 1.5) / (T + 110.4);
    for (const gamma of [1.1, 1.3, 1.4, 5 / 3]) {
      const r = computeLoads({ ...base, gamma });
      if (!r.ok) throw new Error(r.reason);
      const a = Math.sqrt(gamma * R * T);
      const v = 2 * a;
      expectCloseRel(r.loads.gas.speedOfSoundMS, a, 1e-12);
      expectCloseRel(r.loads.velocityMS, v, 1e-12);
      expectCloseRel(r.loads.dynamicPressurePa, 0.5 * rho * v * v, 1e-12);
      expectCloseRel(r.loads.dynamicPressurePa, 0.5 * gamma * p * 4, 1e-12);
      expectCloseRel(r.loads.reynoldsChord, (rho * v * 0.4) / mu, 1e-12);
    }
  });

  it('Reynolds number at 11 km, Mach 2, 0.4 m chord from the standard\'s formulas worked by hand (T, p, ρ, μ of layer 0)', () => {
    // Geopotential H = r0·Z/(r0 + Z), r0 = 6 356 766 m; T = 288.15 − 0.0065·H;
    // p = 101 325·(288.15/T)^(−g0·M0/(R*·L)) with L = −0.0065 K/m (1976 standard eqs. 18, 23, 33a).
    const z = 11_000;
    const H = (6_356_766 * z) / (6_356_766 + z);
    const T = 288.15 - 0.0065 * H;
    const p = 101_325 * (T / 288.15) ** ((9.80665 * 28.9644) / (8314.32 * 0.0065));
    const R = 8314.32 / 28.9644;
    const rho = p / (R * T);
    const mu = (1.458e-6 * T ** 1.5) / (T + 110.4);
    const v = 2 * Math.sqrt(1.4 * R * T);
    const r = computeLoads({ ...base, altitudeM: z });
    if (!r.ok) throw new Error(r.reason);
    expectCloseRel(r.loads.reynoldsChord, (rho * v * 0.4) / mu, 1e-11);
    // About 6 million: 590 m/s × 0.4 m / ν with ν = 3.9e-5 m²/s at 11 km (1976 standard
    // Table I, from memory; two figures).
    expectCloseRel(r.loads.reynoldsChord, (590.3 * 0.4) / 3.9e-5, 0.02);
  });

  it('friction is never a silent zero: 86 km, Mach 3, 1 m chord (Re ≈ 460) gives a flagged laminar estimate', () => {
    for (const regime of ['mixed', 'turbulent', 'laminar'] as const) {
      const r = computeLoads({ ...base, mach: 3, altitudeM: 86_000, chordM: 1, frictionRegime: regime });
      if (!r.ok) throw new Error(r.reason);
      expect(r.loads.reynoldsChord).toBeGreaterThan(300);
      expect(r.loads.reynoldsChord).toBeLessThan(700);
      expect(r.loads.friction.cdFriction).toBeGreaterThan(0);
      expect(r.loads.friction.flags.length).toBeGreaterThan(0);
      expect(r.loads.friction.flags.join(' ')).toMatch(regime === 'turbulent' ? /turbulent \(Prandtl–Schlichting\) law is used at Re .* below its range/ : /Re 4\d\d is below 1,000/);
    }
  });

  it('turns coefficients into per-span and whole-span loads', () => {
    const r = computeLoads(base);
    if (!r.ok) throw new Error(r.reason);
    const q = r.loads.dynamicPressurePa;
    expectCloseRel(r.loads.perSpan.liftNPerM, 0.1 * q * 0.4, 1e-12);
    expectCloseRel(r.loads.perSpan.momentNMPerM, -0.02 * q * 0.16, 1e-12);
    expectCloseRel(r.loads.total.liftN, 0.1 * q * 0.4 * 0.3, 1e-12);
    expect(r.loads.perSpan.hingeMomentNMPerM).toBeNull();
  });

  it('adds flat-plate friction of both surfaces to the wave drag, from the free-stream Reynolds number', () => {
    const r = computeLoads(base);
    if (!r.ok) throw new Error(r.reason);
    const cf = skinFriction({ reynolds: r.loads.reynoldsChord, mach: 2, edgeTemperatureK: 288.15, regime: 'turbulent' })!.cf;
    expectCloseRel(r.loads.friction.cdFriction, 2 * cf, 1e-12);
    expectCloseRel(r.loads.cdTotal, 0.01 + 2 * cf, 1e-12);
    const none = computeLoads({ ...base, frictionRegime: 'none' });
    expect(none.ok && none.loads.cdTotal).toBe(0.01);
  });

  it('hinge moment per span uses the flap chord squared', () => {
    const r = computeLoads({ ...base, hinge: { ch: -0.1, flapChordOverC: 0.25 } });
    if (!r.ok) throw new Error(r.reason);
    expectCloseRel(r.loads.perSpan.hingeMomentNMPerM!, -0.1 * r.loads.dynamicPressurePa * 0.1 * 0.1, 1e-12);
  });

  it('refuses an altitude outside the standard atmosphere', () => {
    expect(computeLoads({ ...base, altitudeM: 90_000 })).toEqual({ ok: false, reason: expect.stringContaining('0 to 86 km') });
  });
});
