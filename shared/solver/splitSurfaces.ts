import { signedArea, type XY } from '../model/polygon';
import { atanNearZero } from './atanNearZero';
import { BLUNT_FACE_ANGLE_RAD } from './constants';
import { itemAt, present } from '../util/invariant.ts';

/** One surface as a vertex chain from the nose to the tail. Angles in radians. */
export interface SurfaceChain {
  /** Input vertex indices, nose first, tail last (facet count + 1 entries). */
  vertices: number[];
  /** Input edge index of each facet (edge i runs points[i] → points[(i+1) % n]). */
  edges: number[];
  /** Vertex coordinates in chain order. */
  xs: number[];
  ys: number[];
  /** Facet angle φ = atan2(dy, dx), nose → tail, in (−π, π]. */
  phi: number[];
  /** Turn at each facet's leading vertex: the change of direction from the previous facet,
   *  counter-clockwise positive, in (−π, π]; 0 for the first facet. */
  turn: number[];
  length: number[];
}

/** The section split at its nose and tail. */
export interface SplitSection {
  chord: number;
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
  noseIndex: number;
  tailIndex: number;
  /** Vertices of a vertical face at the nose (consecutive edges within BLUNT_FACE_ANGLE_RAD of
   *  vertical, in index order), or null for a sharp nose. */
  bluntNose: number[] | null;
  /** The same at the tail. */
  bluntTail: number[] | null;
  upper: SurfaceChain;
  lower: SurfaceChain;
}

/**
 * Splits a closed polygon into its upper and lower surfaces.
 *
 * Conventions: body axes; chord = max x − min x; nose = the vertex of min x, tail = the vertex of
 * max x (exact ties: the one of least y). When an edge at the nose (tail) is vertical — within
 * BLUNT_FACE_ANGLE_RAD of the y axis, an angular test independent of the edge's length — the
 * nose (tail) is blunt: `bluntNose` (`bluntTail`) lists the vertices of that vertical face and
 * the nose (tail) is its vertex of least y.
 * The upper surface is the chain from nose to tail that runs over the top: for a
 * counter-clockwise polygon that is the backward chain, for a clockwise one the forward chain
 * (the orientation is read from the turn at the nose, an extreme vertex),
 * so the input's vertex order never changes the surfaces. Everything is computed nose → tail,
 * so both orders give bit-identical numbers. The first facet's angle is atan2(dy, dx); each
 * later one adds the turn atan2(cross, dot) of consecutive facet vectors (a series for the
 * small turns of a fine section), which is exact to rounding and never jumps by 2π.
 *
 * Edge case: a zero-length facet (repeated point, rejected by validation) gets φ = 0.
 *
 * Source: common practice (shoelace orientation test).
 */
export function splitSurfaces(points: readonly XY[]): SplitSection {
  const n = points.length;
  // One pass: the bounding box, the nose (least (x, y)) and the tail (greatest x, least y
  // among exact ties). The tail excludes the nose vertex, which matters only when the nose is
  // also of greatest x (every vertex on one vertical line): that case takes a second pass.
  const first = present(points[0], 0, points);
  let minX = first[0];
  let maxX = first[0];
  let minY = first[1];
  let maxY = first[1];
  let noseIndex = 0;
  let noseX = first[0];
  let noseY = first[1];
  let tailIndex = 0;
  let tailX = first[0];
  let tailY = first[1];
  for (let i = 1; i < n; i++) {
    const p = present(points[i], i, points);
    const x = p[0];
    const y = p[1];
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
    if (x < noseX || (x === noseX && y < noseY)) {
      noseIndex = i;
      noseX = x;
      noseY = y;
    }
    if (x > tailX || (x === tailX && y < tailY)) {
      tailIndex = i;
      tailX = x;
      tailY = y;
    }
  }
  const chord = maxX - minX;
  if (tailIndex === noseIndex) {
    tailIndex = -1;
    let t: XY | null = null;
    for (let i = 0; i < n; i++) {
      if (i === noseIndex) continue;
      const p = present(points[i], i, points);
      if (t === null || p[0] > t[0] || (p[0] === t[0] && p[1] < t[1])) {
        tailIndex = i;
        t = p;
      }
    }
  }
  if (tailIndex < 0) tailIndex = (noseIndex + 1) % n;
  const bluntNose = verticalFace(points, noseIndex);
  const bluntTail = verticalFace(points, tailIndex);
  // A vertical face's nose (tail) is its vertex of least y, as for an exact tie.
  if (bluntNose) noseIndex = lowest(points, bluntNose);
  if (bluntTail) tailIndex = lowest(points, bluntTail);

  const forward = chain(points, noseIndex, tailIndex, 1);
  const backward = chain(points, noseIndex, tailIndex, -1);
  // A blunt nose's chosen vertex need not be extreme: use the area there.
  const ccw = bluntNose ? signedArea(points) > 0 : counterClockwise(points, noseIndex);
  return {
    chord,
    minX,
    maxX,
    minY,
    maxY,
    noseIndex,
    tailIndex,
    bluntNose,
    bluntTail,
    upper: ccw ? backward : forward,
    lower: ccw ? forward : backward,
  };
}

