import { describe, expect, it } from 'vitest';
import { computeLoads } from '../../../shared/flight/loads.ts';
import { skinFriction } from '../../../shared/flight/skinFriction.ts';
import { expectCloseRel } from '../../helpers/expectClose.ts';

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
    expectCloseRel(r.loads.dynamicPressurePa, 0.5 * 1.4 * 101_325 * 4, 1e-9);
    expectCloseRel(r.loads.velocityMS, 2 * 340.294, 1e-4);
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
