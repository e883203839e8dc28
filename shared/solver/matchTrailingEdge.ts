import { TAIL_ROOT_TOLERANCE_RAD, VACUUM_MARGIN_RELATIVE } from './constants';
import { cotBetaAtMaxDeflection, maxDeflectionAtCot } from './maxDeflection';
import { shockCotAngle } from './obliqueShock';
import { machAfterExpansion, prandtlMeyer, prandtlMeyerMax } from './prandtlMeyer';
import { busemannCoefficients } from './secondOrderTheory';

/** The state of one stream arriving at the trailing edge. Angles in radians. */
export interface TailStream {
  mach: number;
  /** p/p∞. */
  pRatio: number;
  /** Flow direction in body axes (the last facet's angle φ). */
  direction: number;
  /** Prandtl-Meyer angle of the stream, if known (saves its evaluation). */
  nu?: number;
}

/** What one stream does at the trailing edge. Angles in radians. */
export interface TailTurn {
  kind: 'shock' | 'fan' | 'none';
  /** Deflection of the stream, + = compression (upper: δ − φ_u; lower: φ_l − δ). */
  deflection: number;
  /** Shock angle from the stream's direction (shocks; 0 otherwise). */
  beta: number;
  machAfter: number;
  pRatioAfter: number;
}

export type TailMatch =
  | {
      status: 'matched';
      /** Common flow direction behind the tail = slip-line direction, body axes. */
      slip: number;
      pRatio: number;
      upper: TailTurn;
      lower: TailTurn;
    }
  | { status: 'unmatched'; reason: string };

/**
 * Trailing-edge matching: finds the common flow direction δ behind the tail at which the upper
 * and lower streams, each turned through a weak oblique shock or a Prandtl-Meyer fan, reach the
 * same pressure (the slip line carries no pressure jump).
 *
 * Signs: the upper stream's deflection δ − φ_u and the lower stream's φ_l − δ are positive for
 * compression. ln p_u rises and ln p_l falls monotonically with δ, so G(δ) = ln p_u − ln p_l
 * has at most one root in the range where both turns exist (attached shocks up to θmax,
 * expansions up to ν_max). Newton's method on G with exact derivatives (d ln p/dθ =
 * γM²/√(M²−1) along a fan; from the θ-β-M relation across a shock), started from the
 * second-order (Busemann) estimate and kept inside a shrinking bracket, reaches 1e-13 rad in
 * two evaluations of G for most sections (it stops when the error its quadratic convergence
 * leaves, measured on the last two steps, is below a quarter of that), then one more for the
 * waves' states.
 *
 * Edge case (a result): when no δ in that range balances the pressures — one stream would need
 * a turn beyond θmax — it returns `{ status: 'unmatched', reason }`; the surface loads upstream
 * are unaffected (no upstream influence in supersonic flow).
 *
 * Source: shock-expansion method at a trailing edge (e.g. Anderson, "Modern Compressible Flow",
 * shock-expansion theory, from memory); NACA Report 1135 for the wave relations.
 */
