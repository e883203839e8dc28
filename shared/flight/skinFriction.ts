import { sutherlandViscosity } from './standardAtmosphere.ts';
import { formatNumber } from '../format/number.ts';

/**
 * Flat-plate skin friction with compressibility, by the reference-temperature method of Sommer &
 * Short (NACA TN 3391, 1955): evaluate the incompressible law at the reference temperature
 *   T'/Te = 1 + 0.035·Me² + 0.45·(Tw/Te − 1)
 * i.e. Cf = Cf_inc(Re')·(ρ'/ρe) with Re' = Re·(ρ'/ρe)·(μe/μ'), ρ'/ρe = Te/T' (same pressure),
 * μ by Sutherland's law. The wall is adiabatic unless a wall temperature is given:
 * Taw = Te·(1 + r·(γ−1)/2·Me²) with recovery factor r = Pr^(1/3) = 0.89 turbulent,
 * Pr^(1/2) = 0.85 laminar (Pr = 0.72, common practice).
 *
 * Incompressible laws (average over the length, on the length's Reynolds number):
 * - laminar, Blasius: Cf = 1.328/√Re (Schlichting, Boundary-Layer Theory, from memory);
 * - turbulent, Prandtl–Schlichting: Cf = 0.455/(log10 Re)^2.58 (Schlichting, from memory);
 * - mixed, Prandtl's transition formula: laminar from the leading edge to the transition
 *   Reynolds number Re_t, turbulent behind it as if it had started at the leading edge:
 *   Cf = Cf_turb(Re) − (Re_t/Re)·(Cf_turb(Re_t) − Cf_lam(Re_t)) for Re > Re_t, the laminar value
 *   below (Schlichting, the form Cf = 0.455/(log Re)^2.58 − A/Re with A = Re_t·(Cf_turb − Cf_lam) at
 *   Re_t, from memory). Here each law is the compressible one (its own reference temperature and
 *   adiabatic wall), so at Re = Re_t the mixed value is the laminar one.
 *
 * Ranges, flagged (never silently dropped) when a law is used outside them:
 * - Blasius needs the boundary-layer approximation: below Re = 10³ the next-order correction
 *   (Kuo's 2.326/Re, from memory) exceeds 5 % of the Blasius value;
 * - laminar flow above the transition Reynolds number is not to be expected;
 * - the Prandtl–Schlichting fit holds for fully turbulent plates from Re = 10⁵ to 10⁹
 *   (Schlichting, from memory); a turbulent layer below the transition Reynolds number needs a trip.
 * Below Re' = 10 (log10 Re' ≤ 1) the turbulent formula has no value at all: the laminar value is
 * given instead, flagged.
 *
 * This is an estimate for a smooth plate; it says nothing about roughness, pressure gradient,
 * separation or rarefaction.
 */
export const FRICTION_REGIMES = ['mixed', 'turbulent', 'laminar'] as const;
export type FrictionRegime = (typeof FRICTION_REGIMES)[number];

/** Default transition Reynolds number on a flat plate, 5×10⁵ (common practice). */
export const TRANSITION_REYNOLDS_DEFAULT = 5e5;
/** Below this Reynolds number the Blasius law is flagged (see above). */
export const LAMINAR_LAW_MIN_REYNOLDS = 1e3;
/** The Prandtl–Schlichting fit's range (Schlichting, from memory). */
export const TURBULENT_LAW_MIN_REYNOLDS = 1e5;
export const TURBULENT_LAW_MAX_REYNOLDS = 1e9;

export type FrictionFlagCode =
  | 'laminar-below-range'
  | 'laminar-above-transition'
  | 'turbulent-below-transition'
  | 'turbulent-below-range'
  | 'turbulent-above-range'
  | 'turbulent-undefined'
  | 'no-estimate';

/** A law used outside its range: a code for programs and one sentence for people. */
export interface FrictionFlag {
  code: FrictionFlagCode;
  message: string;
}

