import { present } from '../util/invariant.ts';
import type { Point, Wave } from './types';

/**
 * p/p∞ along a horizontal line y = const, as steps: interval k runs from `x[k]` to `x[k + 1]`
 * with the uniform pressure `p[k]` (null inside the section). `x` has one more entry than `p`.
 */
export interface PressureProfile {
  x: number[];
  p: (number | null)[];
}

/** The pressure along any horizontal line between xMin and xMax (xMin < xMax). */
export type PressureAlong = (y: number, xMin: number, xMax: number) => PressureProfile;

/**
 * The uniform regions of a wave map, read along horizontal lines: builds, once per result,
 * the function that gives p/p∞ along y = const (a pressure signature, or one row of the
 * pressure field drawn on the canvas).
 *
 * Every wave line (fan rays, shocks and Mach lines along their paths) separates two uniform
 * states; slip lines do not (the pressure is the same on both sides), nor does a line that
 * carries no change (a fan's head ray, a Mach line: the same p on both sides). Those are left
 * out: about a quarter of a finely faceted section's lines, whose crossings every row of the
 * canvas's field would otherwise sort and walk. Along the line the
 * crossings are taken in order of x: between two crossings the pressure is the one behind
 * the previous wave, or, after leaving the section or before the first wave, the one ahead
 * of the next wave; with no wave at all, the free stream (1). Which side of a segment is
 * "ahead" follows from its stream: upper-stream waves have the upstream flow on their left
 * (looking from origin to end), lower-stream ones on their right. The section outline
 * (`outline`, closed) marks the inside (null).
 *
 * Where the wave map neglects a reflected wave (interactWaves), the pressures just behind a
 * bent shock and just ahead of the next ray differ slightly; the profile takes the one behind
 * the nearer wave upstream, so each step sits on a wave.
 *
 * Cost: O(S) to build and O(S + c log c) per line for S path segments and c crossings (many
 * lines at once: `pressureRows`). Edge case: a result with no waves gives the free stream
 * outside the section.
 *
 * Sources: the uniform regions between waves of the shock-expansion method (NACA Report 1135
 * for the states); the crossing count of a point-in-polygon test (common practice).
 */
export function pressureField(waves: readonly Wave[], outline: readonly (readonly [number, number])[]): PressureAlong {
  const table = segmentTable(waves, outline);
  return (y, xMin, xMax) => profileAcross(table, y, xMin, xMax);
}

/**
 * The same profiles as `pressureField(waves, outline)(y, xMin, xMax)` for each y of `ys`, equal
 * to them value for value, in the order of `ys` (collected from `pressureSteps`).
 */
export function pressureRows(waves: readonly Wave[], outline: readonly (readonly [number, number])[], ys: readonly number[], xMin: number, xMax: number): PressureProfile[] {
  const out: PressureProfile[] = ys.map(() => ({ x: [xMin], p: [] }));
  pressureSteps(waves, outline, ys, xMin, xMax, (row, _x0, x1, p) => {
    const profile = present(out[row], row, out);
    profile.x.push(x1);
    profile.p.push(p);
  });
  return out;
}

/**
 * Called for each step of a row, left to right: the row's index in `ys`, where the step starts
 * and ends, its p/p∞ (null inside the section) and the class of that p (`PressureClass`; −1
 * inside the section). Consecutive steps of a row differ in p, not always in class.
 */
export type PressureStep = (row: number, x0: number, x1: number, p: number | null, pClass: number) => void;

/**
 * A caller's class of a pressure ratio (an integer, e.g. its colour on a scale), worked out
 * once per wave segment side rather than once per step: many steps share one wave's pressure.
 */
export type PressureClass = (p: number) => number;

