import { describe, expect, it } from 'vitest';
import { expectClose, expectPrinted } from '../../helpers/expectClose';
import { isentropic } from '../../../shared/solver/isentropic';
import { normalShock } from '../../../shared/solver/normalShock';

describe('isentropic', () => {
  // NACA Report 1135, Table I (γ = 1.4), from memory; each value within half a unit of its last
  // printed digit.
  it.each([
    // M, p/p0, T/T0, ρ/ρ0, A/A*
    [0.5, '0.8430', '0.9524', '0.8852', '1.340'],
    [1, '0.5283', '0.8333', '0.6339', '1.000'],
    [2, '0.1278', '0.5556', '0.2300', '1.688'],
    [3, '0.02722', '0.3571', '0.07623', '4.235'],
  ])('isentropic(M=%d, γ=1.4) matches NACA Report 1135 Table I to its printed digits (from memory)', (m, p, t, rho, area) => {
    const r = isentropic(m, 1.4);
    expectPrinted(r.pOverP0, p);
    expectPrinted(r.tOverT0, t);
    expectPrinted(r.rhoOverRho0, rho);
    expectPrinted(r.areaOverSonicArea, area);
  });

  it('isentropic(M=0) gives stagnation values and A/A* = Infinity (edge case)', () => {
    const r = isentropic(0, 1.4);
    expect(r.pOverP0).toBe(1);
    expect(r.tOverT0).toBe(1);
    expect(r.areaOverSonicArea).toBe(Number.POSITIVE_INFINITY);
  });

  it('isentropic ratios satisfy p/p0 = (ρ/ρ0)(T/T0) and p/p0 = (T/T0)^(γ/(γ−1)) (identities)', () => {
    for (const g of [1.05, 1.3, 1.4, 5 / 3]) {
      for (const m of [0.2, 1, 2.7, 10, 50]) {
        const r = isentropic(m, g);
        expectClose(r.pOverP0 / (r.rhoOverRho0 * r.tOverT0), 1, 1e-12);
        expectClose(Math.log(r.pOverP0) / Math.log(r.tOverT0), g / (g - 1), 1e-9);
      }
    }
  });

  it('isentropic with γ → 1 tends to the isothermal limits p/p0 = e^(−M²/2), A/A* = e^((M²−1)/2)/M (limit, common practice)', () => {
    // Huge exponents go through log1p, so nothing overflows or loses its digits.
    const r = isentropic(5, 1 + 1e-9);
    expectClose(r.pOverP0 / Math.exp(-12.5), 1, 1e-6);
    expectClose(r.areaOverSonicArea / (Math.exp(12) / 5), 1, 1e-6);
  });

  it('isentropic(M<0) is a programmer error (RangeError)', () => {
    expect(() => isentropic(-1, 1.4)).toThrow(RangeError);
  });
});

describe('normalShock', () => {
  // NACA Report 1135, Table II (γ = 1.4), from memory; each value within half a unit of its last
  // printed digit.
  it.each([
    // M1, M2, p2/p1, ρ2/ρ1, T2/T1, p02/p01
    [1.5, '0.7011', '2.458', '1.862', '1.320', '0.9298'],
    [2, '0.5774', '4.500', '2.667', '1.688', '0.7209'],
    [3, '0.4752', '10.33', '3.857', '2.679', '0.3283'],
    [5, '0.4152', '29.00', '5.000', '5.800', '0.06172'],
  ])('normalShock(M1=%d) matches NACA Report 1135 Table II to its printed digits (from memory)', (m, m2, p, rho, t, p0) => {
    const r = normalShock(m, 1.4);
    expectPrinted(r.mach2, m2);
    expectPrinted(r.pRatio, p);
    expectPrinted(r.rhoRatio, rho);
    expectPrinted(r.tRatio, t);
    expectPrinted(r.p0Ratio, p0);
  });

  it('normalShock(M1=1.25) gives M2² = (1 + (γ−1)M1²/2)/(γM1² − (γ−1)/2) (NACA Report 1135 normal-shock relation, written out here)', () => {
    const m1 = 1.25;
    const m2 = Math.sqrt((1 + 0.2 * m1 * m1) / (1.4 * m1 * m1 - 0.2));
    expectClose(normalShock(m1, 1.4).mach2, m2, 1e-15);
    expectPrinted(m2, '0.8126');
  });

  it('normalShock(M1=1) is a Mach wave: every ratio 1 (trivial)', () => {
    const r = normalShock(1, 1.4);
    for (const v of [r.mach2, r.pRatio, r.rhoRatio, r.tRatio, r.p0Ratio]) expectClose(v, 1, 1e-15);
  });

  it('normalShock(M1→∞) tends to ρ2/ρ1 = (γ+1)/(γ−1) and M2 = √((γ−1)/(2γ)) (limits, NACA Report 1135)', () => {
    const r = normalShock(1e6, 1.4);
    expectClose(r.rhoRatio, 6, 1e-9);
    expectClose(r.mach2, Math.sqrt(0.4 / 2.8), 1e-9);
  });

  it('normalShock conserves stagnation enthalpy: T2/T1 = X(M1)/X(M2), X = 1 + (γ−1)M²/2 (identity)', () => {
    for (const g of [1.1, 1.4, 5 / 3]) {
      for (const m of [1.01, 2, 7, 50]) {
        const r = normalShock(m, g);
        const x = (mm: number) => 1 + ((g - 1) / 2) * mm * mm;
        expectClose(r.tRatio, x(m) / x(r.mach2), 1e-12 * r.tRatio);
        expect(r.p0Ratio).toBeLessThanOrEqual(1);
      }
    }
  });

  it('normalShock(M1<1) is a programmer error (RangeError)', () => {
    expect(() => normalShock(0.9, 1.4)).toThrow(RangeError);
  });
});
