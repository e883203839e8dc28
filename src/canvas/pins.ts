import type { Point } from '@shared/model/sketch';
import type { PinTarget } from '@shared/model/review';
import type { SolveResult, Wave } from '@shared/solver/types';
import { distanceToSegment, hitFacet, hitWave, tidyPoint } from './geometry';
import { waveTooltip } from './tooltips';
import { toScreen, type View } from './view';
import { formatNumber } from '@shared/format/number';

/**
 * Pins on the canvas: what a click in pin mode points at, and where pin markers sit on screen.
 * Pure functions in world (body-axis) coordinates, like the rest of src/canvas.
 */

/** A pin as the canvas draws it: a marker whose tip touches `at`. */
export interface PinMarker {
  id: string;
  at: Point;
  status: 'open' | 'resolved' | 'draft';
  selected: boolean;
}

/** The marker's head sits this far above its tip, pixels. */
export const PIN_STEM_PX = 16;
/** Radius of the marker's head, pixels. */
export const PIN_HEAD_RADIUS_PX = 7;
/** A click this close to a head's centre opens the pin, pixels. */
export const PIN_HIT_RADIUS_PX = 10;

/** Where the marker's head is drawn, screen pixels. */
export function pinHead(view: View, at: Point): [number, number] {
  const [x, y] = toScreen(view, at);
  return [x, y - PIN_STEM_PX];
}

/** The pin whose head is under the screen point (the one drawn last wins), or null. */
export function hitPinMarker(markers: readonly PinMarker[], view: View, screen: readonly [number, number]): string | null {
  let found: string | null = null;
  for (const m of drawOrder(markers)) {
    if (m.status === 'draft') continue;
    const [hx, hy] = pinHead(view, m.at);
    if (Math.hypot(screen[0] - hx, screen[1] - hy) <= PIN_HIT_RADIUS_PX) found = m.id;
  }
  return found;
}

/** Resolved pins underneath, open above, the selected one and a draft on top. */
export function drawOrder(markers: readonly PinMarker[]): PinMarker[] {
  const rank = (m: PinMarker) => (m.status === 'draft' ? 3 : m.selected ? 2 : m.status === 'open' ? 1 : 0);
  return [...markers].sort((a, b) => rank(a) - rank(b));
}

/** The nearest point of a wave's drawn line (a fan: of the ray `ray`) to p. */
function nearestOnWave(wave: Wave, ray: number | null, p: Point): Point {
  const end = wave.kind === 'fan' && ray !== null && wave.rays?.[ray] ? wave.rays[ray].end : wave.end;
  return distanceToSegment(p, wave.origin, end).at;
}

/**
 * What a pin placed at `world` points at: the facet under the pointer, else a visible wave of
 * the wave map (by its id, with the label its tooltip carries), else the point itself. A facet
 * or wave pin sits on the nearest point of that facet or line, so it stays on what it names.
 */
export function pinTargetAt(
  points: readonly Point[],
  result: SolveResult | null,
  world: Point,
  tolerance: number,
  visible: (w: Wave) => boolean = () => true,
  /** The view's `isotropic` map under a vertical exaggeration (tolerance then means pixels/scale in x and y alike). */
  metric: ((p: readonly [number, number]) => [number, number]) | null = null,
): PinTarget {
  const facet = hitFacet(points, world, tolerance, metric);
  if (facet) return { kind: 'facet', facet: facet.index, at: tidyPoint(facet.at[0], facet.at[1]) };
  if (result) {
    const w = hitWave(result.waves, world, tolerance, visible, metric);
    if (w) {
      const at = nearestOnWave(w.wave, w.ray, world);
      const label = waveTooltip(w.wave, w.ray, result, 'pressureRatio').title.slice(0, 120);
      return { kind: 'wave', waveId: w.wave.id, label, at: tidyPoint(at[0], at[1]) };
    }
  }
  return { kind: 'point', at: tidyPoint(world[0], world[1]) };
}

/** A short name for what a pin points at ("facet 3", "Oblique shock · upper surface, vertex 0"). */
export function describePinTarget(target: PinTarget): string {
  if (target.kind === 'facet') return `Facet ${target.facet}`;
  if (target.kind === 'wave') return target.label ?? `Wave ${target.waveId}`;
  return `Point (${formatNumber(target.at[0], 4)}, ${formatNumber(target.at[1], 4)})`;
}