/**
 * The steps of `pressureField(waves, outline)` along many horizontal lines at once (the
 * pressure field's rows on the canvas), handed to `step` one by one, lowest row first, without
 * building a profile per row.
 *
 * A scanline: the rows are read from the lowest up, keeping the segments that cross the
 * current row (y0 ≤ y < y1, as `pressureField` counts them) in order of where they cross it.
 * From one row to the next the segments still crossing keep their order except where two pass
 * each other (re-sorted by insertion, nearly free), and the few that start are sorted and
 * merged in. Ties in x are ordered by table position, as `pressureField`'s stable sort does, so
 * the steps are exactly `pressureField`'s. Cost: O(S log S) to order the S segments by height,
 * then about O(c) per row for c crossings (instead of O(S + c log c) per row).
 */
export function pressureSteps(
  waves: readonly Wave[],
  outline: readonly (readonly [number, number])[],
  ys: readonly number[],
  xMin: number,
  xMax: number,
  step: PressureStep,
  classOf: PressureClass = noClass,
): void {
  const table = segmentTable(waves, outline, classOf);
  const { seg, count } = table;
  const rowOrder = Array.from({ length: ys.length }, (_, i) => i).sort((i, j) => present(ys[i], i, ys) - present(ys[j], j, ys));
  const low = new Float64Array(count);
  const high = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const y0 = present(seg[SEG_STRIDE * i + 1], SEG_STRIDE * i + 1, seg);
    const y1 = present(seg[SEG_STRIDE * i + 3], SEG_STRIDE * i + 3, seg);
    low[i] = Math.min(y0, y1);
    high[i] = Math.max(y0, y1);
  }
  const byLow = Array.from({ length: count }, (_, i) => i).sort((i, j) => present(low[i], i, low) - present(low[j], j, low));
  // The crossings of the current row in order (segment, x); the next row re-sorts the ones
  // still crossing into `kept…` and the ones starting into `enter…`, and merges both back.
  const order = new Int32Array(count);
  const cx = new Float64Array(count);
  const keptOrder = new Int32Array(count);
  const keptX = new Float64Array(count);
  const enter = new Int32Array(count);
  const enterX = new Float64Array(count);
  let n = 0;
  let next = 0; // the next segment of byLow to enter
  for (const r of rowOrder) {
    const y = present(ys[r], r, ys);
    // The segments still crossing, with their x on this row, re-sorted by insertion.
    let kept = 0;
    for (let k = 0; k < n; k++) {
      const i = present(order[k], k, order);
      if (!(y < present(high[i], i, high))) continue;
      const x = crossX(seg, i, y);
      let j = kept - 1;
      while (j >= 0 && before(x, i, present(keptX[j], j, keptX), present(keptOrder[j], j, keptOrder))) {
        keptOrder[j + 1] = present(keptOrder[j], j, keptOrder);
        keptX[j + 1] = present(keptX[j], j, keptX);
        j -= 1;
      }
      keptOrder[j + 1] = i;
      keptX[j + 1] = x;
      kept += 1;
    }
    // The segments starting at or below this row and still crossing it, sorted by insertion.
    let entering = 0;
    while (next < count) {
      const i = present(byLow[next], next, byLow);
      if (!(present(low[i], i, low) <= y)) break;
      next += 1;
      if (!(y < present(high[i], i, high))) continue;
      const x = crossX(seg, i, y);
      let j = entering - 1;
      while (j >= 0 && before(x, i, present(enterX[j], j, enterX), present(enter[j], j, enter))) {
        enter[j + 1] = present(enter[j], j, enter);
        enterX[j + 1] = present(enterX[j], j, enterX);
        j -= 1;
      }
      enter[j + 1] = i;
      enterX[j + 1] = x;
      entering += 1;
    }
    // Both merged into `order`: this row's crossings in order.
    n = kept + entering;
    let a = 0;
    let b = 0;
    for (let k = 0; k < n; k++) {
      if (a < kept && (b >= entering || before(present(keptX[a], a, keptX), present(keptOrder[a], a, keptOrder), present(enterX[b], b, enterX), present(enter[b], b, enter)))) {
        order[k] = present(keptOrder[a], a, keptOrder);
        cx[k] = present(keptX[a], a, keptX);
        a += 1;
      } else {
        order[k] = present(enter[b], b, enter);
        cx[k] = present(enterX[b], b, enterX);
        b += 1;
      }
    }
    stepsOfSorted(table, order, cx, n, xMin, xMax, r, step);
  }
}

