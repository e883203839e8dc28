import type { SolveResult } from '@shared/solver/types';
import { pressureSteps } from '@shared/solver/pressureField';
import { PRESSURE_COLOUR_STEPS, pressureColourWords, type PressureDomain } from './colors';
import type { DrawList } from './drawPaths';
import { toScreen, toWorld, type Size, type View } from './view';

/** Height of one row of the pressure field, screen pixels (the fill is a stack of rows). */
export const FIELD_ROW_PX = 3;
/** The rows' height while a drag moves the section ([DR6]): half the rows to read per move. */
export const FIELD_ROW_DRAG_PX = 6;
/** Opacity of the field fill: the grid and the waves stay readable through it. */
export const FIELD_ALPHA = 0.3;

/** The last field drawn and what it was drawn from, so that a repaint of the same result in
 *  the same view (a hover, a selection) reuses it. */
let cached: { result: SolveResult; outline: readonly (readonly [number, number])[]; view: View; size: Size; domain: PressureDomain; rowPx: number; list: DrawList } | null = null;

interface Box {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

const EMPTY: DrawList = { paths: [], dots: [] };

/**
 * The pressure field: the uniform regions between the waves filled by p/p∞ on the wave map's
 * colour scale, inside the field box the waves ran to (the extent of their paths), as rows of
 * FIELD_ROW_PX pixels. The free stream (p/p∞ = 1) and the section's inside stay unfilled.
 * The rows are read together (`pressureSteps`, a scanline) straight into a picture of one pixel
 * per column and row (`RowImage`), drawn stretched in one call: no rectangle per step.
 *
 * The list is meant to be drawn at once (as the scene painter does): the next call that builds
 * a field for other inputs writes its picture into the same pixel buffer when the sizes match,
 * so that a drag does not allocate (and the garbage collector sweep) a buffer of the canvas's
 * size per move.
 */
export function renderField(result: SolveResult | null, outline: readonly (readonly [number, number])[], view: View, size: Size, on: boolean, domain: PressureDomain, rowPx: number = FIELD_ROW_PX): DrawList {
  if (!on || !result || result.waves.length === 0 || outline.length < 3) return EMPTY;
  const c = cached;
  if (c && c.result === result && c.outline === outline && c.rowPx === rowPx && sameView(c.view, view) && c.size.width === size.width && c.size.height === size.height && c.domain.min === domain.min && c.domain.max === domain.max) return c.list;
  const list = fieldRows(result, outline, view, size, domain, rowPx, c?.list.image?.pixels ?? null);
  cached = { result, outline, view: { ...view }, size: { ...size }, domain: { ...domain }, rowPx, list };
  return list;
}

function sameView(a: View, b: View): boolean {
  return a.scale === b.scale && a.originX === b.originX && a.originY === b.originY && (a.exaggeration ?? 1) === (b.exaggeration ?? 1);
}

function fieldRows(result: SolveResult, outline: readonly (readonly [number, number])[], view: View, size: Size, domain: PressureDomain, rowPx: number, spare: Uint8ClampedArray<ArrayBuffer> | null): DrawList {
  const box = waveBox(result);
  const [sx0, sTop] = toScreen(view, [box.minX, box.maxY]);
  const [sx1, sBottom] = toScreen(view, [box.maxX, box.minY]);
  const left = Math.max(0, Math.min(sx0, sx1));
  const right = Math.min(size.width, Math.max(sx0, sx1));
  const top = Math.max(0, Math.floor(Math.min(sTop, sBottom)));
  const bottom = Math.min(size.height, Math.ceil(Math.max(sTop, sBottom)));
  if (!(right > left) || !(bottom > top)) return EMPTY;
  const xMin = toWorld(view, [left, 0])[0];
  const xMax = toWorld(view, [right, 0])[0];
  const ys: number[] = [];
  for (let sy = top; sy < bottom; sy += rowPx) ys.push(toWorld(view, [0, sy + Math.min(rowPx, bottom - sy) / 2])[1]);
  // One pixel per column and per row; a step [x0, x1) fills the columns whose centres it holds.
  const imageX = Math.floor(left);
  const width = Math.ceil(right) - imageX;
  const length = width * ys.length * 4;
  const pixels = spare && spare.length === length ? spare.fill(0) : new Uint8ClampedArray(length);
  const words = new Uint32Array(pixels.buffer);
  const colourWords = pressureColourWords();
  const { scale, originX } = view;
  // A pressure's colour is its place on the scale (as pressureColour, without a string), worked
  // out once per wave side (pressureSteps' classes); the free stream is not filled (−1).
  const lo = Math.log(domain.min);
  const span = Math.log(domain.max) - lo;
  const last = PRESSURE_COLOUR_STEPS - 1;
  const colourIndex = (p: number) => (p === 1 ? -1 : p > 0 ? Math.round(Math.min(1, Math.max(0, span > 0 ? (Math.log(p) - lo) / span : 0.5)) * last) : 0);
  const column = (x: number) => Math.min(width, Math.max(0, Math.round(x * scale + originX) - imageX));
  // Steps of one colour next to each other on a row are filled as one run (steps are contiguous).
  let runRow = -1;
  let runIndex = -1; // −1: not filled
  let runFrom = 0;
  let runTo = 0;
  const flush = () => {
    if (runIndex < 0) return;
    const start = runRow * width;
    const word = colourWords[runIndex] as number;
    // A plain loop: most runs are a few pixels long, shorter than a fill call's overhead.
    for (let i = start + column(runFrom), end = start + column(runTo); i < end; i++) words[i] = word;
  };
  pressureSteps(
    result.waves,
    outline,
    ys,
    xMin,
    xMax,
    (row, x0, x1, _p, index) => {
      if (row === runRow && index === runIndex) {
        runTo = x1;
        return;
      }
      flush();
      runRow = row;
      runIndex = index;
      runFrom = x0;
      runTo = x1;
    },
    colourIndex,
  );
  flush();
  return { image: { x: imageX, y: top, width, height: bottom - top, rows: ys.length, rowHeight: rowPx, alpha: FIELD_ALPHA, pixels }, paths: [], dots: [] };
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