/**
 * Orientation from the turn at the nose: the vertex of least (x, y) is an extreme point, so the
 * polygon turns left there exactly when it runs counter-clockwise. Falls back to the signed
 * area if that turn is degenerate (it is not, for a simple polygon).
 */
function counterClockwise(points: readonly XY[], v: number): boolean {
  const n = points.length;
  const iP = (v + n - 1) % n;
  const iQ = (v + 1) % n;
  const p = present(points[iP], iP, points);
  const c = present(points[v], v, points);
  const q = present(points[iQ], iQ, points);
  const cross = (c[0] - p[0]) * (q[1] - c[1]) - (c[1] - p[1]) * (q[0] - c[0]);
  return cross !== 0 ? cross > 0 : signedArea(points) > 0;
}

const VERTICAL_SLOPE = Math.tan(BLUNT_FACE_ANGLE_RAD);

/** Whether the edge a → b is within BLUNT_FACE_ANGLE_RAD of vertical (and not a point). */
function vertical(a: XY, b: XY): boolean {
  const dx = Math.abs(b[0] - a[0]);
  const dy = Math.abs(b[1] - a[1]);
  return dy > 0 && dx <= VERTICAL_SLOPE * dy;
}

/** Whether the edge from points[i] to points[j] is vertical (see `vertical`). */
function verticalEdge(points: readonly XY[], i: number, j: number): boolean {
  return vertical(present(points[i], i, points), present(points[j], j, points));
}

/**
 * The vertices of the run of consecutive vertical edges through vertex `v` (in index order), or
 * null when neither edge at `v` is vertical (a sharp end).
 */
function verticalFace(points: readonly XY[], v: number): number[] | null {
  const n = points.length;
  let first = v;
  let steps = 0;
  while (steps < n - 1 && verticalEdge(points, (first + n - 1) % n, first)) {
    first = (first + n - 1) % n;
    steps++;
  }
  const out = [first];
  let i = first;
  while (out.length < n && verticalEdge(points, i, (i + 1) % n)) {
    i = (i + 1) % n;
    out.push(i);
  }
  return out.length > 1 ? out.sort((a, b) => a - b) : null;
}

function lowest(points: readonly XY[], indices: readonly number[]): number {
  let best = itemAt(indices, 0);
  for (const i of indices) if (itemAt(points, i)[1] < itemAt(points, best)[1]) best = i;
  return best;
}

/** Walks from the nose to the tail in the given index direction. */
function chain(points: readonly XY[], nose: number, tail: number, step: 1 | -1): SurfaceChain {
  const n = points.length;
  const m = step === 1 ? (tail - nose + n) % n : (nose - tail + n) % n; // facet count
  const vertices: number[] = new Array(m + 1);
  const xs: number[] = new Array(m + 1);
  const ys: number[] = new Array(m + 1);
  const phi: number[] = new Array(m);
  const turn: number[] = new Array(m);
  const length: number[] = new Array(m);
  let i = nose;
  const start = present(points[i], i, points);
  let x0 = start[0];
  let y0 = start[1];
  vertices[0] = i;
  xs[0] = x0;
  ys[0] = y0;
  if (m === 0) return { vertices, edges: vertices.slice(0, 0), xs, ys, phi, turn, length };
  // The first facet: its angle is atan2(dy, dx), its turn 0.
  let i1 = i + step;
  if (i1 === n) i1 = 0;
  else if (i1 < 0) i1 = n - 1;
  const second = present(points[i1], i1, points);
  let pdx = second[0] - x0;
  let pdy = second[1] - y0;
  let angle = Math.atan2(pdy, pdx);
  turn[0] = 0;
  phi[0] = angle;
  length[0] = Math.sqrt(pdx * pdx + pdy * pdy);
  vertices[1] = i1;
  xs[1] = second[0];
  ys[1] = second[1];
  i = i1;
  x0 = second[0];
  y0 = second[1];
  // Each later facet adds the turn at its leading vertex.
  for (let k = 1; k < m; k++) {
    let j = i + step;
    if (j === n) j = 0;
    else if (j < 0) j = n - 1;
    // j stays in [0, n) by the wrap above; the hot loop reads the point itself (see present).
    const p = present(points[j], j, points);
    const x1 = p[0];
    const y1 = p[1];
    const dx = x1 - x0;
    const dy = y1 - y0;
    const cross = pdx * dy - pdy * dx;
    const dot = pdx * dx + pdy * dy;
    const d = dot > 0 && cross <= 0.1 * dot && cross >= -0.1 * dot ? atanNearZero(cross / dot) : Math.atan2(cross, dot);
    turn[k] = d;
    angle += d;
    if (angle > Math.PI) angle -= 2 * Math.PI;
    else if (angle <= -Math.PI) angle += 2 * Math.PI;
    phi[k] = angle;
    length[k] = Math.sqrt(dx * dx + dy * dy);
    vertices[k + 1] = j;
    xs[k + 1] = x1;
    ys[k + 1] = y1;
    i = j;
    x0 = x1;
    y0 = y1;
    pdx = dx;
    pdy = dy;
  }
  // Facet k runs vertex k → k + 1: its input edge starts at the lower index of the two.
  const edges = step === 1 ? vertices.slice(0, m) : vertices.slice(1);
  return { vertices, edges, xs, ys, phi, turn, length };
}