export interface SkinFrictionInput {
  /** Reynolds number on the wetted length, based on edge (free-stream) conditions. */
  reynolds: number;
  mach: number;
  /** Edge static temperature, K (sets the Sutherland viscosity ratio). */
  edgeTemperatureK: number;
  regime: FrictionRegime;
  gamma?: number;
  /** Wall temperature, K; default adiabatic wall. */
  wallTemperatureK?: number;
  /** Transition Reynolds number (edge conditions) for the mixed regime; default 5×10⁵. */
  transitionReynolds?: number;
}

export interface SkinFrictionResult {
  /** Average skin-friction coefficient over the length, based on edge q. */
  cf: number;
  /** The incompressible value at the same Reynolds number (for the ratio), same regime. */
  cfIncompressible: number;
  /** Reference temperature and wall temperature of the law that covers the trailing part. */
  referenceTemperatureK: number;
  wallTemperatureK: number;
  /** The law actually evaluated: mixed flow below the transition Reynolds number is laminar. */
  law: 'laminar' | 'turbulent' | 'mixed';
  /** Laws used outside their range; empty when every law is inside it. */
  flags: FrictionFlag[];
}

/** Incompressible average Cf of a regime's law (no range checks; turbulent needs Re > 10). */
export function incompressibleCf(reynolds: number, regime: 'laminar' | 'turbulent'): number {
  return regime === 'laminar' ? 1.328 / Math.sqrt(reynolds) : 0.455 / Math.pow(Math.log10(reynolds), 2.58);
}

/** Prandtl's transition formula on incompressible laws (see the file's note). */
export function incompressibleMixedCf(reynolds: number, transitionReynolds: number): number {
  if (reynolds <= transitionReynolds) return incompressibleCf(reynolds, 'laminar');
  const a = transitionReynolds * (incompressibleCf(transitionReynolds, 'turbulent') - incompressibleCf(transitionReynolds, 'laminar'));
  return incompressibleCf(reynolds, 'turbulent') - a / reynolds;
}

const sci = (v: number) => formatNumber(v, 3);

interface OneLaw {
  cf: number;
  tRef: number;
  tw: number;
  /** Reynolds number at the reference temperature. */
  reRef: number;
}

/** One law, compressible by the reference-temperature method, at edge Reynolds number `re`. */
function compressible(re: number, law: 'laminar' | 'turbulent', mach: number, te: number, gamma: number, wall?: number): OneLaw {
  const recovery = law === 'turbulent' ? 0.89 : 0.85;
  const tw = wall ?? te * (1 + recovery * ((gamma - 1) / 2) * mach * mach);
  const tRef = te * (1 + 0.035 * mach * mach + 0.45 * (tw / te - 1));
  const rhoRatio = te / tRef;
  const muRatio = sutherlandViscosity(te) / sutherlandViscosity(tRef);
  const reRef = re * rhoRatio * muRatio;
  return { cf: incompressibleCf(reRef, law) * rhoRatio, tRef, tw, reRef };
}

/**
 * Average skin-friction coefficient of a flat plate (see the file's note). Returns null only
 * for input that has no meaning (Re ≤ 0, M < 0, Te ≤ 0, Re_t ≤ 0, anything not finite).
 */