export function matchTrailingEdge(upper: TailStream, lower: TailStream, gamma: number): TailMatch {
  const nuMax = prandtlMeyerMax(gamma);
  const nuLimit = nuMax * (1 - VACUUM_MARGIN_RELATIVE);
  const su = side(upper, gamma);
  const sl = side(lower, gamma);

  // δ range where both turns exist: upper δ − φu ∈ [−(ν_lim − νu), θmax_u],
  // lower φl − δ ∈ [−(ν_lim − νl), θmax_l].
  const lo = Math.max(upper.direction - (nuLimit - su.nu), lower.direction - sl.thetaMax);
  const hi = Math.min(upper.direction + su.thetaMax, lower.direction + (nuLimit - sl.nu));
  if (!(lo <= hi)) {
    return { status: 'unmatched', reason: 'the two streams meet at too large an angle for attached waves' };
  }

  const ev = { g: 0, dg: 0 };

  // Start: the root of G in second-order theory, ln p ≈ ln p_s + k_s·θ + k2_s·θ² for a turn θ
  // (k = γM²/√(M²−1), k2 from Busemann's C2): the linear root, then one Newton step on the
  // quadratic (where the linear terms cancel, G = k2_u·θu² − k2_l·θl²). About fifty times closer
  // than the linear root on the demo fin (2e-4 against 1e-2 rad), which saves a Newton step.
  const ku = su.dlnp0;
  const kl = sl.dlnp0;
  let delta = (Math.log(lower.pRatio / upper.pRatio) + ku * upper.direction + kl * lower.direction) / (ku + kl);
  const tu = delta - upper.direction;
  const tl = lower.direction - delta;
  const second = delta - (su.d2lnp0 * tu * tu - sl.d2lnp0 * tl * tl) / (ku + kl + 2 * (su.d2lnp0 * tu + sl.d2lnp0 * tl));
  if (second > lo && second < hi) delta = second;
  else if (!(delta > lo && delta < hi)) delta = Math.min(hi, Math.max(lo, delta));
  // Newton inside the shrinking bracket [a, b]; a step that would leave it (or meets the
  // infinite slope at θmax) is replaced by bisection.
  let a = lo;
  let b = hi;
  let converged = false;
  // Length of the previous step when it was a Newton step (0: none yet, or a bisection).
  let lastNewton = 0;
  for (let iter = 0; iter < 100; iter++) {
    evaluate(ev, su, sl, upper.direction, lower.direction, delta, gamma);
    if (ev.g === 0) {
      converged = true;
      break;
    }
    if (ev.g < 0) a = delta;
    else b = delta;
    let next = delta - ev.g / ev.dg;
    let step = Math.abs(next - delta);
    // A tiny step with a large residual is the near-infinite slope at θmax, not convergence.
    const stalled = step <= TAIL_ROOT_TOLERANCE_RAD && Math.abs(ev.g) > 1e-10;
    const newton = next > a && next < b && !stalled;
    if (!newton) {
      next = 0.5 * (a + b);
      step = Math.abs(next - delta);
    }
    // Newton converges quadratically: the error left after this step is about C·step², with
    // C = |G''/2G'| measured as this step over the square of the last (both Newton steps, this
    // one ten times shorter: the quadratic regime). Below a quarter of the tolerance, another
    // evaluation would only confirm `next` (it saves one of the four or five per solve).
    const quadratic =
      newton && lastNewton > 0 && step < 0.1 * lastNewton && (step / (lastNewton * lastNewton)) * step * step <= 0.25 * TAIL_ROOT_TOLERANCE_RAD;
    if (step <= TAIL_ROOT_TOLERANCE_RAD || b - a <= TAIL_ROOT_TOLERANCE_RAD || quadratic) {
      delta = next;
      converged = true;
      break;
    }
    lastNewton = newton ? step : 0;
    delta = next;
  }
  // Pinned against an end of the range: is there a sign change at all?
  if (!converged || delta - lo <= TAIL_ROOT_TOLERANCE_RAD || hi - delta <= TAIL_ROOT_TOLERANCE_RAD) {
    evaluate(ev, su, sl, upper.direction, lower.direction, lo, gamma);
    if (ev.g > 0) return { status: 'unmatched', reason: unmatchedReason(true) };
    evaluate(ev, su, sl, upper.direction, lower.direction, hi, gamma);
    if (ev.g < 0) return { status: 'unmatched', reason: unmatchedReason(false) };
  }

  const upperTurn = tailTurn(su, upper, delta - upper.direction, gamma);
  const lowerTurn = tailTurn(sl, lower, lower.direction - delta, gamma);
  return {
    status: 'matched',
    slip: delta,
    pRatio: 0.5 * (upperTurn.pRatioAfter + lowerTurn.pRatioAfter),
    upper: upperTurn,
    lower: lowerTurn,
  };
}

/**
 * G(δ) = ln p_u − ln p_l and its derivative into `ev`, both streams turned to the direction δ.
 * (A module function rather than a closure: a closure made on every call costs its creation in
 * the core solve.)
 */
function evaluate(ev: { g: number; dg: number }, su: Side, sl: Side, upperDirection: number, lowerDirection: number, delta: number, gamma: number): void {
  turned(su, delta - upperDirection, gamma);
  const lu = su.lnp;
  const du = su.dlnp;
  turned(sl, lowerDirection - delta, gamma);
  ev.g = lu - sl.lnp;
  ev.dg = du + sl.dlnp;
}

function unmatchedReason(upperTooHigh: boolean): string {
  return upperTooHigh
    ? 'the lower stream would need a compression beyond the maximum deflection'
    : 'the upper stream would need a compression beyond the maximum deflection';
}

