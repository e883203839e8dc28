import { COEFFICIENT_ZERO } from './constants';
import type { Coefficients, SurfaceCoefficients } from './types';
import { present } from '../util/invariant.ts';

/** A surface for load integration: its vertices nose → tail. */
export interface LoadSurface {
  xs: readonly number[];
  ys: readonly number[];
}

/** Total and per-surface coefficients. */
export interface Loads {
  total: Coefficients;
  upper: SurfaceCoefficients;
  lower: SurfaceCoefficients;
}

/**
 * Integrates facet pressure coefficients into section coefficients.
 *
 * Each facet k (from vertex k to k+1 of its surface) carries a uniform `cp[k]`; its force over
 * q∞ is −Cp·n_out·length, applied at the facet midpoint, where n_out·length is (−dy, dx) on the
 * upper surface and (dy, −dx) on the lower (outward for a section whose upper chain runs over
 * the top). Wind axes: drag along the free stream (cos α, sin α), lift along (−sin α, cos α);
 * cl, cd, cn (body +y), ca (body +x) over c; cm over c² about `momentPoint`, positive nose up,
 * i.e. cm = −(r × F)_z / c² with x right and y up. xcpOverC is where the resultant crosses the
 * line y = y_nose, measured from the nose over c (null when |cn| < 1e-9); liftToDrag is null
 * when |cd| < 1e-12. Exactly the same integration serves the exact and the thin-airfoil
 * theories (exact normals and projections, no small-angle forms).
 *
 * Cost O(facets), no allocation besides the result.
 *
 * Source: common practice (pressure integration over a polygon).
 */
export function integrateLoads(
  upper: LoadSurface,
  cpUpper: readonly number[],
  lower: LoadSurface,
  cpLower: readonly number[],
  alpha: number,
  momentPoint: readonly [number, number],
  nose: readonly [number, number],
  chord: number,
): Loads {
  const u = surfaceForces(upper, cpUpper, cpUpper, cpUpper, 1, momentPoint);
  const l = surfaceForces(lower, cpLower, cpLower, cpLower, -1, momentPoint);
  return loads(u.fx0, u.fy0, u.mz0, l.fx0, l.fy0, l.mz0, alpha, momentPoint, nose, chord);
}

/**
 * `integrateLoads` of three Cp sets on the same facets (the core solve's exact, linear and
 * second-order pressures) in one pass over the geometry: each facet's vector, midpoint and
 * moment arm are computed once for the three. The numbers are those of three `integrateLoads`
 * calls, bit for bit (the same operations in the same order for each set).
 *
 * Source: as `integrateLoads`.
 */
export function integrateLoadsOfThree(
  upper: LoadSurface,
  cpUpper: readonly [readonly number[], readonly number[], readonly number[]],
  lower: LoadSurface,
  cpLower: readonly [readonly number[], readonly number[], readonly number[]],
  alpha: number,
  momentPoint: readonly [number, number],
  nose: readonly [number, number],
  chord: number,
): [Loads, Loads, Loads] {
  const u = surfaceForces(upper, cpUpper[0], cpUpper[1], cpUpper[2], 1, momentPoint);
  const l = surfaceForces(lower, cpLower[0], cpLower[1], cpLower[2], -1, momentPoint);
  return [
    loads(u.fx0, u.fy0, u.mz0, l.fx0, l.fy0, l.mz0, alpha, momentPoint, nose, chord),
    loads(u.fx1, u.fy1, u.mz1, l.fx1, l.fy1, l.mz1, alpha, momentPoint, nose, chord),
    loads(u.fx2, u.fy2, u.mz2, l.fx2, l.fy2, l.mz2, alpha, momentPoint, nose, chord),
  ];
}

/** Coefficients from the two surfaces' force sums (over q∞) and moment sums about `momentPoint`. */
function loads(
  ufx: number,
  ufy: number,
  umz: number,
  lfx: number,
  lfy: number,
  lmz: number,
  alpha: number,
  momentPoint: readonly [number, number],
  nose: readonly [number, number],
  chord: number,
): Loads {
  const ca = Math.cos(alpha);
  const sa = Math.sin(alpha);
  const c2 = chord * chord;
  const fx = ufx + lfx;
  const fy = ufy + lfy;
  const mz = umz + lmz;
  const cd = (fx * ca + fy * sa) / chord;
  const cl = (fy * ca - fx * sa) / chord;
  const cm = 0 - mz / c2; // 0 − x rather than −x: no −0 in the output
  const cn = fy / chord;
  // Moment about the nose: Σ (r − nose) × F = Σ (r − P) × F + (P − nose) × ΣF.
  const mzNose = mz + (momentPoint[0] - nose[0]) * fy - (momentPoint[1] - nose[1]) * fx;
  return {
    total: {
      cl,
      cd,
      cm,
      cn,
      ca: fx / chord,
      xcpOverC: Math.abs(cn) < COEFFICIENT_ZERO ? null : mzNose / (fy * chord),
      liftToDrag: Math.abs(cd) < 1e-12 ? null : cl / cd,
    },
    upper: {
      cl: (ufy * ca - ufx * sa) / chord,
      cd: (ufx * ca + ufy * sa) / chord,
      cm: 0 - umz / c2,
    },
    lower: {
      cl: (lfy * ca - lfx * sa) / chord,
      cd: (lfx * ca + lfy * sa) / chord,
      cm: 0 - lmz / c2,
    },
  };
}

/** Force (over q∞) and moment about `ref` of one surface, for three Cp sets at once. */
function surfaceForces(
  s: LoadSurface,
  cpA: readonly number[],
  cpB: readonly number[],
  cpC: readonly number[],
  side: 1 | -1,
  ref: readonly [number, number],
): { fx0: number; fy0: number; mz0: number; fx1: number; fy1: number; mz1: number; fx2: number; fy2: number; mz2: number } {
  let fx0 = 0;
  let fy0 = 0;
  let mz0 = 0;
  let fx1 = 0;
  let fy1 = 0;
  let mz1 = 0;
  let fx2 = 0;
  let fy2 = 0;
  let mz2 = 0;
  const xs = s.xs;
  const ys = s.ys;
  const rx = ref[0];
  const ry = ref[1];
  // The hot loop reads its lists itself, checked by `present` (see shared/util/invariant.ts).
  let x0 = present(xs[0], 0, xs);
  let y0 = present(ys[0], 0, ys);
  for (let k = 0; k < cpA.length; k++) {
    const x1 = present(xs[k + 1], k + 1, xs);
    const y1 = present(ys[k + 1], k + 1, ys);
    const a = present(cpA[k], k, cpA);
    const b = present(cpB[k], k, cpB);
    const c = present(cpC[k], k, cpC);
    const dx = x1 - x0;
    const dy = y1 - y0;
    const mx = 0.5 * (x0 + x1) - rx;
    const my = 0.5 * (y0 + y1) - ry;
    x0 = x1;
    y0 = y1;
    // F = −Cp·n·len with n·len = side·(−dy, dx)
    const pxA = side * a * dy;
    const pyA = -side * a * dx;
    fx0 += pxA;
    fy0 += pyA;
    mz0 += mx * pyA - my * pxA;
    const pxB = side * b * dy;
    const pyB = -side * b * dx;
    fx1 += pxB;
    fy1 += pyB;
    mz1 += mx * pyB - my * pxB;
    const pxC = side * c * dy;
    const pyC = -side * c * dx;
    fx2 += pxC;
    fy2 += pyC;
    mz2 += mx * pyC - my * pxC;
  }
  return { fx0, fy0, mz0, fx1, fy1, mz1, fx2, fy2, mz2 };
}
