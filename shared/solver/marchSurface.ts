import { atanNearZero } from './atanNearZero';
import { PRANDTL_MEYER_TOLERANCE_RAD, VACUUM_MARGIN_RELATIVE, ZERO_TURN_RAD } from './constants';
import { obliqueShock } from './obliqueShock';
import { machParameterAfterExpansion, prandtlMeyer, prandtlMeyerMax } from './prandtlMeyer';
import { sonicDeflection } from './sonicDeflection';
import type { FacetWave } from './types';
import { present } from '../util/invariant.ts';

/** Why a surface march stopped. Angles in radians. */
export interface SurfaceLimit {
  status: 'detached' | 'subsonic' | 'vacuum';
  /** Facet (0-based, nose → tail) whose leading vertex could not be passed. */
  facet: number;
  /** The turn asked for there (+ = compression); for facet 0 the deflection from the stream. */
  turn: number;
  /** Mach number ahead of that vertex. */
  machAhead: number;
  /** detached and subsonic: θmax at machAhead. */
  thetaMax?: number;
  /** subsonic: the sonic deflection at machAhead, and the Mach number behind the shock. */
  thetaSonic?: number;
  machBehind?: number;
  /** vacuum: the Prandtl-Meyer angle the expansion needs, and ν_max. */
  nu?: number;
  nuMax?: number;
}

/**
 * The march along one surface. Arrays are per facet (nose → tail); states exist for the first
 * `solved` facets only (later entries are 0). Ratios are over free-stream values.
 */
export interface SurfaceMarch {
  /** Number of facets with a state (all of them unless `limit`). */
  solved: number;
  /** Wave at each facet's leading vertex, from the sign of the turn (every facet). */
  wave: FacetWave[];
  /** Turn at each facet's leading vertex, radians (+ = compression; facet 0: θ0). */
  turn: number[];
  mach: number[];
  pRatio: number[];
  p0Ratio: number[];
  /** Prandtl-Meyer angle of each state, radians. */
  nu: number[];
  /** Shock angle from the upstream flow at the leading vertex (0 where no shock). */
  beta: number[];
  /** θmax at the Mach number ahead of each shock (0 where no shock). */
  thetaMax: number[];
  limit: SurfaceLimit | null;
}

/**
 * Shock-expansion march along one surface.
 *
 * `theta[k]` is facet k's deflection from the free stream (radians, + = into the flow, i.e.
 * compression: θ = φ − α on the upper surface, α − φ on the lower). The turn at facet k's
 * leading vertex is θ[k] − θ[k−1] (θ[−1] = 0, the free stream). A turn > 1e-12 rad is an
 * oblique shock (weak branch) from the local state, a turn < −1e-12 a Prandtl-Meyer fan, and
 * anything smaller no wave (the first facet's is a Mach line). Each facet carries one uniform
 * state. Across a fan the stagnation state is kept: p2/p1 = (X1/X2)^(γ/(γ−1)) with
 * X = 1 + (γ−1)M²/2.
 *
 * Limits (results, not exceptions), which stop the march at that vertex: `detached` when the
 * turn exceeds θmax at the local Mach number; `subsonic` when the flow behind a shock has
 * M < 1 (between the sonic deflection and θmax); `vacuum` when the expansion would take ν to
 * ν_max·(1 − 1e-9) or beyond. Cost: O(facets), one shock or one inverse Prandtl-Meyer per
 * vertex (a small fan costs one evaluation of ν).
 *
 * Sources: shock-expansion method (e.g. Anderson, "Modern Compressible Flow", chapter on
 * oblique shocks and expansion waves, from memory); NACA Report 1135 for the wave relations.
 */
