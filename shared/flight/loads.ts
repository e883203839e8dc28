import { GAS_CONSTANT_AIR_J_KG_K, standardAtmosphere, type AtmosphereState } from './standardAtmosphere.ts';
import { skinFriction, TRANSITION_REYNOLDS_DEFAULT, type FrictionFlag, type FrictionRegime } from './skinFriction.ts';

/**
 * From coefficients to loads at a flight condition. SI throughout (display units are applied by
 * shared/flight/units.ts).
 *
 * One free-stream model, the same for every quantity: the 1976 standard atmosphere gives p∞, ρ∞,
 * T∞ (its molecular-scale temperature, equal to the kinetic one below 80 km) and μ∞ (Sutherland);
 * the gas is a perfect gas with R = 287.05 J/(kg·K) for air and the condition's γ. So
 *   a∞ = √(γ·R·T∞),  V∞ = M∞·a∞,  q∞ = ½·ρ∞·V∞² (= ½·γ·p∞·M∞², identically),  Re = ρ∞·V∞·c/μ∞.
 * At γ = 1.4 a∞ is the standard's own speed of sound; at another γ every quantity moves together
 * (the atmosphere's p, ρ, T stay those of the standard). Friction drag is a flat-plate estimate on
 * each surface's wetted length (shared/flight/skinFriction.ts), in the chosen regime.
 *
 * Coefficients come in over the reference chord of the section as drawn (`chordM` is that
 * chord's physical length): cl, cd over q∞·c, cm over q∞·c², ch over q∞·c_f².
 */
export const LOADS_MODEL_DESCRIPTION =
  'Free stream: 1976 standard atmosphere p, ρ, T, μ; perfect gas with R = 287.05 J/(kg·K) and the condition’s γ: ' +
  'a = √(γRT), V = M·a, q = ½ρV² = ½γpM², Re = ρVc/μ.';

export interface LoadsInput {
  mach: number;
  gamma: number;
  altitudeM: number;
  /** Physical length of the reference (drawn) chord, m. */
  chordM: number;
  /** Span the section load is spread over, m (for whole-span totals). */
  spanM: number;
  /** Wetted length of each surface over the reference chord (sum of facet lengths / chord). */
  wettedUpperOverC: number;
  wettedLowerOverC: number;
  frictionRegime: FrictionRegime | 'none';
  /** Transition Reynolds number for mixed flow (default 5×10⁵). */
  transitionReynolds?: number;
  coefficients: { cl: number; cd: number; cm: number };
  /** Hinge-moment coefficient (over q∞·c_f²) and flap chord over the drawn chord, when there is a flap. */
  hinge?: { ch: number; flapChordOverC: number } | null;
}

/** One surface's friction estimate. */
export interface SurfaceFriction {
  /** Reynolds number on the surface's wetted length (free-stream conditions). */
  reynolds: number;
  cf: number;
  law: 'laminar' | 'turbulent' | 'mixed';
  flags: FrictionFlag[];
}

export interface LoadsResult {
  atmosphere: AtmosphereState;
  /** The gas model of every figure below. */
  gas: { gamma: number; gasConstantJKgK: number; temperatureK: number; speedOfSoundMS: number; model: string };
  velocityMS: number;
  dynamicPressurePa: number;
  /** Reynolds number on the reference chord (free-stream). */
  reynoldsChord: number;
  friction: {
    regime: FrictionRegime | 'none';
    transitionReynolds: number;
    cfUpper: number;
    cfLower: number;
    cdFriction: number;
    upper: SurfaceFriction | null;
    lower: SurfaceFriction | null;
    /** Every surface's flags, each sentence once, prefixed with its surface. */
    flags: string[];
  };
  cdWave: number;
  cdTotal: number;
  perSpan: { liftNPerM: number; dragWaveNPerM: number; dragFrictionNPerM: number; dragTotalNPerM: number; momentNMPerM: number; hingeMomentNMPerM: number | null };
  total: { liftN: number; dragN: number; momentNM: number; hingeMomentNM: number | null };
}

