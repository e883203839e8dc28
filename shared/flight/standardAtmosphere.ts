import { itemAt } from '../util/invariant.ts';

/**
 * U.S. Standard Atmosphere, 1976 (NOAA/NASA/USAF, NOAA-S/T 76-1562), lower atmosphere from sea
 * level to 86 km geometric altitude.
 *
 * Method (the standard's own): seven layers linear in geopotential altitude H for the molecular-
 * scale temperature T_M (Table 4); hydrostatic pressure, eq. 33a (lapse ≠ 0) and 33b (isothermal);
 * density ρ = P·M0/(R*·T_M) (eq. 42); speed of sound a = √(γ·R*·T_M/M0) (eq. 50); kinetic
 * temperature T = T_M·(M/M0), the ratio below 1 only above 80 km (Table 8); dynamic viscosity by
 * Sutherland's law μ = β·T^1.5/(T + S) (eq. 51). Geopotential H = r0·Z/(r0 + Z) (eq. 18).
 *
 * Units: metres, kelvin, pascal, kg/m³, m/s, Pa·s. Outside 0…86 000 m the function refuses
 * (returns null) rather than extrapolate.
 */
export const ATMOSPHERE_MAX_ALTITUDE_M = 86_000;

const G0 = 9.80665; // m/s², standard gravity
const R_STAR = 8314.32; // J/(kmol·K), the standard's gas constant
const M0 = 28.9644; // kg/kmol, sea-level mean molecular weight
const R0 = 6_356_766; // m, effective earth radius for geopotential
const GAMMA = 1.4;
/** Gas constant of air, R* over M0 = 287.0531 J/(kg·K) (the standard's R* and M0). */
export const GAS_CONSTANT_AIR_J_KG_K = R_STAR / M0;
const SUTHERLAND_BETA = 1.458e-6; // kg/(s·m·K^½)
const SUTHERLAND_S = 110.4; // K

/** Layer bases: geopotential altitude (m'), molecular-scale temperature lapse (K/m'). Table 4. */
const LAYERS: { h: number; lapse: number }[] = [
  { h: 0, lapse: -0.0065 },
  { h: 11_000, lapse: 0 },
  { h: 20_000, lapse: 0.001 },
  { h: 32_000, lapse: 0.0028 },
  { h: 47_000, lapse: 0 },
  { h: 51_000, lapse: -0.0028 },
  { h: 71_000, lapse: -0.002 },
];

/** Base temperature and pressure of each layer, integrated once from sea level (288.15 K, 101 325 Pa). */
const BASES = (() => {
  const out: { h: number; lapse: number; t: number; p: number }[] = [];
  let t = 288.15;
  let p = 101_325;
  for (const [i, { h, lapse }] of LAYERS.entries()) {
    out.push({ h, lapse, t, p });
    const next = LAYERS[i + 1];
    if (next) [t, p] = stepLayer(t, p, lapse, next.h - h);
  }
  return out;
})();

function stepLayer(tBase: number, pBase: number, lapse: number, dh: number): [number, number] {
  const k = (G0 * M0) / R_STAR;
  if (lapse === 0) return [tBase, pBase * Math.exp((-k * dh) / tBase)];
  const t = tBase + lapse * dh;
  return [t, pBase * Math.pow(tBase / t, k / lapse)];
}

/** M/M0 from 80 to 86 km geometric, every 500 m (Table 8). Below 80 km it is 1. */
const MOLECULAR_WEIGHT_RATIO = [1.0, 0.999996, 0.999989, 0.999971, 0.999941, 0.999909, 0.99987, 0.999829, 0.999786, 0.999741, 0.999694, 0.999641, 0.999579];

function molecularWeightRatio(zM: number): number {
  if (zM <= 80_000) return 1;
  const x = (zM - 80_000) / 500;
  const i = Math.min(Math.floor(x), MOLECULAR_WEIGHT_RATIO.length - 2);
  const f = x - i;
  return itemAt(MOLECULAR_WEIGHT_RATIO, i) * (1 - f) + itemAt(MOLECULAR_WEIGHT_RATIO, i + 1) * f;
}

export interface AtmosphereState {
  altitudeM: number;
  geopotentialM: number;
  /** Kinetic temperature, K. */
  temperatureK: number;
  /** Molecular-scale temperature T_M = T·M0/M, K: equal to T below 80 km; the standard's ρ and a
   *  use it (eq. 42, eq. 50). */
  molecularTemperatureK: number;
  pressurePa: number;
  densityKgM3: number;
  speedOfSoundMS: number;
  /** Dynamic viscosity, Pa·s. */
  viscosityPaS: number;
  /** Kinematic viscosity, m²/s. */
  kinematicViscosityM2S: number;
}

/** Geopotential altitude (m') of geometric altitude `zM` (eq. 18). */
export function geopotentialAltitude(zM: number): number {
  return (R0 * zM) / (R0 + zM);
}

/** Sutherland's law for air (U.S. Standard Atmosphere 1976, eq. 51), Pa·s. */
export function sutherlandViscosity(temperatureK: number): number {
  return (SUTHERLAND_BETA * Math.pow(temperatureK, 1.5)) / (temperatureK + SUTHERLAND_S);
}

/** The 1976 standard atmosphere at geometric altitude `altitudeM`, or null outside 0…86 km. */
export function standardAtmosphere(altitudeM: number): AtmosphereState | null {
  if (!Number.isFinite(altitudeM) || altitudeM < 0 || altitudeM > ATMOSPHERE_MAX_ALTITUDE_M) return null;
  const h = geopotentialAltitude(altitudeM);
  let base = itemAt(BASES, 0);
  for (const b of BASES) if (h >= b.h) base = b;
  const [tM, p] = stepLayer(base.t, base.p, base.lapse, h - base.h);
  const t = tM * molecularWeightRatio(altitudeM);
  const rho = (p * M0) / (R_STAR * tM);
  const mu = sutherlandViscosity(t);
  return {
    altitudeM,
    geopotentialM: h,
    temperatureK: t,
    molecularTemperatureK: tM,
    pressurePa: p,
    densityKgM3: rho,
    speedOfSoundMS: Math.sqrt((GAMMA * R_STAR * tM) / M0),
    viscosityPaS: mu,
    kinematicViscosityM2S: mu / rho,
  };
}
