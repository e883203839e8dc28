import { itemAt, present } from '../util/invariant.ts';
import type { SurfaceChain } from './splitSurfaces';

/**
 * Thickness ratio t/c: the largest distance between the upper and the lower surface measured
 * normal to the chord line (the line from the nose to the tail, the chains' first and last
 * vertices), over that line's length. A section drawn at an angle (e.g. a 4 % double wedge
 * rotated nose-down 5.7°) has the thickness it was drawn with, not its vertical extent.
 *
 * Both chains are taken into chord-line axes (s along, n normal); the distance is piecewise
 * linear in s between vertices, so its maximum sits at a vertex: O(facets) when both chains run
 * monotonically in s (the usual section), otherwise the polygon's extent normal to the chord line
 * at each vertex's s, O(facets²). Edge case: nose and tail coincident gives 0.
 *
 * Source: common practice (thickness ratio t/c, measured normal to the chord line).
 */
export function maxThicknessRatio(upper: Pick<SurfaceChain, 'xs' | 'ys'>, lower: Pick<SurfaceChain, 'xs' | 'ys'>): number {
  // A chain runs nose → tail with at least one facet, so both ends exist.
  const uxs = upper.xs;
  const uys = upper.ys;
  const last = uxs.length - 1;
  const x0 = present(uxs[0], 0, uxs);
  const y0 = present(uys[0], 0, uys);
  const ex = present(uxs[last], last, uxs) - x0;
  const ey = present(uys[last], last, uys) - y0;
  const chord = Math.hypot(ex, ey);
  if (!(chord > 0)) return 0;
  const cx = ex / chord;
  const cy = ey / chord;
  // The usual section: both chains run monotonically along the chord line. Each sweep checks
  // its own chain as it walks it (NaN when it does not run monotonically); the chord-line
  // coordinates are computed where they are read (no copies, no closures: this runs in every
  // core solve).
  const tUpper = sweep(upper, lower, 1, x0, y0, cx, cy);
  const tLower = tUpper === tUpper ? sweep(lower, upper, -1, x0, y0, cx, cy) : NaN;
  if (tUpper === tUpper && tLower === tLower) return Math.max(0, Math.max(tUpper, tLower)) / chord;
  return extentAtVertices(toChordAxes(upper, x0, y0, cx, cy), toChordAxes(lower, x0, y0, cx, cy)) / chord;
}

/** A chain in chord-line axes: s = (p − p0)·(cx, cy) along, n = (p − p0)·(−cy, cx) normal. */
function toChordAxes(c: Pick<SurfaceChain, 'xs' | 'ys'>, x0: number, y0: number, cx: number, cy: number): Pick<SurfaceChain, 'xs' | 'ys'> {
  const n = c.xs.length;
  const xs: number[] = new Array(n);
  const ys: number[] = new Array(n);
  for (let i = 0; i < n; i++) {
    const x = present(c.xs[i], i, c.xs) - x0;
    const y = present(c.ys[i], i, c.ys) - y0;
    xs[i] = x * cx + y * cy;
    ys[i] = -x * cy + y * cx;
  }
  return { xs, ys };
}

/**
 * max over a's vertices of sign·(n_a − n_b(s)), walking b alongside, both in chord-line axes
 * (computed here from body axes with the same arithmetic as `toChordAxes`); NaN when a's s
 * decreases somewhere (the maximum is never NaN: it starts at −∞ and takes only larger values).
 */
function sweep(
  a: Pick<SurfaceChain, 'xs' | 'ys'>,
  b: Pick<SurfaceChain, 'xs' | 'ys'>,
  sign: 1 | -1,
  ox: number,
  oy: number,
  cx: number,
  cy: number,
): number {
  let best = -Infinity;
  let j = 0;
  const axs = a.xs;
  const ays = a.ys;
  const bxs = b.xs;
  const bys = b.ys;
  const nb = bxs.length;
  // b's segment j → j + 1 in chord-line axes; j stays below nb − 1, so it exists (a chain has
  // at least two vertices).
  const bx0 = present(bxs[0], 0, bxs) - ox;
  const by0 = present(bys[0], 0, bys) - oy;
  let s0 = bx0 * cx + by0 * cy;
  let n0 = -bx0 * cy + by0 * cx;
  let bx1 = present(bxs[1], 1, bxs) - ox;
  let by1 = present(bys[1], 1, bys) - oy;
  let s1 = bx1 * cx + by1 * cy;
  let n1 = -bx1 * cy + by1 * cx;
  let before = -Infinity;
  for (let i = 0; i < axs.length; i++) {
    const ax = present(axs[i], i, axs) - ox;
    const ay = present(ays[i], i, ays) - oy;
    const x = ax * cx + ay * cy;
    if (x < before) return NaN;
    before = x;
    while (j < nb - 2 && s1 < x) {
      j++;
      s0 = s1;
      n0 = n1;
      bx1 = present(bxs[j + 1], j + 1, bxs) - ox;
      by1 = present(bys[j + 1], j + 1, bys) - oy;
      s1 = bx1 * cx + by1 * cy;
      n1 = -bx1 * cy + by1 * cx;
    }
    let yb: number;
    if (s1 > s0) {
      const f = Math.min(1, Math.max(0, (x - s0) / (s1 - s0)));
      yb = n0 + f * (n1 - n0);
    } else {
      // A vertical step in b: take the side that keeps the thickness smallest.
      yb = sign > 0 ? Math.max(n0, n1) : Math.min(n0, n1);
    }
    const t = sign * (-ax * cy + ay * cx - yb);
    if (t > best) best = t;
  }
  return best;
}

function extentAtVertices(upper: Pick<SurfaceChain, 'xs' | 'ys'>, lower: Pick<SurfaceChain, 'xs' | 'ys'>): number {
  const edges: [number, number, number, number][] = [];
  for (const c of [upper, lower]) {
    for (let k = 0; k + 1 < c.xs.length; k++) edges.push([itemAt(c.xs, k), itemAt(c.ys, k), itemAt(c.xs, k + 1), itemAt(c.ys, k + 1)]);
  }
  let best = 0;
  for (const c of [upper, lower]) {
    for (const x of c.xs) {
      let lo = Infinity;
      let hi = -Infinity;
      for (const [x0, y0, x1, y1] of edges) {
        if (x < Math.min(x0, x1) || x > Math.max(x0, x1)) continue;
        const ys = x1 === x0 ? [y0, y1] : [y0 + ((x - x0) / (x1 - x0)) * (y1 - y0)];
        for (const y of ys) {
          if (y < lo) lo = y;
          if (y > hi) hi = y;
        }
      }
      if (hi - lo > best) best = hi - lo;
    }
  }
  return best;
}
