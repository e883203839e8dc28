import { maxThicknessRatio } from '../solver/maxThicknessRatio.ts';
import { splitSurfaces } from '../solver/splitSurfaces.ts';
import type { XY } from './polygon.ts';

/**
 * What an engineer reads off a section: chord, thickness ratio and where the thickest point
 * (the ridge) sits, camber and where it is largest. Pure; the canvas's drag readout, the section
 * commands and the import preview all use it.
 *
 * Conventions (README "What it computes"): body axes, chord c = max x − min x, nose = the min-x
 * vertex, tail = the max-x vertex; the surfaces are the two vertex chains from nose to tail
 * (`splitSurfaces`). The thickness at x is the vertical distance between the surfaces, the mean
 * line is halfway between them, and camber is the mean line's vertical offset from the chord
 * line (the straight line from nose to tail). Both are piecewise linear between the vertex
 * x positions of the two surfaces, so their extremes sit at a vertex x.
 *
 * Source: common practice (thickness ratio t/c, mean line and camber as offsets from the chord
 * line, e.g. Abbott & von Doenhoff, "Theory of Wing Sections", ch. 6, with vertical offsets).
 */

/** One surface, nose → tail. */
export interface SurfacePath {
  /** Input vertex indices, nose first, tail last. */
  vertices: number[];
  xs: number[];
  ys: number[];
}

export interface SectionShape {
  chord: number;
  minX: number;
  maxX: number;
  noseIndex: number;
  tailIndex: number;
  nose: XY;
  tail: XY;
  /** A vertical face at the nose or the tail (several vertices tie for min or max x). */
  blunt: boolean;
  upper: SurfacePath;
  lower: SurfacePath;
  /**
   * Both surfaces run from nose to tail without turning back in x, so "the other surface at x"
   * is defined: thickness distribution, ridge and camber exist (else they are null).
   */
  monotone: boolean;
  /** Largest thickness over chord (0…), as the results state it (`maxThicknessRatio`). */
  thicknessRatio: number;
  /** x/c of the thickest point from the nose (the middle of a flat of equal thickness); null when not monotone. */
  ridgeXOverC: number | null;
  /** Largest mean-line offset from the chord line over chord, signed (positive up); null when not monotone. */
  camberRatio: number | null;
  /** x/c where the camber is largest; null when not monotone. */
  camberXOverC: number | null;
}

/** Extremes closer than this fraction of the largest value count as a tie (a flat ridge). */
export const RIDGE_TIE_FRACTION = 1e-9;

/** Splits a polygon into its two surfaces, nose → tail, with the nose and tail vertices. */
export function sectionSurfaces(points: readonly XY[]): Pick<SectionShape, 'chord' | 'minX' | 'maxX' | 'noseIndex' | 'tailIndex' | 'nose' | 'tail' | 'blunt' | 'upper' | 'lower' | 'monotone'> {
  const split = splitSurfaces(points);
  const upper: SurfacePath = { vertices: split.upper.vertices, xs: split.upper.xs, ys: split.upper.ys };
  const lower: SurfacePath = { vertices: split.lower.vertices, xs: split.lower.xs, ys: split.lower.ys };
  return {
    chord: split.chord,
    minX: split.minX,
    maxX: split.maxX,
    noseIndex: split.noseIndex,
    tailIndex: split.tailIndex,
    nose: points[split.noseIndex],
    tail: points[split.tailIndex],
    blunt: split.bluntNose !== null || split.bluntTail !== null,
    upper,
    lower,
    monotone: nonDecreasing(upper.xs) && nonDecreasing(lower.xs),
  };
}

function nonDecreasing(xs: readonly number[]): boolean {
  for (let i = 1; i < xs.length; i++) if (xs[i] < xs[i - 1]) return false;
  return true;
}

