/** State change across a normal shock. Ratios are downstream over upstream. */
export interface NormalShockResult {
  /** Mach number behind the shock (≤ 1). */
  mach2: number;
  /** Static pressure ratio p2/p1. */
  pRatio: number;
  /** Density ratio ρ2/ρ1. */
  rhoRatio: number;
  /** Static temperature ratio T2/T1. */
  tRatio: number;
  /** Stagnation pressure ratio p02/p01 (≤ 1: the entropy rise). */
  p0Ratio: number;
}

/**
 * Normal-shock relations for a calorically perfect gas with upstream Mach `mach1` (≥ 1).
 *
 * Also the normal-component relations of an oblique shock (pass M1·sin β). Edge cases: M1 = 1
 * gives M2 = 1 and all ratios 1 (a Mach wave). M1 < 1 has no shock and throws a RangeError
 * (programmer error). As M1 → ∞, ρ2/ρ1 → (γ+1)/(γ−1).
 *
 * Source: NACA Report 1135, normal-shock relations (M2, p2/p1, ρ2/ρ1, T2/T1, p02/p01).
 */
export function normalShock(mach1: number, gamma: number): NormalShockResult {
  if (!(mach1 >= 1)) throw new RangeError(`normalShock needs M1 ≥ 1, got ${mach1}`);
  if (!(gamma > 1)) throw new RangeError(`normalShock needs γ > 1, got ${gamma}`);
  const m2 = mach1 * mach1;
  const g1 = gamma - 1;
  const pRatio = 1 + ((2 * gamma) / (gamma + 1)) * (m2 - 1);
  const rhoRatio = ((gamma + 1) * m2) / (g1 * m2 + 2);
  const tRatio = pRatio / rhoRatio;
  const mach2 = Math.sqrt((1 + 0.5 * g1 * m2) / (gamma * m2 - 0.5 * g1));
  // p02/p01 = (ρ2/ρ1)^(γ/(γ−1)) · (p2/p1)^(−1/(γ−1)), taken through logs for γ near 1.
  const p0Ratio = Math.exp((gamma * Math.log(rhoRatio) - Math.log(pRatio)) / g1);
  return { mach2, pRatio, rhoRatio, tRatio, p0Ratio };
}
