import { standardAtmosphere, type AtmosphereState } from './standardAtmosphere.ts';
import { skinFriction, type FrictionRegime } from './skinFriction.ts';

/**
 * From coefficients to loads at a flight condition: free-stream state from the 1976 standard
 * atmosphere at the condition's altitude, dynamic pressure q∞ = ½·γ·p∞·M∞², friction drag on
 * both surfaces' wetted lengths, and per-span and whole-span forces and moments. SI throughout
 * (display units are applied by shared/flight/units.ts).
 */
export interface LoadsInput {
  mach: number;
  gamma: number;
  altitudeM: number;
  /** Physical chord of the section, m. */
  chordM: number;
  /** Span the section load is spread over, m (for whole-span totals). */
  spanM: number;
  /** Wetted length of each surface over the chord (sum of facet lengths / chord). */
  wettedUpperOverC: number;
  wettedLowerOverC: number;
  frictionRegime: FrictionRegime | 'none';
  coefficients: { cl: number; cd: number; cm: number };
  /** Hinge-moment coefficient (over q∞·c_f²) and flap chord over chord, when there is a flap. */
  hinge?: { ch: number; flapChordOverC: number } | null;
}

export interface LoadsResult {
  atmosphere: AtmosphereState;
  velocityMS: number;
  dynamicPressurePa: number;
  /** Reynolds number on the chord (free-stream). */
  reynoldsChord: number;
  friction: { regime: FrictionRegime | 'none'; cfUpper: number; cfLower: number; cdFriction: number } ;
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
  const velocity = input.mach * atm.speedOfSoundMS;
  const q = 0.5 * input.gamma * atm.pressurePa * input.mach * input.mach;
  const reChord = (atm.densityKgM3 * velocity * input.chordM) / atm.viscosityPaS;

  let cfUpper = 0;
  let cfLower = 0;
  if (input.frictionRegime !== 'none') {
    // Each surface as a flat plate of its own wetted length, at free-stream conditions.
    const surface = (wettedOverC: number) =>
      skinFriction({ reynolds: reChord * wettedOverC, mach: input.mach, edgeTemperatureK: atm.temperatureK, regime: input.frictionRegime as FrictionRegime, gamma: input.gamma })?.cf ?? 0;
    cfUpper = surface(input.wettedUpperOverC);
    cfLower = surface(input.wettedLowerOverC);
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
      velocityMS: velocity,
      dynamicPressurePa: q,
      reynoldsChord: reChord,
      friction: { regime: input.frictionRegime, cfUpper, cfLower, cdFriction },
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