export function marchSurface(theta: readonly number[], machInf: number, gamma: number): SurfaceMarch {
  const m = theta.length;
  const g1 = gamma - 1;
  const halfG1 = 0.5 * g1;
  const pExp = gamma / g1;
  const twiceExp = 2 * pExp;
  // γ = 1.4 (7/2) and γ = 5/3 (5/2) give half-integer exponents: powers by multiplication.
  const halfInteger = Math.abs(twiceExp - Math.round(twiceExp)) < 1e-12 && twiceExp < 64 ? Math.round(twiceExp) : 0;
  const nuMax = prandtlMeyerMax(gamma);
  const nuLimit = nuMax * (1 - VACUUM_MARGIN_RELATIVE);
  // Prandtl-Meyer constants, as machParameterAfterExpansion forms them: k² = (γ+1)/(γ−1).
  const k2 = (gamma + 1) / (gamma - 1);
  const kPm = Math.sqrt(k2);
  const kk = kPm * kPm;
  const kk1 = kk - 1;
  const tolPm = PRANDTL_MEYER_TOLERANCE_RAD;

  const wave: FacetWave[] = new Array(m);
  // Copies of θ, every entry overwritten below: a copy of a list of numbers is born a list of
  // numbers, where new Array(m) starts as a list of small integers and is converted (its
  // storage allocated a second time) at the first fraction stored in it.
  const turn: number[] = theta.slice();
  const mach: number[] = theta.slice();
  const pRatio: number[] = theta.slice();
  const p0Ratio: number[] = theta.slice();
  const nu: number[] = theta.slice();
  const beta: number[] = theta.slice();
  const thetaMax: number[] = theta.slice();
  let limit: SurfaceLimit | null = null;

  const zeroTurn = ZERO_TURN_RAD; // read once (an imported binding may be a getter call)
  let prevTheta = 0;
  for (let k = 0; k < m; k++) {
    const thetaK = present(theta[k], k, theta);
    const d = thetaK - prevTheta;
    prevTheta = thetaK;
    turn[k] = d;
    wave[k] = d > zeroTurn ? 'shock' : d < -zeroTurn ? 'fan' : k === 0 ? 'mach' : 'none';
  }

  // Number(…): the engine types a parameter as "anything", so a state variable started from it
  // would be kept as a tagged value and every fan's Mach number boxed in a new heap number
  // (a 16-byte allocation per facet); started from a number, it stays in a register.
  let mAhead = Number(machInf);
  let sAhead = Math.sqrt((machInf - 1) * (machInf + 1)); // Mach parameter √(M²−1)
  let xAhead = 1 + halfG1 * machInf * machInf; // X = T0/T
  let pAhead = 1;
  let p0Ahead = 1;
  let nuAhead = prandtlMeyer(machInf, gamma);
  // The fan step's Taylor coefficients 1/ν' and (ν''/ν')/2 (in s), taken at the last fan's
  // start, a hair from the state it found (NaN: work them out at the state itself).
  let slopeHint = Number.NaN;
  let curveHint = Number.NaN;
  let k = 0;
  for (; k < m; k++) {
    const d = present(turn[k], k, turn);
    const kind = wave[k];
    let b = 0;
    let tMax = 0;
    if (kind === 'shock') {
      const shock = obliqueShock(mAhead, d, gamma);
      if (shock.status === 'detached') {
        limit = { status: 'detached', facet: k, turn: d, machAhead: mAhead, thetaMax: shock.thetaMax };
        break;
      }
      if (shock.mach2 < 1) {
        limit = {
          status: 'subsonic',
          facet: k,
          turn: d,
          machAhead: mAhead,
          thetaMax: shock.thetaMax,
          thetaSonic: sonicDeflection(mAhead, gamma).thetaSonic,
          machBehind: shock.mach2,
        };
        break;
      }
      mAhead = shock.mach2;
      sAhead = Math.sqrt((mAhead - 1) * (mAhead + 1));
      xAhead = 1 + halfG1 * mAhead * mAhead;
      pAhead *= shock.pRatio;
      p0Ahead *= shock.p0Ratio;
      nuAhead = prandtlMeyer(mAhead, gamma);
      slopeHint = Number.NaN;
      b = shock.beta;
      tMax = shock.thetaMax;
    } else if (kind === 'fan') {
      const target = nuAhead - d;
      if (target >= nuLimit) {
        limit = { status: 'vacuum', facet: k, turn: d, machAhead: mAhead, nu: target, nuMax };
        break;
      }
      // The fan's new Mach parameter s = √(M²−1): ν(s) − ν(sAhead) = −d, solved as
      // machParameterAfterExpansion does (second-order Taylor start, the residual by the atan
      // subtraction formula, one Newton step whose quadratic error is checked), except that the
      // Taylor coefficients come from the previous fan's start. The march is a chain (each fan
      // starts from the state the last one found), and this takes two divisions off each link;
      // the start is as good (the coefficients move by the last Newton step, ~1e-8), and any
      // step that does not pass the same check goes through the full safeguarded solve.
      const dNu = -d;
      if (!(slopeHint === slopeHint) && sAhead > 0) {
        const q0 = (k2 + sAhead * sAhead) * (1 + sAhead * sAhead);
        slopeHint = q0 / ((k2 - 1) * sAhead * sAhead);
        curveHint = (k2 - sAhead * sAhead * sAhead * sAhead) / (sAhead * q0);
      }
      const h = dNu * slopeHint;
      const start = sAhead + h - curveHint * h * h;
      const ds = start - sAhead;
      const ss0 = start * sAhead;
      const f = kPm * atanNearZero((kPm * ds) / (kk + ss0)) - atanNearZero(ds / (1 + ss0)) - dNu;
      const s2 = start * start;
      const q = (kk + s2) * (1 + s2);
      const slope = q / (kk1 * s2);
      slopeHint = slope;
      curveHint = (k2 - s2 * s2) / (start * q);
      const step = f * slope;
      const next = start - step;
      const tol = tolPm * (target > 1 ? target : 1);
      let sNew: number;
      if (Math.abs(f) <= tol && start > sAhead) sNew = start;
      else if (
        next > sAhead &&
        Math.abs(step) < 0.1 * next &&
        (Math.abs(kk - s2 * s2) * kk1 * start * step * step) / (q * q) <= 0.25 * tol
      ) {
        sNew = next;
      } else {
        // Not yet within the tolerance: the safeguarded solve carries on from this iterate.
        sNew = machParameterAfterExpansion(sAhead, nuAhead, dNu, gamma, next);
        slopeHint = Number.NaN;
      }
      const m2New = 1 + sNew * sNew;
      const xNew = 1 + halfG1 * m2New;
      const r = xAhead / xNew;
      pAhead *= halfInteger ? halfIntegerPower(r, halfInteger) : Math.exp(pExp * Math.log(r));
      mAhead = Math.sqrt(m2New);
      sAhead = sNew;
      xAhead = xNew;
      nuAhead = target;
    }
    mach[k] = mAhead;
    pRatio[k] = pAhead;
    p0Ratio[k] = p0Ahead;
    nu[k] = nuAhead;
    beta[k] = b;
    thetaMax[k] = tMax;
  }
  for (let j = k; j < m; j++) {
    mach[j] = 0;
    pRatio[j] = 0;
    p0Ratio[j] = 0;
    nu[j] = 0;
    beta[j] = 0;
    thetaMax[j] = 0;
  }
  return { solved: k, wave, turn, mach, pRatio, p0Ratio, nu, beta, thetaMax, limit };
}

/** r^(n/2) for a small positive integer n, by multiplications and one square root. */
function halfIntegerPower(r: number, n: number): number {
  if (n === 7) return r * r * r * Math.sqrt(r); // γ = 1.4
  let out = n % 2 === 1 ? Math.sqrt(r) : 1;
  let base = r;
  let e = n >> 1;
  while (e > 0) {
    if (e & 1) out *= base;
    base *= base;
    e >>= 1;
  }
  return out;
}
