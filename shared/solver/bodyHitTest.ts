import { firstItem, lastItem, present } from '../util/invariant.ts';
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
  // The vertices in order of x, then y (Andrew's order), as records: the sort and the hull
  // read their coordinates without indexing into the outline.
  const sorted = points.map(([x, y]) => ({ x, y })).sort((a, b) => a.x - b.x || a.y - b.y);
  const cross = (o: Vertex, a: Vertex, b: Vertex) => (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
  // One chain of the hull: a vertex stays while the chain turns counter-clockwise (side +1,
  // the lower chain) or clockwise (−1, the upper chain) at the last vertex kept.
  const hullChain = (side: 1 | -1): Vertex[] => {
    const out: Vertex[] = [];
    for (const v of sorted) {
      for (let h = out.length; h >= 2 && side * cross(present(out[h - 2], h - 2, out), present(out[h - 1], h - 1, out), v) <= 0; h--) out.pop();
      out.push(v);
    }
    return out;
  };
  const chain = (vs: Vertex[]) => ({ xs: vs.map((v) => v.x), ys: vs.map((v) => v.y) });
  const up = chain(hullChain(-1));
  const lo = chain(hullChain(1));
  const minX = firstItem(sorted).x;
  const maxX = lastItem(sorted).x;

  /** Index of the hull segment whose x-span holds x (the one to its right at a vertex). */
  const segmentAt = (xs: number[], x: number): number => {
    let lo2 = 0;
    let hi = xs.length - 1;
    while (hi - lo2 > 1) {
      const mid = (lo2 + hi) >> 1;
      if (present(xs[mid], mid, xs) <= x) lo2 = mid;
      else hi = mid;
    }
    return lo2;
  };
  const clearOf = (c: { xs: number[]; ys: number[] }, sign: 1 | -1, ox: number, oy: number, dx: number, dy: number): boolean => {
    const k = segmentAt(c.xs, ox);
    const x0 = present(c.xs[k], k, c.xs);
    const x1 = present(c.xs[k + 1], k + 1, c.xs);
    const y0 = present(c.ys[k], k, c.ys);
    const y1 = present(c.ys[k + 1], k + 1, c.ys);
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
    // Side i runs from vertex i to vertex j = i + 1, the closing side from the last vertex to 0.
    let i = points.length - 1;
    let pi = lastItem(points);
    let j = 0;
    for (const pj of points) {
      if (i !== skipVertex && j !== skipVertex) {
        const t = sideHit(pi, pj, ox, oy, dx, dy);
        if (t > eps && t < best) best = t;
      }
      i = j++;
      pi = pj;
    }
    return best;
  };
}

interface Vertex {
  x: number;
  y: number;
}

/**
 * Distance along the line from (ox, oy) in the direction (dx, dy) to where it crosses the side
 * a–b (ends included), or −Infinity when it does not. The side is taken from its
 * lexicographically smaller end, so that the input's vertex order cannot change the rounding.
 */
function sideHit(a: XY, b: XY, ox: number, oy: number, dx: number, dy: number): number {
  const first = a[0] < b[0] || (a[0] === b[0] && a[1] < b[1]);
  const p = first ? a : b;
  const q = first ? b : a;
  const ex = q[0] - p[0];
  const ey = q[1] - p[1];
  const den = dx * ey - dy * ex;
  if (den === 0) return -Infinity;
  const wx = p[0] - ox;
  const wy = p[1] - oy;
  const t = (wx * ey - wy * ex) / den;
  const u = (wx * dy - wy * dx) / den;
  return u >= 0 && u <= 1 ? t : -Infinity;
}
