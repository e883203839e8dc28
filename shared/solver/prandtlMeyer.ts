import { atanNearZero } from './atanNearZero';
import { PRANDTL_MEYER_TOLERANCE_RAD } from './constants';

/**
 * Prandtl-Meyer function ν(M) in radians: the angle through which a sonic stream must expand
 * isentropically to reach Mach `mach`,
 * ν = √((γ+1)/(γ−1)) · atan √((γ−1)(M²−1)/(γ+1)) − atan √(M²−1).
 *
 * Sign: ν grows with M; an expansion (convex turn) of Δ raises ν by Δ. Edge cases: ν(1) = 0;
 * ν(∞) = prandtlMeyerMax(γ). M < 1 throws a RangeError (programmer error).
 *
 * Source: NACA Report 1135, Prandtl-Meyer flow relations.
 */
export function prandtlMeyer(mach: number, gamma: number): number {
  if (!(mach >= 1)) throw new RangeError(`prandtlMeyer needs M ≥ 1, got ${mach}`);
  return nuFromS(Math.sqrt((mach - 1) * (mach + 1)), Math.sqrt((gamma + 1) / (gamma - 1)));
}

/**
 * Largest Prandtl-Meyer angle ν_max = (π/2)(√((γ+1)/(γ−1)) − 1), radians: the expansion into
 * vacuum (M → ∞, p → 0). 130.45° for γ = 1.4, 90° for γ = 5/3; grows without bound as γ → 1.
 *
 * Source: NACA Report 1135, Prandtl-Meyer flow relations (ν at M = ∞).
 */
export function prandtlMeyerMax(gamma: number): number {
  return (Math.PI / 2) * (Math.sqrt((gamma + 1) / (gamma - 1)) - 1);
}

/**
 * Inverse of the Prandtl-Meyer function: the Mach number whose ν equals `nu` (radians).
 *
 * Solved in s = √(M²−1) by a safeguarded Newton iteration until the residual |ν(M) − nu| is
 * below 1e-14·max(1, nu). When the caller knows a nearby state (`nearMach` with its exact
 * Prandtl-Meyer angle `nearNu`, e.g. the flow ahead of a fan) this is `machAfterExpansion`
 * from there; otherwise the start blends the small-ν series s ≈ (3(γ+1)ν/2)^⅓ and the large-ν
 * asymptote s ≈ (k²−1)/(ν_max − ν).
 *
 * Edge cases: nu = 0 → 1; nu ≥ ν_max → +Infinity (vacuum: callers turn that into the `vacuum`
 * status before asking). A negative nu throws a RangeError (programmer error).
 *
 * Source: inverse of NACA Report 1135, Prandtl-Meyer flow relations.
 */
export function machFromPrandtlMeyer(nu: number, gamma: number, nearMach?: number, nearNu?: number): number {
  if (!(nu >= 0)) throw new RangeError(`machFromPrandtlMeyer needs ν ≥ 0, got ${nu}`);
  if (nearMach !== undefined && nearMach >= 1 && nearMach < 1e150) {
    const nu0 = nearNu !== undefined ? nearNu : prandtlMeyer(nearMach, gamma);
    return machAfterExpansion(nearMach, nu0, nu - nu0, gamma);
  }
  const k = Math.sqrt((gamma + 1) / (gamma - 1));
  const nuMax = (Math.PI / 2) * (k - 1);
  if (nu >= nuMax) return Number.POSITIVE_INFINITY;
  if (nu === 0) return 1;
  const k2m1 = k * k - 1;
  const small = Math.cbrt(1.5 * (gamma + 1) * nu);
  const large = k2m1 / (nuMax - nu);
  const start = nu < 0.5 * nuMax ? Math.min(small, large) : Math.max(small, large);
  return Math.sqrt(1 + solveS(0, 0, nu, k, start, 0, Number.POSITIVE_INFINITY, PRANDTL_MEYER_TOLERANCE_RAD * Math.max(1, nu)) ** 2);
}

/**
 * Mach number after an isentropic turn that changes the Prandtl-Meyer angle by `dNu` (radians;
 * > 0 expansion, < 0 isentropic compression) from a stream at Mach `mach` whose Prandtl-Meyer
 * angle is `nu` (pass the exact ν(mach): the march carries it).
 *
 * Solves ν(s) − ν(s0) = dNu in s = √(M²−1), where the difference is evaluated as
 * k·atan(k(s − s0)/(k² + s s0)) − atan((s − s0)/(1 + s s0)) (k² = (γ+1)/(γ−1)), so a small turn
 * costs a few multiplications (series atan) instead of two library calls, and carries no
 * cancellation. Start: the second-order Taylor step from s0; then safeguarded Newton until the
 * residual, or the next step's quadratic error |ν''|·step²/2, is below 1e-14·max(1, ν + dNu).
 *
 * Edge cases: dNu = 0 → mach; ν + dNu ≥ ν_max → +Infinity (vacuum); ν + dNu ≤ 0 → 1.
 *
 * Source: NACA Report 1135, Prandtl-Meyer flow relations (ν(M)); the atan subtraction formula.
 */
