import { describe, expect, it } from 'vitest';
import { geopotentialAltitude, standardAtmosphere, sutherlandViscosity } from '../../../shared/flight/standardAtmosphere.ts';
import { expectClose, expectCloseRel, expectPrinted } from '../../helpers/expectClose.ts';

const at = (z: number) => {
  const s = standardAtmosphere(z);
  if (!s) throw new Error(`no atmosphere at ${z}`);
  return s;
};

/** Geometric altitude of a geopotential altitude (inverse of the standard's eq. 18). */
const geometricOf = (h: number) => (6_356_766 * h) / (6_356_766 - h);

describe('standardAtmosphere (U.S. Standard Atmosphere 1976)', () => {
  // Table I of the 1976 standard, geometric altitude; values recalled (from memory), 5 significant
  // figures as printed there; each within half a unit of its last printed digit.
  it.each([
    // z (m), T (K), p (Pa), ρ (kg/m³), a (m/s)
    [0, '288.15', '101325', '1.2250', '340.29'],
    [11_000, '216.77', '22700', '0.36480', '295.15'],
    [20_000, '216.65', '5529.3', '0.088910', '295.07'],
    [32_000, '228.49', '889.06', '0.013555', '303.02'],
    [50_000, '270.65', '79.779', '0.0010269', '329.80'],
    [86_000, '186.87', '0.37338', '6.958e-6', '274.10'],
  ])('at %d m gives T=%s K, p=%s Pa, ρ=%s kg/m³, a=%s m/s (1976 standard Table I, from memory)', (z, t, p, rho, a) => {
    const s = at(z);
    expectPrinted(s.temperatureK, t);
    expectPrinted(s.pressurePa, p);
    expectPrinted(s.densityKgM3, rho);
    expectPrinted(s.speedOfSoundMS, a);
  });

  it('sea-level viscosity is 1.7894e-5 Pa·s (1976 standard Table I, from memory)', () => {
    expectPrinted(at(0).viscosityPaS, '1.7894e-5');
    expectPrinted(sutherlandViscosity(216.65), '1.4216e-5');
  });

  // Layer-base pressures of the standard's Table 4 (from memory), reached at the geometric
  // altitudes of the geopotential boundaries: the layer joins are continuous and exact.
  it.each([
    [11_000, 216.65, 22_632.06],
    [20_000, 216.65, 5474.889],
    [32_000, 228.65, 868.0187],
    [47_000, 270.65, 110.9063],
    [51_000, 270.65, 66.93887],
    [71_000, 214.65, 3.95642],
  ])('at the layer boundary H = %d m′ gives T_M = %f K and p_b = %f Pa (Table 4, from memory)', (h, t, p) => {
    const z = geometricOf(h);
    const below = at(z - 1e-6);
    const above = at(z + 1e-6);
    expectClose(above.temperatureK, t, 1e-3);
    expectCloseRel(above.pressurePa, p, 2e-6);
    expectCloseRel(below.pressurePa, above.pressurePa, 1e-9);
    expectClose(geopotentialAltitude(z), h, 1e-6);
  });

  it('obeys the hydrostatic equation dp/dH = −ρ·g0 everywhere (definition of the model)', () => {
    for (const z of [500, 15_000, 25_000, 40_000, 60_000, 80_000]) {
      const dz = 1;
      const dp = at(z + dz).pressurePa - at(z - dz).pressurePa;
      const dh = geopotentialAltitude(z + dz) - geopotentialAltitude(z - dz);
      // ρ here with T_M: the kinetic-temperature correction only starts at 80 km.
      expectCloseRel(dp / dh, -at(z).densityKgM3 * 9.80665, 2e-4);
    }
  });

  it('refuses altitudes outside 0…86 km rather than extrapolating', () => {
    expect(standardAtmosphere(-1)).toBeNull();
    expect(standardAtmosphere(86_001)).toBeNull();
    expect(standardAtmosphere(Number.NaN)).toBeNull();
  });
});
