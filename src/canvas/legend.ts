import { cpFromPressureRatio, pressureColourAt, type PressureDomain } from './colors';
import type { LegendMode } from './layers';
import { formatNumber } from '@shared/format/number';

export interface LegendModel {
  title: string;
  /** Colour stops for a horizontal gradient, t ∈ [0, 1] left to right. */
  stops: [number, string][];
  ticks: { t: number; label: string }[];
}

/**
 * The pressure legend: the colour gradient (log p/p∞ from left to right) and five ticks,
 * labelled in p/p∞ or in Cp at the free-stream Mach number. Same colours either way — Cp is
 * a monotone function of p/p∞.
 */
export function legendModel(domain: PressureDomain, mode: LegendMode, mach: number, gamma: number): LegendModel {
  const stops: [number, string][] = [];
  for (let i = 0; i <= 10; i++) stops.push([i / 10, pressureColourAt(i / 10)]);
  const lo = Math.log(domain.min);
  const hi = Math.log(domain.max);
  const ticks = [0, 0.25, 0.5, 0.75, 1].map((t) => {
    const p = Math.exp(lo + t * (hi - lo));
    const value = mode === 'cp' ? cpFromPressureRatio(p, mach, gamma) : p;
    return { t, label: formatNumber(Math.abs(value) < 1e-12 ? 0 : value, 3) };
  });
  return { title: mode === 'cp' ? 'Cp (line colour = pressure behind it)' : 'p/p∞ (line colour = pressure behind it)', stops, ticks };
}
