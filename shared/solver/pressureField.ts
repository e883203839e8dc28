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
 * states; slip lines do not (the pressure is the same on both sides). Along the line the
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
 * Cost: O(S) to build and O(S + c log c) per line for S path segments and c crossings. Edge
 * case: a result with no waves gives the free stream outside the section.
 *
 * Sources: the uniform regions between waves of the shock-expansion method (NACA Report 1135
 * for the states); the crossing count of a point-in-polygon test (common practice).
 */
export function pressureField(waves: readonly Wave[], outline: readonly (readonly [number, number])[]): PressureAlong {
  // Flat segment table: x0, y0, x1, y1, pressure on the left (looking along +x), on the right.
  const seg: number[] = [];
  const add = (a: Point, b: Point, family: 1 | -1, pAhead: number, pBehind: number): void => {
    if (a[1] === b[1]) return; // parallel to every row: never crossed
    // Looking along the segment a → b, the upstream flow is on the left for the upper
    // stream; the side toward −x is the left of a → b exactly when the segment rises.
    const leftOfSegmentAhead = family === 1;
    const rises = b[1] > a[1];
    const minusXIsAhead = rises === leftOfSegmentAhead;
    seg.push(a[0], a[1], b[0], b[1], minusXIsAhead ? pAhead : pBehind, minusXIsAhead ? pBehind : pAhead);
  };
  for (const w of waves) {
    if (w.kind === 'slip' || w.surface === 'trailingEdge') continue;
    const family = w.surface === 'upper' ? 1 : -1;
    if (w.kind === 'fan' && w.rays) {
      for (const ray of w.rays) {
        const path = ray.path ?? [w.origin, ray.end];
        const ahead = ray.pRatioAhead ?? ray.pRatio;
        for (let k = 0; k + 1 < path.length; k++) add(path[k] as Point, path[k + 1] as Point, family, ahead, ray.pRatio);
      }
      continue;
    }
    const path = w.path ?? [w.origin, w.end];
    for (let k = 0; k + 1 < path.length; k++) {
      const ahead = w.pRatioAheadAlong?.[k] ?? w.upstream.pRatio;
      const behind = w.pRatioBehindAlong?.[k] ?? w.downstream.pRatio;
      add(path[k] as Point, path[k + 1] as Point, family, ahead, behind);
    }
  }
  const n = seg.length / 6;
  const body = outline.map((p) => [p[0], p[1]] as const);

  return (y, xMin, xMax) => {
    // Crossings: x, kind (0 = wave, 1 = outline), pressure left, pressure right.
    const cx: number[] = [];
    const kind: number[] = [];
    const left: number[] = [];
    const right: number[] = [];
    for (let i = 0; i < n; i++) {
      const o = 6 * i;
      const y0 = seg[o + 1] as number;
      const y1 = seg[o + 3] as number;
      // Half-open in y, so a row through a path's vertex counts one of its two segments.
      if (!((y0 <= y && y < y1) || (y1 <= y && y < y0))) continue;
      const x0 = seg[o] as number;
      const x = x0 + (((seg[o + 2] as number) - x0) * (y - y0)) / (y1 - y0);
      cx.push(x);
      kind.push(0);
      left.push(seg[o + 4] as number);
      right.push(seg[o + 5] as number);
    }
    for (let i = 0; i < body.length; i++) {
      const a = body[i] as readonly [number, number];
      const b = body[(i + 1) % body.length] as readonly [number, number];
      if (!((a[1] <= y && y < b[1]) || (b[1] <= y && y < a[1]))) continue;
      cx.push(a[0] + ((b[0] - a[0]) * (y - a[1])) / (b[1] - a[1]));
      kind.push(1);
      left.push(0);
      right.push(0);
    }
    const order = cx.map((_, i) => i).sort((i, j) => (cx[i] as number) - (cx[j] as number));
    const x: number[] = [xMin];
    const p: (number | null)[] = [];
    let inside = false;
    let prev = -1; // index of the previous crossing
    let last = xMin;
    const stateBetween = (next: number): number | null => {
      if (inside) return null;
      if (prev >= 0 && kind[prev] === 0) return right[prev] as number;
      if (next >= 0 && kind[next] === 0) return left[next] as number;
      return 1;
    };
    for (let k = 0; k <= order.length; k++) {
      const i = k < order.length ? (order[k] as number) : -1;
      const at = i >= 0 ? Math.min(Math.max(cx[i] as number, xMin), xMax) : xMax;
      if (at > last) {
        const value = stateBetween(i);
        const lastP = p[p.length - 1];
        if (p.length > 0 && lastP === value) x[x.length - 1] = at;
        else {
          x.push(at);
          p.push(value);
        }
        last = at;
      }
      if (i >= 0) {
        if (kind[i] === 1) inside = !inside;
        prev = i;
      }
    }
    if (p.length === 0) {
      x.push(xMax);
      p.push(stateBetween(-1));
    }
    return { x, p };
  };
}
