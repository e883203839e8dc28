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

/** The last result's domain: the scene, the worker's note to the page and the legend ask for the same one. */
let lastDomain: { result: SolveResult | null; domain: PressureDomain } | null = null;

/** The colour domain for a result (see `pressureDomain`). */
export function resultDomain(result: SolveResult | null): PressureDomain {
  if (lastDomain && lastDomain.result === result) return lastDomain.domain;
  const domain = pressureDomain(result ? resultPressures(result) : []);
  lastDomain = { result, domain };
  return domain;
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
 * Fan rays of one stream are drawn at least this far apart (screen pixels): a ray whose start
 * and end both lie within it of the last ray drawn in its stream is left out. Rays closer than
 * that cannot be told apart — a 200-vertex arc at the default zoom starts a ray about every
 * pixel, a solid sheet of hairlines that cost the software rasteriser ~2.5 ms a frame — and the
 * pressure field under them shows every ray's region all the same. Zoomed in, the rays move
 * apart and are all drawn again.
 */
export const FAN_RAY_GAP_PX = 3;
/** The gap while a drag moves the section ([DR6]): about half as many rays to rasterise per move. */
export const FAN_RAY_GAP_DRAG_PX = 6;

/**
 * The wave map as strokes: each shock, Mach line and slip line along its path, each fan as
 * its rays; every line coloured by the pressure behind it (a shock segment by segment, as it
 * weakens along the way; a fan ray by the pressure at that ray); the slip line dashed. Fan
 * rays closer than `rayGapPx` (FAN_RAY_GAP_PX; FAN_RAY_GAP_DRAG_PX during a drag) to the last
 * one drawn in their stream are left out.
 */
export function renderWaves(result: SolveResult | null, view: View, layers: LayerSettings, domain: PressureDomain, rayGapPx: number = FAN_RAY_GAP_PX): DrawList {
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
  // The last fan ray drawn in each stream (screen x0, y0, x1, y1), to leave out the ones beside it.
  const lastRay: Record<string, number[] | undefined> = {};
  for (const w of result.waves) {
    if (!waveVisible(w, layers)) continue;
    if (w.kind === 'fan' && w.rays && w.rays.length > 0) {
      w.rays.forEach((ray, k) => {
        const points = screen(wavePath(w, k));
        const last = lastRay[w.surface];
        if (last && besideRay(points, last, rayGapPx)) return;
        lastRay[w.surface] = [points[0] as number, points[1] as number, points[points.length - 2] as number, points[points.length - 1] as number];
        paths.push({ points, colour: pressureColour(ray.pRatio, domain), width: WAVE_WIDTH_PX.fan });
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

/**
 * A ray (flat screen points) that would be drawn beside the drawn ray `last` (x0, y0, x1, y1):
 * it starts within `gap` pixels of that ray and ends within them of that ray's line. (Its end
 * is compared with the line, not the drawn segment: rays of one stream that end on a shock run
 * nearly along it, so a neighbour a pixel away meets it further on — the shock is there.)
 */
function besideRay(points: readonly number[], last: readonly number[], gap: number): boolean {
  const [ax, ay, bx, by] = last as [number, number, number, number];
  const n = points.length;
  return (
    distanceToSegment(points[0] as number, points[1] as number, ax, ay, bx, by, true) < gap &&
    distanceToSegment(points[n - 2] as number, points[n - 1] as number, ax, ay, bx, by, false) < gap
  );
}

/** Distance from (px, py) to the segment (ax, ay)–(bx, by) (`clamp`), or to its line, pixels. */
function distanceToSegment(px: number, py: number, ax: number, ay: number, bx: number, by: number, clamp: boolean): number {
  const dx = bx - ax;
  const dy = by - ay;
  const length2 = dx * dx + dy * dy;
  const along = length2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / length2 : 0;
  const t = clamp ? Math.min(1, Math.max(0, along)) : along;
  return Math.hypot(px - (ax + t * dx), py - (ay + t * dy));
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
