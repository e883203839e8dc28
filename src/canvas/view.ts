import type { Point } from '@shared/model/sketch';

/**
 * The canvas view: body axes (x aft, y up, chord units) to screen pixels (y down).
 * screen = (x·scale + originX, −y·scale·exaggeration + originY). Pure functions; the component
 * owns the ref. A vertical exaggeration above 1 stretches y on screen only (thin sections):
 * the section, its waves and the grid are drawn stretched, and pointer positions convert back
 * through the same map, so edits land where the pointer is [V1].
 */
export interface View {
  /** Pixels per chord unit along x. */
  scale: number;
  originX: number;
  originY: number;
  /** Vertical exaggeration (y pixels per chord = scale × exaggeration); absent = 1. */
  exaggeration?: number;
}

/** The vertical exaggerations the view offers. */
export const EXAGGERATIONS = [1, 2, 5] as const;

/** Pixels per chord unit along y. */
export function scaleY(view: View): number {
  return view.scale * (view.exaggeration ?? 1);
}

/**
 * A map from body axes to a space where one pixel is the same distance in x and y (y stretched
 * by the exaggeration), for hit tests with a tolerance in pixels; null when there is no
 * exaggeration (the map would be the identity).
 */
export function isotropic(view: View): ((p: readonly [number, number]) => [number, number]) | null {
  const k = view.exaggeration ?? 1;
  return k === 1 ? null : (p) => [p[0], p[1] * k];
}

export interface Size {
  width: number;
  height: number;
}

export interface Bounds {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** Zoom limits, pixels per chord unit. */
export const MIN_SCALE = 5;
export const MAX_SCALE = 200_000;

export function toScreen(view: View, p: readonly [number, number]): [number, number] {
  return [p[0] * view.scale + view.originX, -p[1] * scaleY(view) + view.originY];
}

export function toWorld(view: View, s: readonly [number, number]): Point {
  return [(s[0] - view.originX) / view.scale, -(s[1] - view.originY) / scaleY(view)];
}

/** Zooms by `factor` keeping the world point under `screen` fixed (zoom to cursor). */
export function zoomAt(view: View, factor: number, screen: readonly [number, number]): View {
  const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, view.scale * factor));
  const [wx, wy] = toWorld(view, screen);
  const next = { ...view, scale };
  return { ...next, originX: screen[0] - wx * scale, originY: screen[1] + wy * scaleY(next) };
}

export function panBy(view: View, dx: number, dy: number): View {
  return { ...view, originX: view.originX + dx, originY: view.originY + dy };
}

/** The smallest box holding all points (a unit box at the origin for none). */
export function boundsOf(points: readonly (readonly [number, number])[]): Bounds {
  if (points.length === 0) return { minX: 0, minY: 0, maxX: 1, maxY: 0 };
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const [x, y] of points) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  return { minX, minY, maxX, maxY };
}

/**
 * A view showing `bounds` centred in `size` with `marginFraction` of the width or height left
 * free around it. A flat box (thin sections) is fitted by its width.
 */
export function fitView(bounds: Bounds, size: Size, marginFraction = 0.2, exaggeration = 1): View {
  const w = Math.max(bounds.maxX - bounds.minX, 1e-9);
  const h = Math.max((bounds.maxY - bounds.minY) * exaggeration, 1e-9);
  const usableW = Math.max(1, size.width * (1 - 2 * marginFraction));
  const usableH = Math.max(1, size.height * (1 - 2 * marginFraction));
  const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, Math.min(usableW / w, usableH / h)));
  const cx = (bounds.minX + bounds.maxX) / 2;
  const cy = (bounds.minY + bounds.maxY) / 2;
  const view: View = { scale, originX: size.width / 2 - cx * scale, originY: size.height / 2 + cy * scale * exaggeration };
  if (exaggeration !== 1) view.exaggeration = exaggeration;
  return view;
}

/**
 * The same view with another vertical exaggeration, keeping the world point at the middle of
 * the canvas (`centreY`, pixels) where it is.
 */
export function withExaggeration(view: View, exaggeration: number, centreY: number): View {
  const [, wy] = toWorld(view, [0, centreY]);
  const next: View = { scale: view.scale, originX: view.originX, originY: 0 };
  if (exaggeration !== 1) next.exaggeration = exaggeration;
  next.originY = centreY + wy * scaleY(next);
  return next;
}
