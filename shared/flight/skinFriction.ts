import { sutherlandViscosity } from './standardAtmosphere.ts';

/**
 * Flat-plate skin friction with compressibility, by the reference-temperature method of Sommer &
 * Short (NACA TN 3391, 1955): evaluate the incompressible law at the reference temperature
 *   T'/Te = 1 + 0.035·Me² + 0.45·(Tw/Te − 1)
 * i.e. Cf = Cf_inc(Re')·(ρ'/ρe) with Re' = Re·(ρ'/ρe)·(μe/μ'), ρ'/ρe = Te/T' (same pressure),
 * μ by Sutherland's law. Incompressible laws: turbulent Prandtl–Schlichting average
 * Cf = 0.455/(log10 Re)^2.58 (Schlichting, Boundary-Layer Theory), laminar Blasius average
 * Cf = 1.328/√Re. The wall is adiabatic unless a wall temperature is given: Taw = Te·(1 + r·(γ−1)/2·Me²)
 * with recovery factor r = Pr^(1/3) = 0.89 turbulent, Pr^(1/2) = 0.85 laminar (Pr = 0.72, common practice).
 *
 * This is an estimate for a smooth plate with the whole length in one regime; it says nothing
 * about transition, roughness, pressure gradient or separation.
 */
export type FrictionRegime = 'turbulent' | 'laminar';

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
}

export interface SkinFrictionResult {
  /** Average skin-friction coefficient over the length, based on edge q. */
  cf: number;
  /** The incompressible value at the same Reynolds number (for the ratio). */
  cfIncompressible: number;
  referenceTemperatureK: number;
  wallTemperatureK: number;
}

export function incompressibleCf(reynolds: number, regime: FrictionRegime): number {
  return regime === 'laminar' ? 1.328 / Math.sqrt(reynolds) : 0.455 / Math.pow(Math.log10(reynolds), 2.58);
}

export function skinFriction(input: SkinFrictionInput): SkinFrictionResult | null {
  const { reynolds, mach, edgeTemperatureK: te, regime } = input;
  const gamma = input.gamma ?? 1.4;
  if (!(reynolds > 1e3) || !(mach >= 0) || !(te > 0)) return null;
  const recovery = regime === 'turbulent' ? 0.89 : 0.85;
  const tw = input.wallTemperatureK ?? te * (1 + recovery * ((gamma - 1) / 2) * mach * mach);
  const tRef = te * (1 + 0.035 * mach * mach + 0.45 * (tw / te - 1));
  const rhoRatio = te / tRef;
  const muRatio = sutherlandViscosity(te) / sutherlandViscosity(tRef);
  const reRef = reynolds * rhoRatio * muRatio;
  return {
    cf: incompressibleCf(reRef, regime) * rhoRatio,
    cfIncompressible: incompressibleCf(reynolds, regime),
    referenceTemperatureK: tRef,
    wallTemperatureK: tw,
  };
}