export type LoadsAnswer = { ok: true; loads: LoadsResult } | { ok: false; reason: string };

export function computeLoads(input: LoadsInput): LoadsAnswer {
  const atm = standardAtmosphere(input.altitudeM);
  if (!atm) return { ok: false, reason: `The standard atmosphere is defined from 0 to 86 km; ${input.altitudeM} m is outside it.` };
  if (!(input.chordM > 0) || !(input.spanM > 0)) return { ok: false, reason: 'Chord and span must be positive lengths.' };
  const gamma = input.gamma;
  const temperature = atm.molecularTemperatureK;
  const speedOfSound = Math.sqrt(gamma * GAS_CONSTANT_AIR_J_KG_K * temperature);
  const velocity = input.mach * speedOfSound;
  const q = 0.5 * atm.densityKgM3 * velocity * velocity;
  const reChord = (atm.densityKgM3 * velocity * input.chordM) / atm.viscosityPaS;
  const transitionReynolds = input.transitionReynolds ?? TRANSITION_REYNOLDS_DEFAULT;

  let upper: SurfaceFriction | null = null;
  let lower: SurfaceFriction | null = null;
  if (input.frictionRegime !== 'none') {
    const regime = input.frictionRegime;
    // Each surface as a flat plate of its own wetted length, at free-stream conditions.
    const surface = (wettedOverC: number): SurfaceFriction => {
      const reynolds = reChord * wettedOverC;
      const r = skinFriction({ reynolds, mach: input.mach, edgeTemperatureK: atm.temperatureK, regime, gamma, transitionReynolds });
      // Only a non-positive length or a non-finite state has no estimate; say so rather than 0.
      if (!r) return { reynolds, cf: 0, law: regime, flags: [{ code: 'no-estimate', message: `No friction estimate at Re ${reynolds}; friction drag is left out for this surface.` }] };
      return { reynolds, cf: r.cf, law: r.law, flags: r.flags };
    };
    upper = surface(input.wettedUpperOverC);
    lower = surface(input.wettedLowerOverC);
  }
  const cfUpper = upper?.cf ?? 0;
  const cfLower = lower?.cf ?? 0;
  const flags: string[] = [];
  for (const [name, s] of [['Upper surface', upper], ['Lower surface', lower]] as const) {
    for (const f of s?.flags ?? []) flags.push(`${name}: ${f.message}`);
  }
  const cdFriction = cfUpper * input.wettedUpperOverC + cfLower * input.wettedLowerOverC;
  const cdWave = input.coefficients.cd;
  const cdTotal = cdWave + cdFriction;
  const c = input.chordM;
  const perSpan = {
    liftNPerM: input.coefficients.cl * q * c,
    dragWaveNPerM: cdWave * q * c,
    dragFrictionNPerM: cdFriction * q * c,
    dragTotalNPerM: cdTotal * q * c,
    momentNMPerM: input.coefficients.cm * q * c * c,
    hingeMomentNMPerM: input.hinge ? input.hinge.ch * q * (input.hinge.flapChordOverC * c) ** 2 : null,
  };
  return {
    ok: true,
    loads: {
      atmosphere: atm,
      gas: { gamma, gasConstantJKgK: GAS_CONSTANT_AIR_J_KG_K, temperatureK: temperature, speedOfSoundMS: speedOfSound, model: LOADS_MODEL_DESCRIPTION },
      velocityMS: velocity,
      dynamicPressurePa: q,
      reynoldsChord: reChord,
      friction: { regime: input.frictionRegime, transitionReynolds, cfUpper, cfLower, cdFriction, upper, lower, flags },
      cdWave,
      cdTotal,
      perSpan,
      total: {
        liftN: perSpan.liftNPerM * input.spanM,
        dragN: perSpan.dragTotalNPerM * input.spanM,
        momentNM: perSpan.momentNMPerM * input.spanM,
        hingeMomentNM: perSpan.hingeMomentNMPerM === null ? null : perSpan.hingeMomentNMPerM * input.spanM,
      },
    },
  };
}