export function machAfterExpansion(mach: number, nu: number, dNu: number, gamma: number): number {
  if (dNu === 0) return mach;
  const s = machParameterAfterExpansion(Math.sqrt((mach - 1) * (mach + 1)), nu, dNu, gamma);
  return Number.isFinite(s) ? Math.sqrt(1 + s * s) : s;
}

/**
 * `machAfterExpansion` in terms of the Mach parameter s = √(M² − 1) (dimensionless): takes s0
 * of the stream, its Prandtl-Meyer angle `nu` and the change `dNu` (radians, > 0 expansion),
 * and returns s after the turn. The march carries s from facet to facet so that no square root
 * sits on its critical path. `guess` (optional): a start the caller already has, used instead of
 * the Taylor step when it lies on the right side of s0 (the march passes its own Newton iterate
 * when that iterate did not pass the accuracy check). Edge cases: dNu = 0 → s0; ν + dNu ≥ ν_max
 * → +Infinity (vacuum); ν + dNu ≤ 0 → 0 (sonic).
 *
 * Source: as `machAfterExpansion`.
 */
export function machParameterAfterExpansion(s0: number, nu: number, dNu: number, gamma: number, guess?: number): number {
  if (dNu === 0) return s0;
  const k2 = (gamma + 1) / (gamma - 1);
  const k = Math.sqrt(k2);
  const target = nu + dNu;
  if (target >= (Math.PI / 2) * (k - 1)) return Number.POSITIVE_INFINITY;
  if (target <= 0) return 0;
  let start: number;
  if (guess !== undefined && (dNu > 0 ? guess > s0 : guess >= 0 && guess < s0)) {
    start = guess;
  } else if (s0 > 0) {
    // Second-order Taylor step: Δs ≈ Δν/ν' − (ν''/ν')·(Δν/ν')²/2.
    const q = (k2 + s0 * s0) * (1 + s0 * s0);
    const step = (dNu * q) / ((k2 - 1) * s0 * s0);
    start = s0 + step - ((k2 - s0 * s0 * s0 * s0) / (s0 * q)) * step * step;
  } else {
    start = Math.cbrt(1.5 * (gamma + 1) * dNu);
  }
  const lo = dNu > 0 ? s0 : 0;
  const hi = dNu > 0 ? Number.POSITIVE_INFINITY : s0;
  return solveS(s0, nu, target, k, start, lo, hi, PRANDTL_MEYER_TOLERANCE_RAD * Math.max(1, target));
}

/**
 * Safeguarded Newton for ν(s) = target, with ν(s) − ν(s0) evaluated by the subtraction formula
 * (s0 = 0, nu0 = 0 gives ν itself). Bracket [lo, hi] holds the root. Uses
 * ν' = (k²−1)s²/P and ν''/ν' = 2(k² − s⁴)/(s·P), P = (k² + s²)(1 + s²).
 */
function solveS(
  s0: number,
  nu0: number,
  target: number,
  k: number,
  start: number,
  lo: number,
  hi: number,
  tol: number,
): number {
  const k2 = k * k;
  const k2m1 = k2 - 1;
  const dNu = target - nu0;
  let s = start;
  for (let iter = 0; iter < 200; iter++) {
    if (!(s > lo && s < hi)) s = hi < Number.POSITIVE_INFINITY ? 0.5 * (lo + hi) : Math.max(2 * lo, lo + 1);
    const ds = s - s0;
    const ss0 = s * s0;
    const a = k2 + ss0;
    const b = 1 + ss0;
    // 1/ν'(s) = P/((k²−1)s²) depends on s alone: worked out beside the residual, so the Newton
    // step after it is one multiplication (each fan of the march waits on the one before).
    const s2 = s * s;
    const p = (k2 + s2) * (1 + s2);
    const slope = p / (k2m1 * s2);
    const f = k * atanNearZero((k * ds) / a) - atanNearZero(ds / b) - dNu;
    if (Math.abs(f) <= tol) break;
    if (f < 0) lo = s;
    else hi = s;
    if (hi < Number.POSITIVE_INFINITY && hi - lo <= 4e-16 * hi) break;
    const step = f * slope;
    const next = s - step;
    // Newton's next error is ≈ (ν''/2ν')·step², so its residual is ≈ |ν''|·step²/2
    // = |k² − s⁴|·(k²−1)·s·step²/P².
    if (
      next > lo &&
      next < hi &&
      Math.abs(step) < 0.1 * next &&
      (Math.abs(k2 - s2 * s2) * k2m1 * s * step * step) / (p * p) <= 0.25 * tol
    ) {
      return next;
    }
    s = next;
  }
  return s;
}

/** ν as a function of s = √(M²−1) and k = √((γ+1)/(γ−1)). */
function nuFromS(s: number, k: number): number {
  return k * Math.atan(s / k) - Math.atan(s);
}
