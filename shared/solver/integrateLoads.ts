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
  const u = surfaceForce(upper, cpUpper, 1, momentPoint);
  const l = surfaceForce(lower, cpLower, -1, momentPoint);
  const ca = Math.cos(alpha);
  const sa = Math.sin(alpha);
  const c2 = chord * chord;
  const fx = u.fx + l.fx;
  const fy = u.fy + l.fy;
  const mz = u.mz + l.mz;
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
      cl: (u.fy * ca - u.fx * sa) / chord,
      cd: (u.fx * ca + u.fy * sa) / chord,
      cm: 0 - u.mz / c2,
    },
    lower: {
      cl: (l.fy * ca - l.fx * sa) / chord,
      cd: (l.fx * ca + l.fy * sa) / chord,
      cm: 0 - l.mz / c2,
    },
  };
}

function surfaceForce(
  s: LoadSurface,
  cp: readonly number[],
  side: 1 | -1,
  ref: readonly [number, number],
): { fx: number; fy: number; mz: number } {
  let fx = 0;
  let fy = 0;
  let mz = 0;
  const xs = s.xs;
  const ys = s.ys;
  const rx = ref[0];
  const ry = ref[1];
  // The hot loop reads its lists itself, checked by `present` (see shared/util/invariant.ts).
  let x0 = present(xs[0], 0, xs);
  let y0 = present(ys[0], 0, ys);
  for (let k = 0; k < cp.length; k++) {
    const x1 = present(xs[k + 1], k + 1, xs);
    const y1 = present(ys[k + 1], k + 1, ys);
    const c = present(cp[k], k, cp);
    const dx = x1 - x0;
    const dy = y1 - y0;
    // F = −Cp·n·len with n·len = side·(−dy, dx)
    const px = side * c * dy;
    const py = -side * c * dx;
    const mx = 0.5 * (x0 + x1) - rx;
    const my = 0.5 * (y0 + y1) - ry;
    x0 = x1;
    y0 = y1;
    fx += px;
    fy += py;
    mz += mx * py - my * px;
  }
  return { fx, fy, mz };
}
