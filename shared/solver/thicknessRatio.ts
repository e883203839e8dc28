import type { XY } from '../model/polygon';
import { maxThicknessRatio } from './maxThicknessRatio';
import { splitSurfaces } from './splitSurfaces';

/**
 * Thickness ratio t/c of a section given as its vertices: the solver's own measure
 * (`maxThicknessRatio`: thickness normal to the chord line from nose to tail, over that line's
 * length), so the sketches table, the report and the solve result agree. A section drawn at an
 * angle keeps the t/c it was drawn with. Null for fewer than 3 vertices or a zero chord.
 *
 * Source: common practice (thickness ratio measured normal to the chord line).
 */
export function thicknessRatio(points: readonly XY[]): number | null {
  if (points.length < 3) return null;
  const split = splitSurfaces(points);
  if (!(split.chord > 0)) return null;
  return maxThicknessRatio(split.upper, split.lower);
}
