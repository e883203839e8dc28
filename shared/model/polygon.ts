/**
 * Pure polygon geometry shared by the input validation, the solver and the canvas.
 * Points are [x, y]; a polygon is its vertex list, closed implicitly (last → first).
 */

import { itemAt } from '../util/invariant.ts';

/** A point as the model stores it. */
export type XY = readonly [number, number];

/**
 * Signed area by the shoelace formula: positive when the vertices run counter-clockwise
 * (x right, y up), negative clockwise, 0 for fewer than 3 points or a degenerate polygon.
 * Coordinates are taken relative to the first vertex so that a far-off section loses no digits.
 * Units: the square of the coordinates' unit.
 *
 * Source: shoelace (surveyor's) formula, common practice.
 */
export function signedArea(points: readonly XY[]): number {
  const n = points.length;
  if (n < 3) return 0;
  const [x0, y0] = itemAt(points, 0);
  let twice = 0;
  for (let i = 1; i < n - 1; i++) {
    const [px, py] = itemAt(points, i);
    const [qx, qy] = itemAt(points, i + 1);
    const ax = px - x0;
    const ay = py - y0;
    const bx = qx - x0;
    const by = qy - y0;
    twice += ax * by - bx * ay;
  }
  return twice / 2;
}

/** Two polygon edges that cross or touch although they should not (edge i runs i → i+1). */
export interface EdgeCrossing {
  edgeA: number;
  edgeB: number;
}

/**
 * First pair of edges that intersect improperly (smallest edgeA, then edgeB), or null for a
 * simple polygon. Non-adjacent edges may not touch at all; adjacent edges may share only their
 * common vertex (so a spike that folds back along itself counts). Repeated vertices are a
 * separate check (`findRepeatedPoint`).
 *
 * Only edges whose bounding boxes overlap can touch: the edges are swept in order of their
 * least x, and each is tested against those whose x-extent begins before its own ends (and
 * whose y-extents overlap), so a section of n edges costs O(n log n + k) for k such pairs
 * instead of O(n²) — a drag's live solve checks the whole outline on every move. The answer is
 * the full pairwise scan's (`findSelfIntersectionNear` with every edge changed is that scan).
 *
 * Source: segment intersection by orientation tests (common practice, e.g. Cormen et al.,
 * "Introduction to Algorithms", section on segment intersection); the sweep over x-extents is
 * the usual broad phase (common practice).
 */
export function findSelfIntersection(points: readonly XY[]): EdgeCrossing | null {
  const n = points.length;
  if (n < 3) return null;
  const minX = new Float64Array(n);
  const maxX = new Float64Array(n);
  const minY = new Float64Array(n);
  const maxY = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const [ax, ay] = itemAt(points, i);
    const [bx, by] = itemAt(points, (i + 1) % n);
    minX[i] = Math.min(ax, bx);
    maxX[i] = Math.max(ax, bx);
    minY[i] = Math.min(ay, by);
    maxY[i] = Math.max(ay, by);
  }
  const byMinX = Array.from({ length: n }, (_, i) => i).sort((i, j) => (minX[i] as number) - (minX[j] as number));
  let best: EdgeCrossing | null = null;
  for (let s = 0; s < n; s++) {
    const i = itemAt(byMinX, s);
    for (let t = s + 1; t < n; t++) {
      const j = itemAt(byMinX, t);
      if ((minX[j] as number) > (maxX[i] as number)) break;
      if ((minY[j] as number) > (maxY[i] as number) || (minY[i] as number) > (maxY[j] as number)) continue;
      const a = Math.min(i, j);
      const b = Math.max(i, j);
      if (best && (a > best.edgeA || (a === best.edgeA && b >= best.edgeB))) continue;
      if (edgesCross(points, a, b)) best = { edgeA: a, edgeB: b };
    }
  }
  return best;
}

/**
 * The same answer as `findSelfIntersection(points)`, in O(k·n), for a polygon
 * that was simple before only the edges in `changedEdges` changed (moved, inserted or deleted
 * vertices change the edges that touch them). Every crossing then involves a changed edge, so
 * testing those against all edges and keeping the pair the full scan meets first (smallest
 * edgeA, then edgeB) reproduces the full result and its message exactly. With every edge in
 * `changedEdges` it is the full pairwise scan, O(n²).
 */
export function findSelfIntersectionNear(points: readonly XY[], changedEdges: Iterable<number>): EdgeCrossing | null {
  const n = points.length;
  if (n < 3) return null;
  let best: EdgeCrossing | null = null;
  for (const raw of new Set(changedEdges)) {
    const e = ((raw % n) + n) % n;
    for (let j = 0; j < n; j++) {
      if (j === e) continue;
      const a = Math.min(e, j);
      const b = Math.max(e, j);
      if (best && (a > best.edgeA || (a === best.edgeA && b >= best.edgeB))) continue;
      if (edgesCross(points, a, b)) best = { edgeA: a, edgeB: b };
    }
  }
  return best;
}

/** Edges i < j of the closed polygon intersect improperly (see findSelfIntersection). */
function edgesCross(points: readonly XY[], i: number, j: number): boolean {
  const n = points.length;
  const a = itemAt(points, i);
  const b = itemAt(points, (i + 1) % n);
  const c = itemAt(points, j);
  const d = itemAt(points, (j + 1) % n);
  const adjacentAfter = j === i + 1; // b === c
  const adjacentBefore = i === 0 && j === n - 1; // d === a
  if (adjacentAfter || adjacentBefore) {
    // Shared vertex v, other ends p (of one edge) and q (of the other): they overlap only
    // when collinear and pointing the same way from v.
    const v = adjacentAfter ? b : a;
    const p = adjacentAfter ? a : b;
    const q = adjacentAfter ? d : c;
    const ux = p[0] - v[0];
    const uy = p[1] - v[1];
    const wx = q[0] - v[0];
    const wy = q[1] - v[1];
    return ux * wy - uy * wx === 0 && ux * wx + uy * wy > 0;
  }
  return segmentsTouch(a, b, c, d);
}

