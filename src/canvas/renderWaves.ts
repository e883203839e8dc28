import type { Point, SolveResult, Wave } from '@shared/solver/types';
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
 * The drawn line of a wave (or of one fan ray): its `path`, or origin → end for a result stored
 * before waves had paths.
 */
export function wavePath(w: Wave, ray?: number): readonly Point[] {
  const r = ray === undefined ? undefined : w.rays?.[ray];
  if (r) return r.path ?? [w.origin, r.end];
  return w.path ?? [w.origin, w.end];
}

/**
 * The wave map as strokes: each shock, Mach line and slip line along its path, each fan as
 * its rays; every line coloured by the pressure behind it (a shock segment by segment, as it
 * weakens along the way; a fan ray by the pressure at that ray); the slip line dashed.
 */
export function renderWaves(result: SolveResult | null, view: View, layers: LayerSettings, domain: PressureDomain): DrawList {
  const paths: StrokePath[] = [];
  if (!result) return { paths, dots: [] };
  const screen = (pts: readonly Point[]): number[] => {
    const out: number[] = [];
    for (const p of pts) {
      const [x, y] = toScreen(view, p);
      out.push(x, y);
    }
    return out;
  };
  for (const w of result.waves) {
    if (!waveVisible(w, layers)) continue;
    if (w.kind === 'fan' && w.rays && w.rays.length > 0) {
      w.rays.forEach((ray, k) => {
        paths.push({ points: screen(wavePath(w, k)), colour: pressureColour(ray.pRatio, domain), width: WAVE_WIDTH_PX.fan });
      });
      continue;
    }
    const pts = wavePath(w);
    const colour = pressureColour(w.pRatioBehind, domain);
    if (w.kind === 'slip') paths.push({ points: screen(pts), colour, width: WAVE_WIDTH_PX.slip, dash: SLIP_DASH_PX });
    else if (w.kind === 'mach') paths.push({ points: screen(pts), colour, width: WAVE_WIDTH_PX.mach, alpha: 0.85 });
    else {
      const behind = w.pRatioBehindAlong;
      if (!behind || behind.length !== pts.length - 1) {
        paths.push({ points: screen(pts), colour, width: WAVE_WIDTH_PX.shock });
        continue;
      }
      // One stroke per run of segments of one colour (a shock weakens step by step).
      const xy = screen(pts);
      let from = 0;
      for (let k = 1; k <= behind.length; k++) {
        const c = pressureColour(behind[from] as number, domain);
        if (k < behind.length && pressureColour(behind[k] as number, domain) === c) continue;
        paths.push({ points: xy.slice(2 * from, 2 * k + 2), colour: c, width: WAVE_WIDTH_PX.shock });
        from = k;
      }
    }
  }
  return { paths, dots: [] };
}

/** Meeting marks: light specks where a ray ended on a shock, rings where two shocks merged
 *  and where waves crossed. Radii in screen pixels. */
export const MEETING_STYLE = {
  absorbed: { radius: 1.6, fill: 'rgba(233, 241, 242, 0.55)' },
  merged: { radius: 3.2, fill: '#ffffff', stroke: '#0c1418' },
  crossed: { radius: 2.6, fill: '#5fd0c4', stroke: '#0c1418' },
} as const;

/** Where the waves meet (absorbed rays, merged shocks, crossings), on screen only. */
export function renderMeetings(result: SolveResult | null, view: View, size: { width: number; height: number }, on: boolean): DrawList {
  const dots: DrawList['dots'] = [];
  if (!on || !result) return { paths: [], dots };
  for (const m of result.intersections) {
    const [x, y] = toScreen(view, m.at);
    if (x < -4 || y < -4 || x > size.width + 4 || y > size.height + 4) continue;
    const style = MEETING_STYLE[m.kind ?? 'absorbed'];
    dots.push({ x, y, radius: style.radius, fill: style.fill, stroke: 'stroke' in style ? style.stroke : undefined, strokeWidth: 1 });
  }
  return { paths: [], dots };
}
