import { firstItem, itemAt, lastItem, present } from '../util/invariant.ts';
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
  const x0 = firstItem(upper.xs);
  const y0 = firstItem(upper.ys);
  const ex = lastItem(upper.xs) - x0;
  const ey = lastItem(upper.ys) - y0;
  const chord = Math.hypot(ex, ey);
  if (!(chord > 0)) return 0;
  const cx = ex / chord;
  const cy = ey / chord;
  const toChordAxes = (c: Pick<SurfaceChain, 'xs' | 'ys'>) => {
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
  };
  const u = toChordAxes(upper);
  const l = toChordAxes(lower);
  if (monotone(u.xs) && monotone(l.xs)) {
    const t = Math.max(sweep(u, l, 1), sweep(l, u, -1));
    return Math.max(0, t) / chord;
  }
  return extentAtVertices(u, l) / chord;
}

function monotone(xs: readonly number[]): boolean {
  for (let i = 1; i < xs.length; i++) if (present(xs[i], i, xs) < present(xs[i - 1], i - 1, xs)) return false;
  return true;
}

/** max over a's vertices of sign·(y_a − y_b(x)), walking b alongside. */
function sweep(a: Pick<SurfaceChain, 'xs' | 'ys'>, b: Pick<SurfaceChain, 'xs' | 'ys'>, sign: 1 | -1): number {
  let best = -Infinity;
  let j = 0;
  const nb = b.xs.length;
  // j stays below nb − 1, so b's segment j → j + 1 exists (a chain has at least two vertices).
  for (let i = 0; i < a.xs.length; i++) {
    const x = present(a.xs[i], i, a.xs);
    while (j < nb - 2 && present(b.xs[j + 1], j + 1, b.xs) < x) j++;
    const x0 = present(b.xs[j], j, b.xs);
    const x1 = present(b.xs[j + 1], j + 1, b.xs);
    const y0 = present(b.ys[j], j, b.ys);
    const y1 = present(b.ys[j + 1], j + 1, b.ys);
    let yb: number;
    if (x1 > x0) {
      const f = Math.min(1, Math.max(0, (x - x0) / (x1 - x0)));
      yb = y0 + f * (y1 - y0);
    } else {
      // A vertical step in b: take the side that keeps the thickness smallest.
      yb = sign > 0 ? Math.max(y0, y1) : Math.min(y0, y1);
    }
    const t = sign * (present(a.ys[i], i, a.ys) - yb);
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
