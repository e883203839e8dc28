/** Isentropic (stagnation) ratios at one Mach number. All dimensionless. */
export interface IsentropicRatios {
  /** Static over stagnation pressure, p/p0. */
  pOverP0: number;
  /** Static over stagnation temperature, T/T0. */
  tOverT0: number;
  /** Static over stagnation density, ρ/ρ0. */
  rhoOverRho0: number;
  /** Stream-tube area over the sonic (throat) area, A/A*; +Infinity at M = 0. */
  areaOverSonicArea: number;
}

/**
 * Isentropic ratios p/p0, T/T0, ρ/ρ0 and A/A* of a calorically perfect gas at Mach `mach`.
 *
 * Units: dimensionless; γ is the ratio of specific heats (1 < γ). Valid for any M ≥ 0
 * (subsonic too). Edge cases: M = 0 gives 1, 1, 1 and A/A* = +Infinity; M = 1 gives A/A* = 1.
 * Powers are taken as exp(k·log1p(·)) so that γ close to 1 neither overflows nor loses digits.
 * Negative or non-numeric M, or γ ≤ 1, throw a RangeError (programmer error).
 *
 * Source: NACA Report 1135, isentropic-flow relations (p/p0, ρ/ρ0, T/T0, A/A*).
 */
export function isentropic(mach: number, gamma: number): IsentropicRatios {
  if (!(mach >= 0)) throw new RangeError(`isentropic needs M ≥ 0, got ${mach}`);
  if (!(gamma > 1)) throw new RangeError(`isentropic needs γ > 1, got ${gamma}`);
  const g1 = gamma - 1;
  const logStag = Math.log1p(0.5 * g1 * mach * mach); // ln(T0/T)
  const tOverT0 = Math.exp(-logStag);
  const pOverP0 = Math.exp((-gamma / g1) * logStag);
  const rhoOverRho0 = Math.exp((-1 / g1) * logStag);
  // A/A* = (1/M)·[(2/(γ+1))·(1 + (γ−1)/2·M²)]^((γ+1)/(2(γ−1)))
  const areaOverSonicArea =
    mach === 0
      ? Number.POSITIVE_INFINITY
      : Math.exp(((gamma + 1) / (2 * g1)) * (logStag + Math.log(2 / (gamma + 1)))) / mach;
  return { pOverP0, tOverT0, rhoOverRho0, areaOverSonicArea };
}
