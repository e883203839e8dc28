import type { SolveResult, Wave } from '@shared/solver/types';
import { pressureColour, pressureDomain, type PressureDomain } from './colors';
import type { DrawList, StrokePath } from './drawPaths';
import type { LayerSettings } from './layers';
import { toScreen, type View } from './view';

/** Stroke widths in pixels: shocks read strongest, fan rays lighter, Mach lines thinnest. */
export const WAVE_WIDTH_PX = { shock: 1.8, fan: 1.1, mach: 0.9, slip: 1.4 } as const;
/** Dash pattern of the slip line, pixels. */
export const SLIP_DASH_PX = [7, 5];

/** Every pressure ratio the wave map and surfaces show (for the colour domain). */
export function resultPressures(result: SolveResult): number[] {
  const out: number[] = [];
  for (const w of result.waves) {
    out.push(w.pRatioBehind, w.upstream.pRatio, w.downstream.pRatio);
    for (const r of w.rays ?? []) out.push(r.pRatio);
  }
  for (const f of [...result.surfaces.upper, ...result.surfaces.lower]) if (f.pRatio !== null && f.pRatio > 0) out.push(f.pRatio); // a vacuum facet (p = 0) has no place on a log scale
  return out;
}

/** The colour domain for a result (see `pressureDomain`). */
export function resultDomain(result: SolveResult | null): PressureDomain {
  return pressureDomain(result ? resultPressures(result) : []);
}

export function waveVisible(w: Wave, layers: LayerSettings): boolean {
  switch (w.kind) {
    case 'shock':
      return layers.shocks;
    case 'fan':
      return layers.fans;
    case 'mach':
      return layers.machLines;
    case 'slip':
      return layers.slipLine;
  }
}

/**
 * The wave map as strokes: each shock, Mach line and slip line from origin to end, each fan
 * as its rays; every line coloured by the pressure behind it (a fan ray by the pressure at
 * that ray); the slip line dashed.
 */
export function renderWaves(result: SolveResult | null, view: View, layers: LayerSettings, domain: PressureDomain): DrawList {
  const paths: StrokePath[] = [];
  if (!result) return { paths, dots: [] };
  for (const w of result.waves) {
    if (!waveVisible(w, layers)) continue;
    const [ox, oy] = toScreen(view, w.origin);
    if (w.kind === 'fan' && w.rays && w.rays.length > 0) {
      for (const ray of w.rays) {
        const [ex, ey] = toScreen(view, ray.end);
        paths.push({ points: [ox, oy, ex, ey], colour: pressureColour(ray.pRatio, domain), width: WAVE_WIDTH_PX.fan });
      }
      continue;
    }
    const [ex, ey] = toScreen(view, w.end);
    const colour = pressureColour(w.pRatioBehind, domain);
    if (w.kind === 'slip') paths.push({ points: [ox, oy, ex, ey], colour, width: WAVE_WIDTH_PX.slip, dash: SLIP_DASH_PX });
    else if (w.kind === 'mach') paths.push({ points: [ox, oy, ex, ey], colour, width: WAVE_WIDTH_PX.mach, alpha: 0.85 });
    else paths.push({ points: [ox, oy, ex, ey], colour, width: WAVE_WIDTH_PX.shock });
  }
  return { paths, dots: [] };
}