/** Vertices closer than this fraction of the section's size count as one repeated point. */
export const REPEATED_POINT_TOLERANCE = 1e-9;

/**
 * The first vertex that repeats an earlier one, as [earlier, later], or null. Two vertices
 * repeat when they are closer than 1e-9 × the larger side of the bounding box (exact
 * duplicates always do): a side shorter than that has no meaningful direction. O(n log n).
 */
export function findRepeatedPoint(
  points: readonly XY[],
  relTol: number = REPEATED_POINT_TOLERANCE,
): [number, number] | null {
  const n = points.length;
  if (n < 2) return null;
  const tol = repeatTolerance(points, relTol);
  // Vertex indices sorted by x, each with its point, so the scan below reads no index twice.
  const order = points.map((point, index) => ({ point, index })).sort((a, b) => a.point[0] - b.point[0] || a.index - b.index);
  let best: [number, number] | null = null;
  for (let s = 0; s < n; s++) {
    const { point: [xi, yi], index: i } = itemAt(order, s);
    for (let t = s + 1; t < n; t++) {
      const { point: [xj, yj], index: j } = itemAt(order, t);
      if (xj - xi > tol) break;
      const dx = xj - xi;
      const dy = yj - yi;
      if (Math.sqrt(dx * dx + dy * dy) <= tol) {
        const pair: [number, number] = i < j ? [i, j] : [j, i];
        if (!best || pair[1] < best[1] || (pair[1] === best[1] && pair[0] < best[0])) best = pair;
      }
    }
  }
  return best;
}

/** The distance under which two vertices of `points` count as one (see findRepeatedPoint). */
export function repeatTolerance(points: readonly XY[], relTol: number = REPEATED_POINT_TOLERANCE): number {
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (const [x, y] of points) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  return relTol * Math.max(maxX - minX, maxY - minY);
}

/**
 * findRepeatedPoint for a polygon that had no repeated vertex before only the `changed`
 * vertices moved or were inserted, when the tolerance did not grow: only pairs with a changed
 * vertex can repeat then, so O(k·n) instead of a sort. Same answer (the first pair).
 */
export function findRepeatedPointNear(points: readonly XY[], changed: Iterable<number>, relTol: number = REPEATED_POINT_TOLERANCE): [number, number] | null {
  const n = points.length;
  if (n < 2) return null;
  const tol = repeatTolerance(points, relTol);
  let best: [number, number] | null = null;
  for (const raw of new Set(changed)) {
    const i = ((raw % n) + n) % n;
    const [xi, yi] = itemAt(points, i);
    for (const [j, [xj, yj]] of points.entries()) {
      if (j === i) continue;
      const dx = xj - xi;
      if (dx > tol || -dx > tol) continue;
      const dy = yj - yi;
      if (Math.sqrt(dx * dx + dy * dy) <= tol) {
        const pair: [number, number] = i < j ? [i, j] : [j, i];
        if (!best || pair[1] < best[1] || (pair[1] === best[1] && pair[0] < best[0])) best = pair;
      }
    }
  }
  return best;
}

/** True when every point lies on one straight line (so the polygon encloses no area). */
export function allCollinear(points: readonly XY[]): boolean {
  const n = points.length;
  if (n < 3) return true;
  const [x0, y0] = itemAt(points, 0);
  // The point farthest from the first fixes the line (robust against a near-duplicate second point).
  let far: XY = [x0, y0];
  let best = -1;
  for (const point of points) {
    const d = (point[0] - x0) ** 2 + (point[1] - y0) ** 2;
    if (d > best) {
      best = d;
      far = point;
    }
  }
  const dx = far[0] - x0;
  const dy = far[1] - y0;
  for (const [x, y] of points) {
    if (dx * (y - y0) - dy * (x - x0) !== 0) return false;
  }
  return true;
}

/** True when the closed polygon has no repeated vertex, no self-intersection and area ≠ 0. */
export function isSimplePolygon(points: readonly XY[]): boolean {
  return (
    points.length >= 3 &&
    findRepeatedPoint(points) === null &&
    findSelfIntersection(points) === null &&
    signedArea(points) !== 0
  );
}

function orient(a: XY, b: XY, c: XY): number {
  const v = (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

function onSegment(a: XY, b: XY, p: XY): boolean {
  return (
    Math.min(a[0], b[0]) <= p[0] &&
    p[0] <= Math.max(a[0], b[0]) &&
    Math.min(a[1], b[1]) <= p[1] &&
    p[1] <= Math.max(a[1], b[1])
  );
}

/** Closed segments ab and cd share at least one point. */
function segmentsTouch(a: XY, b: XY, c: XY, d: XY): boolean {
  const o1 = orient(a, b, c);
  const o2 = orient(a, b, d);
  const o3 = orient(c, d, a);
  const o4 = orient(c, d, b);
  if (o1 !== o2 && o3 !== o4) return true;
  if (o1 === 0 && onSegment(a, b, c)) return true;
  if (o2 === 0 && onSegment(a, b, d)) return true;
  if (o3 === 0 && onSegment(c, d, a)) return true;
  if (o4 === 0 && onSegment(c, d, b)) return true;
  return false;
}
