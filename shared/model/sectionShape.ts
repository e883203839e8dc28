import { maxThicknessRatio } from '../solver/maxThicknessRatio.ts';
import { splitSurfaces } from '../solver/splitSurfaces.ts';
import type { XY } from './polygon.ts';
import type { Point } from './sketch.ts';
import { firstItem, itemAt, lastItem } from '../util/invariant.ts';

/**
 * What an engineer reads off a section: chord, thickness ratio and where the thickest point
 * (the ridge) sits, camber and where it is largest. Pure; the canvas's drag readout, the section
 * commands and the import preview all use it.
 *
 * Conventions (README "What it computes"): nose = the min-x vertex, tail = the max-x vertex
 * in body axes; the surfaces are the two vertex chains from nose to tail (`splitSurfaces`).
 * Thickness and camber are measured in chord-line axes, as the solver's t/c is
 * (`maxThicknessRatio`): s along the chord line (nose → tail, length L), n normal to it (up for
 * a level section). The thickness at s is the distance in n between the surfaces, the mean line
 * is halfway between them and camber is its offset n from the chord line; ratios are over L and
 * positions s/L from the nose. Both are piecewise linear between the vertices' s, so their
 * extremes sit at a vertex's s. For a section drawn level (nose and tail at one height) s is x
 * and n is y.
 *
 * Source: common practice (thickness ratio t/c, mean line and camber as offsets from the chord
 * line, e.g. Abbott & von Doenhoff, "Theory of Wing Sections", ch. 6).
 */

/** One surface, nose → tail. */
export interface SurfacePath {
  /** Input vertex indices, nose first, tail last. */
  vertices: number[];
  xs: number[];
  ys: number[];
}

/** Chord-line axes: s along the line from the nose to the tail, n normal to it (s turned +90°). */
export interface ChordFrame {
  origin: XY;
  /** Unit vector along the chord line. */
  ux: number;
  uy: number;
  /** Length of the chord line (nose to tail). */
  length: number;
}

export interface SectionShape {
  /** max x − min x (body axes). */
  chord: number;
  minX: number;
  maxX: number;
  frame: ChordFrame;
  /** The surfaces in chord-line axes (xs = s, ys = n), same vertices as `upper` and `lower`. */
  alongUpper: SurfacePath;
  alongLower: SurfacePath;
  noseIndex: number;
  tailIndex: number;
  nose: XY;
  tail: XY;
  /** A vertical face at the nose or the tail (several vertices tie for min or max x). */
  blunt: boolean;
  upper: SurfacePath;
  lower: SurfacePath;
  /**
   * Both surfaces run from nose to tail without turning back along the chord line, so "the
   * other surface at s" is defined: thickness distribution, ridge and camber exist (else null).
   */
  monotone: boolean;
  /** Largest thickness over the chord line's length (0…), as the results state it (`maxThicknessRatio`). */
  thicknessRatio: number;
  /** s/L of the thickest point from the nose (the middle of a flat of equal thickness); null when not monotone. */
  ridgeXOverC: number | null;
  /** Largest mean-line offset from the chord line over L, signed (positive towards n); null when not monotone. */
  camberRatio: number | null;
  /** s/L where the camber is largest; null when not monotone or without camber. */
  camberXOverC: number | null;
}

/** Extremes closer than this fraction of the largest value count as a tie (a flat ridge). */
export const RIDGE_TIE_FRACTION = 1e-9;

/** The chord-line frame from the nose to the tail. */
export function chordFrame(nose: XY, tail: XY): ChordFrame {
  const dx = tail[0] - nose[0];
  const dy = tail[1] - nose[1];
  const length = Math.hypot(dx, dy);
  return length > 0 ? { origin: nose, ux: dx / length, uy: dy / length, length } : { origin: nose, ux: 1, uy: 0, length: 0 };
}

/** Body axes → chord-line axes [s, n]. */
export function toChordAxes(f: ChordFrame, p: XY): [number, number] {
  const px = p[0] - f.origin[0];
  const py = p[1] - f.origin[1];
  return [px * f.ux + py * f.uy, -px * f.uy + py * f.ux];
}

/** Chord-line axes [s, n] → body axes. */
export function fromChordAxes(f: ChordFrame, q: XY): Point {
  return [f.origin[0] + q[0] * f.ux - q[1] * f.uy, f.origin[1] + q[0] * f.uy + q[1] * f.ux];
}

