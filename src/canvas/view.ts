import type { Point } from '@shared/model/sketch';

/**
 * The canvas view: body axes (x aft, y up, chord units) to screen pixels (y down).
 * screen = (x·scale + originX, −y·scale + originY). Pure functions; the component owns the ref.
 */
export interface View {
  /** Pixels per chord unit. */
  scale: number;
  originX: number;
  originY: number;
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
  return [p[0] * view.scale + view.originX, -p[1] * view.scale + view.originY];
}

export function toWorld(view: View, s: readonly [number, number]): Point {
  return [(s[0] - view.originX) / view.scale, -(s[1] - view.originY) / view.scale];
}

/** Zooms by `factor` keeping the world point under `screen` fixed (zoom to cursor). */
export function zoomAt(view: View, factor: number, screen: readonly [number, number]): View {
  const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, view.scale * factor));
  const [wx, wy] = toWorld(view, screen);
  return { scale, originX: screen[0] - wx * scale, originY: screen[1] + wy * scale };
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
export function fitView(bounds: Bounds, size: Size, marginFraction = 0.2): View {
  const w = Math.max(bounds.maxX - bounds.minX, 1e-9);
  const h = Math.max(bounds.maxY - bounds.minY, 1e-9);
  const usableW = Math.max(1, size.width * (1 - 2 * marginFraction));
  const usableH = Math.max(1, size.height * (1 - 2 * marginFraction));
  const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, Math.min(usableW / w, usableH / h)));
  const cx = (bounds.minX + bounds.maxX) / 2;
  const cy = (bounds.minY + bounds.maxY) / 2;
  return { scale, originX: size.width / 2 - cx * scale, originY: size.height / 2 + cy * scale };
}