export function skinFriction(input: SkinFrictionInput): SkinFrictionResult | null {
  const { reynolds: re, mach, edgeTemperatureK: te, regime } = input;
  const gamma = input.gamma ?? 1.4;
  const reT = input.transitionReynolds ?? TRANSITION_REYNOLDS_DEFAULT;
  if (!(re > 0) || !Number.isFinite(re) || !(mach >= 0) || !Number.isFinite(mach) || !(te > 0) || !(reT > 0) || !Number.isFinite(reT)) return null;
  const flags: FrictionFlag[] = [];
  const laminarRange = (r: number) => {
    if (r < LAMINAR_LAW_MIN_REYNOLDS) {
      flags.push({
        code: 'laminar-below-range',
        message: `Re ${sci(r)} is below ${sci(LAMINAR_LAW_MIN_REYNOLDS)}, where the laminar (Blasius) law's boundary-layer approximation no longer holds; treat the friction as indicative only.`,
      });
    }
  };
  const turbulentRange = (r: number, reRef: number) => {
    if (r > TURBULENT_LAW_MAX_REYNOLDS) {
      flags.push({ code: 'turbulent-above-range', message: `Re ${sci(r)} is above ${sci(TURBULENT_LAW_MAX_REYNOLDS)}, the top of the turbulent (Prandtl–Schlichting) law's range.` });
    } else if (reRef < TURBULENT_LAW_MIN_REYNOLDS) {
      flags.push({
        code: 'turbulent-below-range',
        message: `The turbulent (Prandtl–Schlichting) law is used at Re ${sci(reRef)} (at the reference temperature), below its range from ${sci(TURBULENT_LAW_MIN_REYNOLDS)}.`,
      });
    }
  };

  if (regime === 'laminar') {
    const l = compressible(re, 'laminar', mach, te, gamma, input.wallTemperatureK);
    laminarRange(re);
    if (re > reT) {
      flags.push({
        code: 'laminar-above-transition',
        message: `Laminar flow is assumed at Re ${sci(re)}, above the transition Reynolds number ${sci(reT)}; choose mixed flow unless transition is known to be delayed.`,
      });
    }
    return { cf: l.cf, cfIncompressible: incompressibleCf(re, 'laminar'), referenceTemperatureK: l.tRef, wallTemperatureK: l.tw, law: 'laminar', flags };
  }

  if (regime === 'turbulent') {
    const t = compressible(re, 'turbulent', mach, te, gamma, input.wallTemperatureK);
    if (!(t.reRef > 10)) {
      const l = compressible(re, 'laminar', mach, te, gamma, input.wallTemperatureK);
      laminarRange(re);
      flags.push({
        code: 'turbulent-undefined',
        message: `The turbulent law has no value at Re ${sci(re)}; the laminar value is given instead.`,
      });
      return { cf: l.cf, cfIncompressible: incompressibleCf(re, 'laminar'), referenceTemperatureK: l.tRef, wallTemperatureK: l.tw, law: 'laminar', flags };
    }
    if (re < reT) {
      flags.push({
        code: 'turbulent-below-transition',
        message: `A fully turbulent layer is assumed at Re ${sci(re)}, below the transition Reynolds number ${sci(reT)}; that needs tripping at the leading edge (mixed flow would be laminar here).`,
      });
    }
    turbulentRange(re, t.reRef);
    return { cf: t.cf, cfIncompressible: incompressibleCf(re, 'turbulent'), referenceTemperatureK: t.tRef, wallTemperatureK: t.tw, law: 'turbulent', flags };
  }

  // Mixed: laminar up to Re_t, then Prandtl's transition formula on the compressible laws.
  if (re <= reT) {
    const l = compressible(re, 'laminar', mach, te, gamma, input.wallTemperatureK);
    laminarRange(re);
    return { cf: l.cf, cfIncompressible: incompressibleCf(re, 'laminar'), referenceTemperatureK: l.tRef, wallTemperatureK: l.tw, law: 'laminar', flags };
  }
  const tAll = compressible(re, 'turbulent', mach, te, gamma, input.wallTemperatureK);
  const tTr = compressible(reT, 'turbulent', mach, te, gamma, input.wallTemperatureK);
  const lTr = compressible(reT, 'laminar', mach, te, gamma, input.wallTemperatureK);
  laminarRange(reT);
  if (!(tTr.reRef > 10)) {
    flags.push({
      code: 'turbulent-undefined',
      message: `The turbulent law has no value at the transition Reynolds number ${sci(reT)}; the plate is taken as laminar over its whole length.`,
    });
    const l = compressible(re, 'laminar', mach, te, gamma, input.wallTemperatureK);
    return { cf: l.cf, cfIncompressible: incompressibleCf(re, 'laminar'), referenceTemperatureK: l.tRef, wallTemperatureK: l.tw, law: 'laminar', flags };
  }
  turbulentRange(re, tAll.reRef);
  const cf = tAll.cf - (reT / re) * (tTr.cf - lTr.cf);
  return {
    cf,
    cfIncompressible: incompressibleMixedCf(re, reT),
    referenceTemperatureK: tAll.tRef,
    wallTemperatureK: tAll.tw,
    law: 'mixed',
    flags,
  };
}
