import { firstItem, itemAt, lastItem } from '../util/invariant.ts';
import { FIELD_EXTENT_CHORDS_DEFAULT } from './constants';
import { pressureField } from './pressureField';
import { solveSection } from './solveSection';
import type { Point, SolveResult } from './types';

/** p/p∞ along a horizontal line below or above a section, as steps (see PressureProfile). */
export interface PressureSignature {
  side: 'below' | 'above';
  /** Distance from the section's lowest (below) or highest (above) point, in chords. */
  distanceChords: number;
  /** The line's y in body axes. */
  y: number;
  /** Step edges, in chords from the nose (x − x_nose)/c; one more than `p`. */
  xOverC: number[];
  /** p/p∞ on each step (null inside the section: not on a line clear of it). */
  p: (number | null)[];
  /** Largest and smallest p/p∞ on the line (1 when it meets no wave). */
  max: number;
  min: number;
}

/**
 * The pressure signature of a solved section: p/p∞ along the horizontal line at
 * `distanceChords` chords below its lowest point or above its highest, from the field box's
 * front edge to its rear edge. The wave map is solved again for the section as solved (its
 * outline from the facets, the same condition) with a field box that reaches the line and runs
 * far enough aft for the waves to cross it (the Mach lines lean at μ∞ from the stream), so the
 * shocks there have absorbed every ray that meets them before the line.
 *
 * The line is trimmed to half a chord before the first wave it meets and after the last (the
 * free stream, p/p∞ = 1, elsewhere). Edge cases: a surface whose march stopped has waves only
 * up to there; a result with no facets gives null; the distance is clamped to [0, 99] chords
 * (the field box is at most 100 chords).
 *
 * Sources: the wave map with its interactions (interactWaves, NACA Report 1135 relations); the
 * far-field decay like distance^(−1/2) of weak-shock theory (G. B. Whitham, Linear and
 * Nonlinear Waves, 1974) is what a signature far below shows.
 */
export function pressureSignature(result: SolveResult, side: 'below' | 'above', distanceChords: number): PressureSignature | null {
  const { upper, lower } = result.surfaces;
  const first = upper[0];
  if (!first || lower.length === 0) return null;
  // The outline as solved: nose → tail over the top, then back under the bottom.
  const points: Point[] = [first.from];
  for (const f of upper) points.push(f.to);
  for (const f of lower.slice(1).reverse()) points.push(f.from);
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (const [x, y] of points) {
    minX = Math.min(minX, x);
    maxX = Math.max(maxX, x);
    minY = Math.min(minY, y);
    maxY = Math.max(maxY, y);
  }
  const chord = maxX - minX;
  if (!(chord > 0)) return null;
  const h = Math.min(Math.max(distanceChords, 0), 99);
  const mach = result.condition.mach;
  // Far enough aft for a Mach line from the tail to reach the line: (h + thickness)·cot μ∞.
  const cotMu = Math.sqrt(mach * mach - 1);
  const reach = h + (maxY - minY) / chord + 0.5;
  const extent = Math.min(100, Math.max(FIELD_EXTENT_CHORDS_DEFAULT, reach * Math.max(1, cotMu) + 1));
  const solved = solveSection({
    section: { points },
    flow: { mach, alphaDeg: result.condition.alphaDeg, gamma: result.condition.gamma },
    options: { fieldExtentChords: extent, waves: true },
  });
  const y = side === 'below' ? minY - h * chord : maxY + h * chord;
  const xMin = minX - extent * chord;
  const xMax = maxX + extent * chord;
  const full = pressureField(solved.waves, points)(y, xMin, xMax);
  const profile = trimmed(full, 0.5 * chord);
  let max = 1;
  let min = 1;
  for (const p of profile.p) {
    if (p === null) continue;
    max = Math.max(max, p);
    min = Math.min(min, p);
  }
  return {
    side,
    distanceChords: h,
    y,
    xOverC: profile.x.map((x) => (x - minX) / chord),
    p: profile.p,
    max,
    min,
  };
}

/** The profile from `margin` before its first step off the free stream to `margin` after its
 *  last (the whole profile when it never leaves it). */
function trimmed(profile: { x: number[]; p: (number | null)[] }, margin: number): { x: number[]; p: (number | null)[] } {
  const { x, p } = profile;
  let first = -1;
  let last = -1;
  for (let k = 0; k < p.length; k++) {
    if (p[k] === 1) continue;
    if (first < 0) first = k;
    last = k;
  }
  if (first < 0) return profile;
  // x has one more entry than p (step k runs from x[k] to x[k + 1]) and first ≤ last < p.length.
  const xFirst = itemAt(x, first);
  const xEnd = itemAt(x, last + 1);
  const from = Math.max(firstItem(x), xFirst - margin);
  const to = Math.min(lastItem(x), xEnd + margin);
  const outX: number[] = [from];
  const outP: (number | null)[] = [];
  if (xFirst > from) {
    outX.push(xFirst);
    outP.push(1);
  }
  for (let k = first; k <= last; k++) {
    outX.push(itemAt(x, k + 1));
    outP.push(itemAt(p, k));
  }
  if (to > xEnd) {
    outX.push(to);
    outP.push(1);
  }
  return { x: outX, p: outP };
}
