import type { SolveResult } from '@shared/solver/types';
import { pressureField, type PressureAlong } from '@shared/solver/pressureField';
import { pressureColour, type PressureDomain } from './colors';
import type { DrawList, FillRect } from './drawPaths';
import { toScreen, toWorld, type Size, type View } from './view';

/** Height of one row of the pressure field, screen pixels (the fill is a stack of rows). */
export const FIELD_ROW_PX = 3;
/** Opacity of the field fill: the grid and the waves stay readable through it. */
export const FIELD_ALPHA = 0.3;

/** The last result's field function, kept so that a repaint with the same result (a pan, a
 *  hover) does not rebuild it. */
let cached: { result: SolveResult; outline: readonly (readonly [number, number])[]; along: PressureAlong; box: Box } | null = null;

interface Box {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

/**
 * The pressure field: the uniform regions between the waves filled by p/p∞ on the wave map's
 * colour scale, inside the field box the waves ran to (the extent of their paths), as rows of
 * FIELD_ROW_PX pixels. The free stream (p/p∞ = 1) and the section's inside stay unfilled.
 * Adjacent intervals of one colour are merged, and rectangles of one colour are filled in one
 * call (drawPaths), so a row costs a few fills however many waves it crosses.
 */
export function renderField(result: SolveResult | null, outline: readonly (readonly [number, number])[], view: View, size: Size, on: boolean, domain: PressureDomain): DrawList {
  if (!on || !result || result.waves.length === 0 || outline.length < 3) return { paths: [], dots: [] };
  if (!cached || cached.result !== result || cached.outline !== outline) {
    cached = { result, outline, along: pressureField(result.waves, outline), box: waveBox(result) };
  }
  const { along, box } = cached;
  const rects: FillRect[] = [];
  const [sx0, sTop] = toScreen(view, [box.minX, box.maxY]);
  const [sx1, sBottom] = toScreen(view, [box.maxX, box.minY]);
  const left = Math.max(0, Math.min(sx0, sx1));
  const right = Math.min(size.width, Math.max(sx0, sx1));
  const top = Math.max(0, Math.floor(Math.min(sTop, sBottom)));
  const bottom = Math.min(size.height, Math.ceil(Math.max(sTop, sBottom)));
  if (!(right > left) || !(bottom > top)) return { paths: [], dots: [] };
  const xMin = toWorld(view, [left, 0])[0];
  const xMax = toWorld(view, [right, 0])[0];
  for (let sy = top; sy < bottom; sy += FIELD_ROW_PX) {
    const h = Math.min(FIELD_ROW_PX, bottom - sy);
    const y = toWorld(view, [0, sy + h / 2])[1];
    const row = along(y, xMin, xMax);
    let runStart = -1;
    let runColour = '';
    let runEnd = 0;
    const flush = () => {
      if (runStart >= 0 && runEnd > runStart) rects.push({ x: runStart, y: sy, w: runEnd - runStart, h, fill: runColour });
      runStart = -1;
    };
    for (let k = 0; k < row.p.length; k++) {
      const p = row.p[k];
      const a = toScreen(view, [row.x[k] as number, y])[0];
      const b = toScreen(view, [row.x[k + 1] as number, y])[0];
      if (p === null || p === undefined || p === 1) {
        flush();
        continue;
      }
      const colour = pressureColour(p, domain);
      if (runStart >= 0 && colour === runColour) {
        runEnd = b;
        continue;
      }
      flush();
      runStart = a;
      runEnd = b;
      runColour = colour;
    }
    flush();
  }
  return { rects, rectAlpha: FIELD_ALPHA, paths: [], dots: [] };
}

/** The field box: the extent of the waves' paths (they end on it). */
function waveBox(result: SolveResult): Box {
  const box = { minX: Infinity, maxX: -Infinity, minY: Infinity, maxY: -Infinity };
  const take = (p: readonly [number, number]) => {
    if (p[0] < box.minX) box.minX = p[0];
    if (p[0] > box.maxX) box.maxX = p[0];
    if (p[1] < box.minY) box.minY = p[1];
    if (p[1] > box.maxY) box.maxY = p[1];
  };
  for (const w of result.waves) {
    take(w.origin);
    take(w.end);
    for (const r of w.rays ?? []) take(r.end);
  }
  return box;
}
