import type { XY } from '../model/polygon';

/**
 * Distance along a straight line from (ox, oy) in the unit direction (dx, dy) to the first
 * side of the section it meets beyond `eps`, skipping the two sides at `skipVertex` (the
 * line's own origin vertex; −1 for a line that starts off the body). Infinity when it meets
 * none.
 */
export type BodyHit = (ox: number, oy: number, dx: number, dy: number, skipVertex: number) => number;

/**
 * Builds the body test of the wave map for one section.
 *
 * Most lines leave the section outward and never meet it again, so a line is first tested
 * against the section's convex hull, split into its upper and lower chains (functions of x):
 * the upper chain is concave, its slope only falls with x, so a line that starts on or above
 * it, heading aft with a slope at least the chain's slope there, stays above it for good
 * (mirrored for the lower chain). That costs a binary search. Only the other lines (from a
 * vertex in a concave pocket, or turned back toward the body) are tested against every side,
 * each side taken from its lexicographically smaller end so that the input's vertex order
 * cannot change the rounding.
 *
 * Cost: O(n log n) to build, O(log n) per outward line, O(n) per other line. Edge case: a
 * line starting behind the section (x ≥ the tail's x) heading aft meets nothing.
 *
 * Sources: convex hull by the monotone-chain method (A. M. Andrew, "Another efficient
 * algorithm for convex hulls in two dimensions", Information Processing Letters 9(5), 1979);
 * line-segment intersection by cross products (common practice).
 */
export function bodyHitTest(points: readonly XY[], eps: number): BodyHit {
  const n = points.length;
  const order = Array.from({ length: n }, (_, i) => i);
  const px = (i: number) => (points[i] as XY)[0];
  const py = (i: number) => (points[i] as XY)[1];
  order.sort((a, b) => px(a) - px(b) || py(a) - py(b));
  const cross = (o: number, a: number, b: number) => (px(a) - px(o)) * (py(b) - py(o)) - (py(a) - py(o)) * (px(b) - px(o));
  const lowerHull: number[] = [];
  for (const i of order) {
    while (lowerHull.length >= 2 && cross(lowerHull[lowerHull.length - 2] as number, lowerHull[lowerHull.length - 1] as number, i) <= 0) lowerHull.pop();
    lowerHull.push(i);
  }
  const upperHull: number[] = [];
  for (const i of order) {
    while (upperHull.length >= 2 && cross(upperHull[upperHull.length - 2] as number, upperHull[upperHull.length - 1] as number, i) >= 0) upperHull.pop();
    upperHull.push(i);
  }
  const chain = (idx: number[]) => ({ xs: idx.map(px), ys: idx.map(py) });
  const up = chain(upperHull);
  const lo = chain(lowerHull);
  const minX = px(order[0] as number);
  const maxX = px(order[n - 1] as number);

  /** Index of the hull segment whose x-span holds x (the one to its right at a vertex). */
  const segmentAt = (xs: number[], x: number): number => {
    let lo2 = 0;
    let hi = xs.length - 1;
    while (hi - lo2 > 1) {
      const mid = (lo2 + hi) >> 1;
      if ((xs[mid] as number) <= x) lo2 = mid;
      else hi = mid;
    }
    return lo2;
  };
  const clearOf = (c: { xs: number[]; ys: number[] }, sign: 1 | -1, ox: number, oy: number, dx: number, dy: number): boolean => {
    const k = segmentAt(c.xs, ox);
    const x0 = c.xs[k] as number;
    const x1 = c.xs[k + 1] as number;
    const y0 = c.ys[k] as number;
    const y1 = c.ys[k + 1] as number;
    if (!(x1 > x0)) return false;
    const slope = (y1 - y0) / (x1 - x0);
    const yHull = y0 + slope * (ox - x0);
    // Above the upper chain (sign +1) or below the lower one (−1), and turning away from it.
    return sign * (oy - yHull) >= -eps && sign * (dy - slope * dx) >= 0;
  };

  return (ox, oy, dx, dy, skipVertex) => {
    if (dx > 0) {
      if (ox >= maxX) return Infinity;
      if (ox >= minX && (clearOf(up, 1, ox, oy, dx, dy) || clearOf(lo, -1, ox, oy, dx, dy))) return Infinity;
    }
    let best = Infinity;
    for (let i = 0; i < n; i++) {
      const j = i + 1 === n ? 0 : i + 1;
      if (i === skipVertex || j === skipVertex) continue;
      const pi = points[i] as XY;
      const pj = points[j] as XY;
      const first = pi[0] < pj[0] || (pi[0] === pj[0] && pi[1] < pj[1]);
      const p = first ? pi : pj;
      const q = first ? pj : pi;
      const ex = q[0] - p[0];
      const ey = q[1] - p[1];
      const den = dx * ey - dy * ex;
      if (den === 0) continue;
      const wx = p[0] - ox;
      const wy = p[1] - oy;
      const t = (wx * ey - wy * ex) / den;
      const u = (wx * dy - wy * dx) / den;
      if (t > eps && u >= 0 && u <= 1 && t < best) best = t;
    }
    return best;
  };
}