/** One stream's constants and its last evaluation (mutable scratch, local to one call). */
interface Side {
  mach: number;
  lnp1: number;
  nu: number;
  thetaMax: number;
  uMax: number;
  /** d ln p/dθ of a weak wave, γM²/√(M²−1). */
  dlnp0: number;
  /** Half of d² ln p/dθ² of a weak wave, (γM²/2)·C2 − dlnp0²/2 (C2: Busemann's coefficient). */
  d2lnp0: number;
  gamma: number;
  // last evaluation
  lnp: number;
  dlnp: number;
  machAfter: number;
  u: number;
}

function side(s: TailStream, gamma: number): Side {
  const m = s.mach;
  const uMax = cotBetaAtMaxDeflection(m, gamma);
  const dlnp0 = (gamma * m * m) / Math.sqrt(Math.max(1e-300, (m - 1) * (m + 1)));
  return {
    mach: m,
    lnp1: Math.log(s.pRatio),
    nu: s.nu ?? prandtlMeyer(m, gamma),
    // maxDeflection's θmax (0 for M ≤ 1), from the u it also needs.
    thetaMax: m > 1 ? maxDeflectionAtCot(m, gamma, uMax) : 0,
    uMax,
    dlnp0,
    d2lnp0: 0.5 * gamma * m * m * busemannCoefficients(m, gamma).c2 - 0.5 * dlnp0 * dlnp0,
    gamma,
    lnp: 0,
    dlnp: 0,
    machAfter: m,
    u: 0,
  };
}

/** Sets s.lnp (ln p/p∞ after turning through d, + compression), s.dlnp, s.machAfter, s.u. */
function turned(s: Side, d: number, gamma: number): void {
  const m = s.mach;
  if (d > 0) {
    const t = Math.tan(Math.min(d, s.thetaMax));
    const m2 = m * m;
    const A = m2 - 1;
    const B = (gamma + 1) * m2 + 2;
    const C = (gamma - 1) * m2 + 2;
    const u = shockCotAngle(m, t, gamma, s.uMax, true);
    const u2 = 1 + u * u;
    const c = (2 * gamma) / (gamma + 1);
    const mn1s = Math.max(1, m2 / u2);
    const pr = 1 + c * (mn1s - 1);
    const den = B * u * u + C;
    const dg = (2 * (A - 3 * u * u) * den - 2 * u * (A - u * u) * 2 * B * u) / (den * den); // d tanθ/du
    const dThetaDu = dg / (1 + t * t);
    const dPrDu = (c * m2 * -2 * u) / (u2 * u2);
    s.lnp = s.lnp1 + Math.log(pr);
    s.dlnp = dThetaDu !== 0 ? dPrDu / pr / dThetaDu : Number.POSITIVE_INFINITY;
    const g1 = gamma - 1;
    const mn2 = Math.sqrt((1 + 0.5 * g1 * mn1s) / (gamma * mn1s - 0.5 * g1));
    s.machAfter = (mn2 * Math.sqrt(u2 * (1 + t * t))) / (1 - u * t);
    s.u = u;
  } else if (d < 0) {
    const m2 = machAfterExpansion(m, s.nu, -d, gamma);
    if (!Number.isFinite(m2)) {
      s.lnp = Number.NEGATIVE_INFINITY;
      s.dlnp = Number.POSITIVE_INFINITY;
      s.machAfter = m2;
      return;
    }
    const h = 0.5 * (gamma - 1);
    s.lnp = s.lnp1 + (gamma / (gamma - 1)) * (Math.log1p(h * m * m) - Math.log1p(h * m2 * m2));
    s.dlnp = (gamma * m2 * m2) / Math.sqrt((m2 - 1) * (m2 + 1));
    s.machAfter = m2;
  } else {
    s.lnp = s.lnp1;
    s.dlnp = s.dlnp0;
    s.machAfter = m;
  }
}

function tailTurn(s: Side, stream: TailStream, d: number, gamma: number): TailTurn {
  turned(s, d, gamma);
  const pRatioAfter = Math.exp(s.lnp);
  if (d > 0) {
    return { kind: 'shock', deflection: d, beta: Math.atan2(1, s.u), machAfter: s.machAfter, pRatioAfter };
  }
  if (d < 0) return { kind: 'fan', deflection: d, beta: 0, machAfter: s.machAfter, pRatioAfter };
  return { kind: 'none', deflection: 0, beta: 0, machAfter: stream.mach, pRatioAfter: stream.pRatio };
}
