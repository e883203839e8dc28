import type { Point } from '@shared/model/sketch';
import type { Wave } from '@shared/solver/types';
import { present } from '@shared/util/invariant';

/**
 * Pure geometry and hit tests for the canvas, in world (body-axis) coordinates. Konva draws;
 * these decide what the pointer is on, so tools and tooltips are testable without a canvas.
 */

type XY = readonly [number, number];
/**
 * An optional map applied to both the points and the pointer before measuring distances: the
 * view's `isotropic` map under a vertical exaggeration, so that a tolerance in pixels means the
 * same on screen in x and y. Results (`at`) are always in body axes.
 */
type Metric = ((p: XY) => XY) | null | undefined;

/** Distance from p to segment ab, and where along ab (0…1) the nearest point lies. */
export function distanceToSegment(p: XY, a: XY, b: XY): { distance: number; t: number; at: Point } {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const len2 = dx * dx + dy * dy;
  let t = len2 > 0 ? ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2 : 0;
  t = Math.max(0, Math.min(1, t));
  const at: Point = [a[0] + t * dx, a[1] + t * dy];
  return { distance: Math.hypot(p[0] - at[0], p[1] - at[1]), t, at };
}

/** The vertex nearest to p within `tolerance`, or null. */
export function hitVertex(points: readonly XY[], p: XY, tolerance: number, metric?: Metric): number | null {
  let best: number | null = null;
  let bestD = tolerance;
  const pm = metric ? metric(p) : p;
  points.forEach((raw, i) => {
    const q = metric ? metric(raw) : raw;
    const d = Math.hypot(q[0] - pm[0], q[1] - pm[1]);
    if (d <= bestD) {
      bestD = d;
      best = i;
    }
  });
  return best;
}

/** The facet (edge i → i+1) nearest to p within `tolerance`: its index and the nearest point. */
export function hitFacet(points: readonly XY[], p: XY, tolerance: number, metric?: Metric): { index: number; t: number; at: Point } | null {
  const n = points.length;
  let best: { index: number; t: number; at: Point } | null = null;
  let bestD = tolerance;
  const pm = metric ? metric(p) : p;
  for (let i = 0; i < n; i++) {
    const a = present(points[i], i, points);
    const b = present(points[(i + 1) % n], (i + 1) % n, points);
    const r = metric ? distanceToSegment(pm, metric(a), metric(b)) : distanceToSegment(p, a, b);
    if (r.distance <= bestD) {
      bestD = r.distance;
      best = { index: i, t: r.t, at: metric ? [a[0] + r.t * (b[0] - a[0]), a[1] + r.t * (b[1] - a[1])] : r.at };
    }
  }
  return best;
}

