import { SHOCK_ROOT_TOLERANCE_RAD } from './constants';
import { cotBetaAtMaxDeflection } from './maxDeflection';

/** Which of the two attached solutions of the θ-β-M relation. */
export type ShockBranch = 'weak' | 'strong';

/** An attached oblique shock. Angles in radians; ratios downstream over upstream. */
export interface AttachedShock {
  status: 'attached';
  branch: ShockBranch;
  /** Deflection θ the shock turns the flow through (the input). */
  theta: number;
  /** Shock angle β from the upstream flow direction. */
  beta: number;
  /** Upstream Mach component normal to the shock, M1 sin β (≥ 1). */
  machNormal1: number;
  /** Mach number behind the shock (may be < 1: weak branch near θmax, or the strong branch). */
  mach2: number;
  pRatio: number;
  rhoRatio: number;
  tRatio: number;
  /** Stagnation pressure ratio p02/p01 (≤ 1). */
  p0Ratio: number;
  /** θmax at this Mach number, and the shock angle there. */
  thetaMax: number;
  betaAtMax: number;
}

/** No attached oblique shock exists: θ exceeds θmax at this Mach number (or M1 ≤ 1). */
export interface DetachedShock {
  status: 'detached';
  theta: number;
  thetaMax: number;
  betaAtMax: number;
}

export type ObliqueShockResult = AttachedShock | DetachedShock;

/**
 * Oblique shock that turns a stream of Mach `mach1` through the deflection `theta` (radians,
 * ≥ 0 = compression), for a calorically perfect gas with ratio of specific heats `gamma`.
 *
 * Works in u = cot β, where the θ-β-M relation is the rational function
 * tan θ = 2u(A − u²)/(B u² + C) (A = M² − 1, B = (γ+1)M² + 2, C = (γ−1)M² + 2): rising from 0
 * at u = 0 (normal shock) to tan θmax, then falling to 0 at u = √A (Mach wave). The start is
 * the closed-form root of the cubic (trigonometric form); a safeguarded Newton iteration inside
 * the branch's bracket (weak: [u(θmax), √A], strong: [0, u(θmax)]) then makes θ(β) reproduce θ
 * to 1e-14 rad. Near θmax β itself is ill-conditioned (dβ ~ √dθ), so there the guarantee is on
 * the θ round trip. Everything after the root is algebraic except p02/p01.
 *
 * Edge cases (results, not exceptions): θ > θmax(M1) or M1 ≤ 1 → `{ status: 'detached',
 * theta, thetaMax, betaAtMax }`; θ = 0 → the Mach wave (weak: β = μ, ratios 1) or the normal
 * shock (strong: β = π/2). A negative θ is an expansion, not a shock: RangeError (programmer
 * error).
 *
 * Sources: NACA Report 1135, oblique-shock relations (θ-β-M relation, normal-component shock
 * relations, M2 = Mn2 / sin(β − θ)); closed-form cubic root as in Rudd & Lewis, "Comparison of
 * shock calculation methods", J. Aircraft 35(4), 1998.
 */
export function obliqueShock(
  mach1: number,
  theta: number,
  gamma: number,
  branch: ShockBranch = 'weak',
): ObliqueShockResult {
  if (!(theta >= 0)) throw new RangeError(`obliqueShock needs θ ≥ 0, got ${theta}`);
  if (!(gamma > 1)) throw new RangeError(`obliqueShock needs γ > 1, got ${gamma}`);
  const m2 = mach1 * mach1;
  const A = m2 - 1;
  const B = (gamma + 1) * m2 + 2;
  const C = (gamma - 1) * m2 + 2;
  const uMax = cotBetaAtMaxDeflection(mach1, gamma);
  const tanMax = mach1 > 1 ? (2 * uMax * (A - uMax * uMax)) / (B * uMax * uMax + C) : 0;
  const thetaMax = Math.atan(tanMax);
  const betaAtMax = Math.atan2(1, uMax);
  const t = Math.tan(theta);
  if (!(mach1 > 1) || theta > thetaMax) return { status: 'detached', theta, thetaMax, betaAtMax };
  const u = cotShockAngle(A, B, C, m2, gamma, t, uMax, branch === 'weak');

  const g1 = gamma - 1;
  const u2 = 1 + u * u;
  // Rounding can put M sin β a hair under 1 for θ → 0; the shock is then a Mach wave.
  const mn1s = Math.max(1, m2 / u2);
  const pRatio = 1 + ((2 * gamma) / (gamma + 1)) * (mn1s - 1);
  const rhoRatio = ((gamma + 1) * mn1s) / (g1 * mn1s + 2);
  const mn2 = Math.sqrt((1 + 0.5 * g1 * mn1s) / (gamma * mn1s - 0.5 * g1));
  // sin(β − θ) = cos θ (1 − u tan θ) / √(1 + u²)
  const mach2 = (mn2 * Math.sqrt(u2 * (1 + t * t))) / (1 - u * t);
  return {
    status: 'attached',
    branch,
    theta,
    beta: Math.atan2(1, u),
    machNormal1: Math.sqrt(mn1s),
    mach2,
    pRatio,
    rhoRatio,
    tRatio: pRatio / rhoRatio,
    p0Ratio: Math.exp((gamma * Math.log(rhoRatio) - Math.log(pRatio)) / g1),
    thetaMax,
    betaAtMax,
  };
}