/**
 * The surface's y at x (linear between its vertices); x outside the surface's range takes the
 * end value. At a vertical step (two vertices at one x) the later vertex counts. The surface
 * must be non-decreasing in x.
 */
export function surfaceYAt(surface: Pick<SurfacePath, 'xs' | 'ys'>, x: number): number {
  const { xs, ys } = surface;
  const n = xs.length;
  if (x <= xs[0]) return ys[0];
  if (x >= xs[n - 1]) return ys[n - 1];
  const j = lastAtOrBefore(xs, x);
  const x0 = xs[j];
  const x1 = xs[j + 1];
  if (x1 <= x0) return ys[j + 1];
  return ys[j] + ((x - x0) / (x1 - x0)) * (ys[j + 1] - ys[j]);
}

/** The highest (`max`) or lowest (`min`) point of the surface at x, counting every vertex of a vertical step there. */
export function surfaceExtremeAt(surface: Pick<SurfacePath, 'xs' | 'ys'>, x: number, which: 'max' | 'min'): number {
  const { xs, ys } = surface;
  let y = surfaceYAt(surface, x);
  const pick = which === 'max' ? Math.max : Math.min;
  for (let j = lastAtOrBefore(xs, x); j >= 0 && xs[j] === x; j--) y = pick(y, ys[j]);
  return y;
}

/** Index of the last entry ≤ x in a non-decreasing list (−1 when none), by bisection. */
function lastAtOrBefore(xs: readonly number[], x: number): number {
  let lo = -1;
  let hi = xs.length;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] <= x) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** The chord line's y at x (nose → tail). */
export function chordLineYAt(nose: XY, tail: XY, x: number): number {
  const dx = tail[0] - nose[0];
  return dx === 0 ? nose[1] : nose[1] + ((x - nose[0]) / dx) * (tail[1] - nose[1]);
}

/** Chord, thickness ratio, ridge, camber (see the module comment). O(n log n). */
export function sectionShape(points: readonly XY[]): SectionShape {
  const s = sectionSurfaces(points);
  const { chord } = s;
  if (!(chord > 0)) return { ...s, thicknessRatio: 0, ridgeXOverC: null, camberRatio: null, camberXOverC: null };
  if (!s.monotone) {
    return { ...s, thicknessRatio: maxThicknessRatio(s.upper, s.lower, chord), ridgeXOverC: null, camberRatio: null, camberXOverC: null };
  }
  // Every vertex x of both surfaces, in order.
  const xs = [...s.upper.xs, ...s.lower.xs].sort((a, b) => a - b);
  // A vertical step (a blunt base) counts at its full height.
  const thickness = xs.map((x) => surfaceExtremeAt(s.upper, x, 'max') - surfaceExtremeAt(s.lower, x, 'min'));
  const camber = xs.map((x) => (surfaceYAt(s.upper, x) + surfaceYAt(s.lower, x)) / 2 - chordLineYAt(s.nose, s.tail, x));

  let tMax = -Infinity;
  for (const t of thickness) if (t > tMax) tMax = t;
  const tieT = RIDGE_TIE_FRACTION * Math.max(Math.abs(tMax), chord);
  let first = -1;
  let last = -1;
  thickness.forEach((t, i) => {
    if (t >= tMax - tieT) {
      if (first < 0) first = i;
      last = i;
    }
  });
  const ridgeX = (xs[first] + xs[last]) / 2;

  let cBest = 0;
  let cAt = 0;
  camber.forEach((c, i) => {
    if (Math.abs(c) > Math.abs(cBest) + RIDGE_TIE_FRACTION * chord) {
      cBest = c;
      cAt = i;
    }
  });
  return {
    ...s,
    thicknessRatio: maxThicknessRatio(s.upper, s.lower, chord),
    ridgeXOverC: (ridgeX - s.minX) / chord,
    camberRatio: cBest / chord,
    camberXOverC: cBest === 0 ? null : (xs[cAt] - s.minX) / chord,
  };
}