/** Splits a polygon into its two surfaces, nose → tail, in body and chord-line axes. */
export function sectionSurfaces(points: readonly XY[]): Omit<SectionShape, 'thicknessRatio' | 'ridgeXOverC' | 'camberRatio' | 'camberXOverC'> {
  const split = splitSurfaces(points);
  const upper: SurfacePath = { vertices: split.upper.vertices, xs: split.upper.xs, ys: split.upper.ys };
  const lower: SurfacePath = { vertices: split.lower.vertices, xs: split.lower.xs, ys: split.lower.ys };
  const nose = itemAt(points, split.noseIndex);
  const tail = itemAt(points, split.tailIndex);
  const frame = chordFrame(nose, tail);
  const along = (c: SurfacePath): SurfacePath => {
    const q = c.vertices.map((i) => toChordAxes(frame, itemAt(points, i)));
    return { vertices: c.vertices, xs: q.map((p) => p[0]), ys: q.map((p) => p[1]) };
  };
  const alongUpper = along(upper);
  const alongLower = along(lower);
  return {
    chord: split.chord,
    minX: split.minX,
    maxX: split.maxX,
    frame,
    alongUpper,
    alongLower,
    noseIndex: split.noseIndex,
    tailIndex: split.tailIndex,
    nose,
    tail,
    blunt: split.bluntNose !== null || split.bluntTail !== null,
    upper,
    lower,
    monotone: nonDecreasing(alongUpper.xs) && nonDecreasing(alongLower.xs),
  };
}

function nonDecreasing(xs: readonly number[]): boolean {
  return xs.every((x, i) => i === 0 || x >= itemAt(xs, i - 1));
}

/**
 * The surface's y at x (linear between its vertices); x outside the surface's range takes the
 * end value. At a vertical step (two vertices at one x) the later vertex counts. The surface
 * must be non-decreasing in x.
 */
export function surfaceYAt(surface: Pick<SurfacePath, 'xs' | 'ys'>, x: number): number {
  const { xs, ys } = surface;
  // xs and ys are parallel; j and j + 1 lie inside them once x is strictly between the ends.
  if (x <= firstItem(xs)) return firstItem(ys);
  if (x >= lastItem(xs)) return lastItem(ys);
  const j = lastAtOrBefore(xs, x);
  const x0 = itemAt(xs, j);
  const x1 = itemAt(xs, j + 1);
  const y0 = itemAt(ys, j);
  const y1 = itemAt(ys, j + 1);
  if (x1 <= x0) return y1;
  return y0 + ((x - x0) / (x1 - x0)) * (y1 - y0);
}

/** The highest (`max`) or lowest (`min`) point of the surface at x, counting every vertex of a vertical step there. */
export function surfaceExtremeAt(surface: Pick<SurfacePath, 'xs' | 'ys'>, x: number, which: 'max' | 'min'): number {
  const { xs, ys } = surface;
  let y = surfaceYAt(surface, x);
  const pick = which === 'max' ? Math.max : Math.min;
  for (let j = lastAtOrBefore(xs, x); j >= 0 && itemAt(xs, j) === x; j--) y = pick(y, itemAt(ys, j));
  return y;
}

/** Index of the last entry ≤ x in a non-decreasing list (−1 when none), by bisection. */
function lastAtOrBefore(xs: readonly number[], x: number): number {
  let lo = -1;
  let hi = xs.length;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (itemAt(xs, mid) <= x) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** Chord line, thickness ratio, ridge, camber (see the module comment). O(n log n). */
export function sectionShape(points: readonly XY[]): SectionShape {
  const s = sectionSurfaces(points);
  const L = s.frame.length;
  const thicknessRatio = maxThicknessRatio(s.upper, s.lower);
  if (!(L > 0) || !s.monotone) return { ...s, thicknessRatio, ridgeXOverC: null, camberRatio: null, camberXOverC: null };
  const up = s.alongUpper;
  const lo = s.alongLower;
  // Every vertex's s on both surfaces, in order.
  const ss = [...up.xs, ...lo.xs].sort((a, b) => a - b);
  // A step normal to the chord line (a blunt base) counts at its full height.
  const thickness = ss.map((x) => surfaceExtremeAt(up, x, 'max') - surfaceExtremeAt(lo, x, 'min'));
  const camber = ss.map((x) => (surfaceYAt(up, x) + surfaceYAt(lo, x)) / 2);

  let tMax = -Infinity;
  for (const t of thickness) if (t > tMax) tMax = t;
  const tieT = RIDGE_TIE_FRACTION * Math.max(Math.abs(tMax), L);
  let first = -1;
  let last = -1;
  thickness.forEach((t, i) => {
    if (t >= tMax - tieT) {
      if (first < 0) first = i;
      last = i;
    }
  });
  // thickness has an entry ≥ its own maximum, so first and last were set.
  const ridgeS = (itemAt(ss, first) + itemAt(ss, last)) / 2;

  let cBest = 0;
  let cAt = 0;
  camber.forEach((c, i) => {
    if (Math.abs(c) > Math.abs(cBest) + RIDGE_TIE_FRACTION * L) {
      cBest = c;
      cAt = i;
    }
  });
  return {
    ...s,
    thicknessRatio,
    ridgeXOverC: ridgeS / L,
    camberRatio: cBest / L,
    camberXOverC: cBest === 0 ? null : itemAt(ss, cAt) / L,
  };
}
