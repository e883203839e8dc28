import { cpFromPressureRatio, pressureColourAt, type PressureDomain } from './colors';
import type { LegendMode } from './layers';
import { formatNumber } from '@shared/format/number';

/** Width of the legend's colour bar on the canvas, pixels. */
export const LEGEND_BAR_PX = 220;
/** Font size of the tick labels (CANVAS_FONT), pixels. */
export const LEGEND_LABEL_PX = 11;
/** Least clear space between two tick labels, pixels. */
export const LEGEND_LABEL_GAP_PX = 8;

export interface LegendTick {
  /** Position along the bar, 0 … 1 left to right. */
  t: number;
  label: string;
  align: 'left' | 'center' | 'right';
  /** The label's box along the bar (an upper bound of its drawn width), pixels from the bar's left end. */
  left: number;
  right: number;
}

export interface LegendModel {
  title: string;
  /** Colour stops for a horizontal gradient, t ∈ [0, 1] left to right. */
  stops: [number, string][];
  ticks: LegendTick[];
}

/**
 * Upper bound of a label's width in the canvas font (Work Sans, 11 px), from per-character
 * widths in em rounded up. Measured with canvas measureText in Chromium (2026-12-03): digits
 * 0.39–0.62 em, "−" and "×" 0.60, "." and "," 0.27, space 0.34, superscript digits 0.24–0.40
 * and "⁻" 0.53 and "≤" 0.84 (both from the fallback font).
 */
export function labelWidthPx(text: string, sizePx = LEGEND_LABEL_PX): number {
  let em = 0;
  for (const c of text) {
    if (c === '.' || c === ',') em += 0.3;
    else if (c === ' ') em += 0.36;
    else if ('⁰¹²³⁴⁵⁶⁷⁸⁹'.includes(c)) em += 0.45;
    else if (c === '⁻') em += 0.6;
    else if (c === '≤') em += 0.9;
    else em += 0.68;
  }
  return Math.ceil(em * sizePx);
}

/**
 * The pressure legend: the colour gradient (log p/p∞ from left to right) and its tick labels,
 * in p/p∞ or in Cp at the free-stream Mach number — the same colours either way, Cp being a
 * monotone function of p/p∞. The two ends are always labelled (the low end "≤" when lower
 * pressures take its colour, `PressureDomain.below`); free stream (1, or Cp 0) next, then the
 * middle and the quarters, each only where its label keeps `LEGEND_LABEL_GAP_PX` clear of every
 * label already placed and says something no other label says.
 */
export function legendModel(domain: PressureDomain, mode: LegendMode, mach: number, gamma: number, barPx = LEGEND_BAR_PX): LegendModel {
  const stops: [number, string][] = [];
  for (let i = 0; i <= 10; i++) stops.push([i / 10, pressureColourAt(i / 10)]);
  const lo = Math.log(domain.min);
  const hi = Math.log(domain.max);
  const label = (t: number): string => {
    const p = Math.exp(lo + t * (hi - lo));
    const value = mode === 'cp' ? cpFromPressureRatio(p, mach, gamma) : p;
    return formatNumber(Math.abs(value) < 1e-12 ? 0 : value, 3);
  };
  const candidates: { t: number; label: string }[] = [
    { t: 0, label: (domain.below ? '≤ ' : '') + label(0) },
    { t: 1, label: label(1) },
  ];
  if (hi > lo && lo < 0 && hi > 0) candidates.push({ t: -lo / (hi - lo), label: mode === 'cp' ? '0' : '1' });
  for (const t of [0.5, 0.25, 0.75]) candidates.push({ t, label: label(t) });
  const ticks: LegendTick[] = [];
  for (const [i, c] of candidates.entries()) {
    const w = labelWidthPx(c.label);
    const x = c.t * barPx;
    const align = c.t === 0 ? 'left' : c.t === 1 ? 'right' : 'center';
    const left = align === 'left' ? x : align === 'right' ? x - w : x - w / 2;
    const tick: LegendTick = { t: c.t, label: c.label, align, left, right: left + w };
    const end = i < 2;
    if (!end) {
      if (tick.left < 0 || tick.right > barPx) continue;
      if (ticks.some((k) => k.label === tick.label || (tick.left < k.right + LEGEND_LABEL_GAP_PX && k.left < tick.right + LEGEND_LABEL_GAP_PX))) continue;
    }
    ticks.push(tick);
  }
  ticks.sort((a, b) => a.t - b.t);
  return { title: mode === 'cp' ? 'Cp (line colour = pressure behind it)' : 'p/p∞ (line colour = pressure behind it)', stops, ticks };
}
