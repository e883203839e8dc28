import { scaleY, toScreen, toWorld, type Size, type View } from './view';
import { formatNumber } from '@shared/format/number';

/**
 * The body-axis grid in chord units: a "nice" spacing (1, 2 or 5 × 10^k chords) chosen so that
 * lines stay at least `minPixels` apart, every fifth line major, and a scale bar.
 */

/** Smallest "nice" step ≥ `minStep`. */
export function niceStep(minStep: number): number {
  if (!(minStep > 0) || !Number.isFinite(minStep)) return 1;
  const exp = Math.floor(Math.log10(minStep));
  const base = 10 ** exp;
  for (const m of [1, 2, 5, 10]) {
    const s = m * base;
    if (s >= minStep * (1 - 1e-12)) return Number(s.toPrecision(12));
  }
  return 10 * base;
}

/** Largest "nice" step (1, 2 or 5 × 10^k) ≤ `maxStep`. */
export function niceStepBelow(maxStep: number): number {
  if (!(maxStep > 0) || !Number.isFinite(maxStep)) return 1;
  const exp = Math.floor(Math.log10(maxStep));
  const base = 10 ** exp;
  for (const m of [5, 2, 1]) {
    const s = m * base;
    if (s <= maxStep * (1 + 1e-12)) return Number(s.toPrecision(12));
  }
  return Number(base.toPrecision(12));
}

/** Grid spacing along x in chord units for a view: lines at least `minPixels` apart. */
export function gridStepFor(view: View, minPixels = 18): number {
  return niceStep(minPixels / view.scale);
}

/** Grid spacing along y (finer than along x under a vertical exaggeration). */
export function gridStepYFor(view: View, minPixels = 18): number {
  return niceStep(minPixels / scaleY(view));
}

export interface GridLine {
  /** Screen coordinate of the line (x for vertical lines, y for horizontal). */
  at: number;
  /** World value (chord units) the line marks. */
  value: number;
  major: boolean;
  axis: boolean;
}

export interface Grid {
  step: number;
  stepY: number;
  vertical: GridLine[];
  horizontal: GridLine[];
}

/** Lines covering the visible area. */
export function gridLines(view: View, size: Size, minPixels = 18): Grid {
  const step = gridStepFor(view, minPixels);
  const stepY = gridStepYFor(view, minPixels);
  const [x0, y1] = toWorld(view, [0, 0]);
  const [x1, y0] = toWorld(view, [size.width, size.height]);
  const lines = (from: number, to: number, step: number, toPx: (v: number) => number): GridLine[] => {
    const out: GridLine[] = [];
    const first = Math.ceil(from / step);
    const last = Math.floor(to / step);
    for (let k = first; k <= last && out.length < 2000; k++) {
      const value = Number((k * step).toPrecision(12));
      out.push({ at: toPx(value), value, major: k % 5 === 0, axis: k === 0 });
    }
    return out;
  };
  return {
    step,
    stepY,
    vertical: lines(x0, x1, step, (v) => toScreen(view, [v, 0])[0]),
    horizontal: lines(y0, y1, stepY, (v) => toScreen(view, [0, v])[1]),
  };
}

export interface ScaleBar {
  /** Length in chord units. */
  length: number;
  /** Length on screen, pixels. */
  pixels: number;
  label: string;
}

/**
 * A scale bar of the longest nice length (1, 2 or 5 × 10^k chords) at most `targetPixels` long.
 * `chord` is the section's reference chord in drawing units: 1 for a section drawn to unit
 * chord, the chord in metres for one imported at its physical size — the bar counts chords
 * either way, like cl, cm and x/c.
 */
export function scaleBar(view: View, chord = 1, targetPixels = 100): ScaleBar {
  const unit = chord > 0 && Number.isFinite(chord) ? chord : 1;
  const length = niceStepBelow(targetPixels / (view.scale * unit));
  const pixels = length * unit * view.scale;
  return { length, pixels, label: `${formatLength(length)} c` };
}

function formatLength(v: number): string {
  return formatNumber(v, 6);
}