/** Where segment `i` crosses the line at height y (y0 ≤ y < y1 or y1 ≤ y < y0). */
function crossX(seg: readonly number[], i: number, y: number): number {
  const o = SEG_STRIDE * i;
  const x0 = present(seg[o], o, seg);
  const y0 = present(seg[o + 1], o + 1, seg);
  return x0 + ((present(seg[o + 2], o + 2, seg) - x0) * (y - y0)) / (present(seg[o + 3], o + 3, seg) - y0);
}

/** Crossing (xa, segment a) comes before (xb, b): by x, then by table position. */
function before(xa: number, a: number, xb: number, b: number): boolean {
  return xa < xb || (xa === xb && a < b);
}

/**
 * Every wave and outline segment in one flat table, SEG_STRIDE numbers each: x0, y0, x1, y1,
 * the pressure on the −x side and on the +x side, the kind (0 = wave, 1 = outline), and the
 * caller's class of each of the two pressures (`PressureClass`). The waves come first, in the
 * order of the result, then the outline's edges.
 */
interface SegmentTable {
  seg: number[];
  count: number;
  freeStreamClass: number;
}

const noClass: PressureClass = () => 0;

const SEG_STRIDE = 9;

function segmentTable(waves: readonly Wave[], outline: readonly (readonly [number, number])[], classOf: PressureClass = noClass): SegmentTable {
  const seg: number[] = [];
  const add = (a: Point, b: Point, family: 1 | -1, pAhead: number, pBehind: number): void => {
    if (a[1] === b[1]) return; // parallel to every row: never crossed
    // A line that carries no change (a fan's head ray, a Mach line) separates nothing.
    if (pAhead === pBehind) return;
    // Looking along the segment a → b, the upstream flow is on the left for the upper
    // stream; the side toward −x is the left of a → b exactly when the segment rises.
    const leftOfSegmentAhead = family === 1;
    const rises = b[1] > a[1];
    const minusXIsAhead = rises === leftOfSegmentAhead;
    const pLeft = minusXIsAhead ? pAhead : pBehind;
    const pRight = minusXIsAhead ? pBehind : pAhead;
    seg.push(a[0], a[1], b[0], b[1], pLeft, pRight, 0, classOf(pLeft), classOf(pRight));
  };
  for (const w of waves) {
    if (w.kind === 'slip' || w.surface === 'trailingEdge') continue;
    const family = w.surface === 'upper' ? 1 : -1;
    if (w.kind === 'fan' && w.rays) {
      for (const ray of w.rays) {
        const path = ray.path ?? [w.origin, ray.end];
        const ahead = ray.pRatioAhead ?? ray.pRatio;
        for (let k = 0; k + 1 < path.length; k++) add(present(path[k], k, path), present(path[k + 1], k + 1, path), family, ahead, ray.pRatio);
      }
      continue;
    }
    const path = w.path ?? [w.origin, w.end];
    for (let k = 0; k + 1 < path.length; k++) {
      const ahead = w.pRatioAheadAlong?.[k] ?? w.upstream.pRatio;
      const behind = w.pRatioBehindAlong?.[k] ?? w.downstream.pRatio;
      add(present(path[k], k, path), present(path[k + 1], k + 1, path), family, ahead, behind);
    }
  }
  // The outline (closed) marks the inside; its horizontal edges are never crossed.
  for (let i = 0; i < outline.length; i++) {
    const j = i + 1 === outline.length ? 0 : i + 1; // the closing edge runs back to vertex 0
    const a = present(outline[i], i, outline);
    const b = present(outline[j], j, outline);
    if (a[1] === b[1]) continue;
    seg.push(a[0], a[1], b[0], b[1], 0, 0, 1, 0, 0);
  }
  return { seg, count: seg.length / SEG_STRIDE, freeStreamClass: classOf(1) };
}