/** Even-odd point-in-polygon test. */
export function pointInPolygon(points: readonly XY[], p: XY): boolean {
  let inside = false;
  for (let i = 0, j = points.length - 1; i < points.length; j = i++) {
    const [xi, yi] = present(points[i], i, points);
    const [xj, yj] = present(points[j], j, points);
    if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

export interface Rect {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Indices of the vertices inside the rectangle spanned by two corners (any order). */
export function verticesInRect(points: readonly XY[], r: Rect): number[] {
  const minX = Math.min(r.x0, r.x1);
  const maxX = Math.max(r.x0, r.x1);
  const minY = Math.min(r.y0, r.y1);
  const maxY = Math.max(r.y0, r.y1);
  const out: number[] = [];
  points.forEach(([x, y], i) => {
    if (x >= minX && x <= maxX && y >= minY && y <= maxY) out.push(i);
  });
  return out;
}

export interface SnapSettings {
  /** Snap positions to multiples of the steps. */
  grid: boolean;
  /** Snap steps along x and y, chord units (also the arrow keys' nudge). */
  stepX: number;
  stepY: number;
  /** Snap the direction of the facet being drawn or dragged to multiples of this; 0 = off. */
  angleStepDeg: number;
}

/** Rounds a value to the nearest multiple of `step`, without binary noise (0.1·3 = 0.3). */
export function roundTo(v: number, step: number): number {
  if (!(step > 0)) return v;
  const decimals = Math.max(0, Math.ceil(-Math.log10(step)) + 2);
  const r = Number((Math.round(v / step) * step).toFixed(Math.min(decimals, 15)));
  return r === 0 ? 0 : r;
}

export function snapToGrid(p: XY, stepX: number, stepY: number = stepX): Point {
  return [roundTo(p[0], stepX), roundTo(p[1], stepY)];
}

/**
 * Turns the direction anchor → p to the nearest multiple of `stepDeg`, keeping the distance
 * measured along the snapped direction (p projected onto it).
 */
export function snapAngle(anchor: XY, p: XY, stepDeg: number): Point {
  const dx = p[0] - anchor[0];
  const dy = p[1] - anchor[1];
  if (!(stepDeg > 0) || (dx === 0 && dy === 0)) return [p[0], p[1]];
  const step = (stepDeg * Math.PI) / 180;
  const angle = Math.round(Math.atan2(dy, dx) / step) * step;
  const ux = Math.cos(angle);
  const uy = Math.sin(angle);
  const along = dx * ux + dy * uy;
  return [anchor[0] + along * ux, anchor[1] + along * uy];
}

/**
 * Snaps a pointer position: to the angle step from `anchor` when there is one and angle
 * snapping is on (the facet being drawn keeps its direction), else to the grid when grid
 * snapping is on, else unchanged.
 */
export function snapPoint(p: XY, settings: SnapSettings, anchor: XY | null): Point {
  if (anchor && settings.angleStepDeg > 0) return snapAngle(anchor, p, settings.angleStepDeg);
  if (settings.grid) return snapToGrid(p, settings.stepX, settings.stepY);
  return [p[0], p[1]];
}

/** The wave under the pointer; `segment`: which segment of its path (or of the ray's). */
export type WaveHit = { wave: Wave; ray: number | null; distance: number; segment: number };

/**
 * The wave whose drawn line passes nearest to p within `tolerance`: shocks, Mach and slip
 * lines along their paths; fans by each ray. `visible` filters by kind (hidden layers are not
 * hit).
 */
export function hitWave(waves: readonly Wave[], p: XY, tolerance: number, visible: (w: Wave) => boolean = () => true, metric?: Metric): WaveHit | null {
  let best: WaveHit | null = null;
  const m = metric ?? ((q: XY) => q);
  const pm = m(p);
  for (const wave of waves) {
    if (!visible(wave)) continue;
    // Along each drawn path (a result stored before waves had paths: origin → end).
    const along = (path: readonly XY[] | undefined, end: XY): { d: number; segment: number } => {
      const pts = path && path.length >= 2 ? path : [wave.origin, end];
      let d = Infinity;
      let segment = 0;
      for (let k = 0; k + 1 < pts.length; k++) {
        const dk = distanceToSegment(pm, m(pts[k] as XY), m(pts[k + 1] as XY)).distance;
        if (dk < d) {
          d = dk;
          segment = k;
        }
      }
      return { d, segment };
    };
    if (wave.kind === 'fan' && wave.rays && wave.rays.length > 0) {
      wave.rays.forEach((ray, k) => {
        const { d, segment } = along(ray.path, ray.end);
        if (d <= tolerance && (!best || d < best.distance)) best = { wave, ray: k, distance: d, segment };
      });
    } else {
      const { d, segment } = along(wave.path, wave.end);
      if (d <= tolerance && (!best || d < best.distance)) best = { wave, ray: null, distance: d, segment };
    }
  }
  return best;
}

/**
 * Drops binary noise from a coordinate built by adding offsets (0.025 − 0.035 gives
 * −0.010000000000000002): 12 significant digits, far below any drawing precision.
 */
export function tidy(v: number): number {
  const r = Number(v.toPrecision(12));
  return r === 0 ? 0 : r;
}

export function tidyPoint(x: number, y: number): Point {
  return [tidy(x), tidy(y)];
}