/**
 * cot β (dimensionless) of the attached shock that turns a stream of Mach `mach1` through the
 * deflection whose tangent is `tanTheta`, on the weak (`weak = true`) or strong branch: the
 * bare root used by `obliqueShock`, for callers that need only β (the trailing-edge matching
 * evaluates it several times per solve). The caller guarantees 0 ≤ θ ≤ θmax and passes
 * `uMax = cotBetaAtMaxDeflection(mach1, gamma)`. Edge case: tanTheta = 0 gives √(M²−1) (Mach
 * wave, weak) or 0 (normal shock, strong).
 *
 * Source: as `obliqueShock`.
 */
export function shockCotAngle(mach1: number, tanTheta: number, gamma: number, uMax: number, weak: boolean): number {
  const m2 = mach1 * mach1;
  return cotShockAngle(m2 - 1, (gamma + 1) * m2 + 2, (gamma - 1) * m2 + 2, m2, gamma, tanTheta, uMax, weak);
}

/** cot β on one branch for 0 ≤ tan θ ≤ tan θmax (the caller has checked). */
function cotShockAngle(
  A: number,
  B: number,
  C: number,
  m2: number,
  gamma: number,
  t: number,
  uMax: number,
  weak: boolean,
): number {
  const uMach = Math.sqrt(A);
  if (t === 0) return weak ? uMach : 0;

  // Closed-form root: tan β = (M²−1 + 2λ cos((4πδ + acos χ)/3)) / (3 a tan θ), δ = 1 weak, 0 strong.
  const a = 0.5 * C;
  const b = 1 + ((gamma + 1) / 2) * m2;
  const lambda = Math.sqrt(Math.max(0, A * A - 3 * a * b * t * t));
  let lo = weak ? uMax : 0;
  let hi = weak ? uMach : uMax;
  let u = 0.5 * (lo + hi);
  if (lambda > 0) {
    const chi = (A * A * A - 9 * a * (a + ((gamma + 1) / 4) * m2 * m2) * t * t) / (lambda * lambda * lambda);
    const ang = ((weak ? 4 * Math.PI : 0) + Math.acos(chi > 1 ? 1 : chi < -1 ? -1 : chi)) / 3;
    const guess = (3 * a * t) / (A + 2 * lambda * Math.cos(ang));
    if (guess > lo && guess < hi) u = guess;
  }

  // Safeguarded Newton on f(u) = 2u(A − u²)/(B u² + C) − tan θ: increasing on the strong
  // branch, decreasing on the weak one; the bracket holds the root because tan θ ≤ tan θmax.
  const tol = SHOCK_ROOT_TOLERANCE_RAD * (1 + t * t);
  for (let iter = 0; iter < 200; iter++) {
    const uu = u * u;
    const num = 2 * u * (A - uu);
    const den = B * uu + C;
    const f = num / den - t;
    if (Math.abs(f) <= tol) break;
    if (weak === f > 0) lo = u;
    else hi = u;
    const df = (2 * (A - 3 * uu) * den - num * 2 * B * u) / (den * den);
    let next = u - f / df;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (next === u || hi - lo <= 1e-16 * hi) {
      u = next;
      break;
    }
    u = next;
  }
  return u;
}