/** The profile along y = const, from every segment of the table. */
function profileAcross(table: SegmentTable, y: number, xMin: number, xMax: number): PressureProfile {
  const { seg, count } = table;
  const crossing: number[] = [];
  const cx: number[] = [];
  for (let i = 0; i < count; i++) {
    const o = SEG_STRIDE * i;
    const y0 = present(seg[o + 1], o + 1, seg);
    const y1 = present(seg[o + 3], o + 3, seg);
    // Half-open in y, so a row through a path's vertex counts one of its two segments.
    if (!((y0 <= y && y < y1) || (y1 <= y && y < y0))) continue;
    const x0 = present(seg[o], o, seg);
    crossing.push(i);
    cx.push(x0 + ((present(seg[o + 2], o + 2, seg) - x0) * (y - y0)) / (y1 - y0));
  }
  // A stable sort: crossings at the same x keep the table's order.
  const order = cx.map((_, k) => k).sort((a, b) => present(cx[a], a, cx) - present(cx[b], b, cx));
  const x: number[] = [xMin];
  const p: (number | null)[] = [];
  stepsOfSorted(
    table,
    order.map((k) => present(crossing[k], k, crossing)),
    order.map((k) => present(cx[k], k, cx)),
    order.length,
    xMin,
    xMax,
    0,
    (_row, _x0, x1, value) => {
      x.push(x1);
      p.push(value);
    },
  );
  return { x, p };
}

/**
 * The steps along a line from its first `n` crossings in order of x: `order` holds their
 * segments (table indices) and `cx` where each crosses the line. Steps of equal p are joined;
 * crossings outside [xMin, xMax] count at its ends.
 */
function stepsOfSorted(table: SegmentTable, order: ArrayLike<number>, cx: ArrayLike<number>, n: number, xMin: number, xMax: number, row: number, step: PressureStep): void {
  const { seg, freeStreamClass } = table;
  let inside = false;
  let prev = -1; // table offset of the previous crossing's segment
  let last = xMin;
  // The step being built (handed on when the next one differs in p): its p is read from the
  // table at `slot` (with its class 3 further on), or is the free stream (FREE) or the inside (INSIDE).
  let open = false;
  let from = xMin;
  let to = xMin;
  let slot = FREE;
  let value: number | null = null;
  const emit = () => step(row, from, to, value, slot === INSIDE ? -1 : slot === FREE ? freeStreamClass : present(seg[slot + 3], slot + 3, seg));
  for (let k = 0; k <= n; k++) {
    const o = k < n ? SEG_STRIDE * present(order[k], k, order) : -1;
    const at = o >= 0 ? Math.min(Math.max(present(cx[k], k, cx), xMin), xMax) : xMax;
    if (at > last) {
      // Behind the previous wave; after leaving the section or before any wave, ahead of the next.
      const here = inside ? INSIDE : prev >= 0 && seg[prev + 6] === 0 ? prev + 5 : o >= 0 && seg[o + 6] === 0 ? o + 4 : FREE;
      const hereValue = here === INSIDE ? null : here === FREE ? 1 : present(seg[here], here, seg);
      if (open && hereValue === value) to = at;
      else {
        if (open) emit();
        open = true;
        from = last;
        to = at;
        slot = here;
        value = hereValue;
      }
      last = at;
    }
    if (o >= 0) {
      if (seg[o + 6] === 1) inside = !inside;
      prev = o;
    }
  }
  if (!open) {
    from = xMin;
    to = xMax;
    slot = inside ? INSIDE : prev >= 0 && seg[prev + 6] === 0 ? prev + 5 : FREE;
    value = slot === INSIDE ? null : slot === FREE ? 1 : present(seg[slot], slot, seg);
  }
  emit();
}

/** `stepsOfSorted`'s slots for the free stream and the inside of the section. */
const FREE = -1;
const INSIDE = -2;
