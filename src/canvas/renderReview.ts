import type { Point } from '@shared/model/sketch';
import { firstItem } from '@shared/util/invariant';
import type { DrawList, StrokePath, TextItem } from './drawPaths';
import { drawOrder, pinHead, PIN_HEAD_RADIUS_PX, type PinMarker } from './pins';
import { toScreen, type View } from './view';

/**
 * The review layer: pin markers and, while two snapshots are compared, their outlines. Colours
 * stay clear of the pressure scale (blue-green-yellow) and the amber of limit markers, and keep
 * at least 3:1 contrast with the canvas background ([C1], tested).
 */
export const PIN_OPEN = '#f472b6';
export const PIN_RESOLVED = '#8fa6ae';
export const PIN_SELECTED_RING = '#ffffff';
export const COMPARE_A = '#c4b5fd';
export const COMPARE_B = '#7dd3fc';
export const COMPARE_A_DASH_PX = [6, 4];

/** Two outlines to overlay: snapshot A (dashed) and B (solid), each labelled at its nose. */
export interface CompareOutlines {
  a: readonly Point[];
  b: readonly Point[];
  labelA: string;
  labelB: string;
}

/** Nose (min x) and chord (max x − min x) of an outline; null for an empty one. */
function noseAndChord(points: readonly Point[]): { nose: Point; chord: number } | null {
  let nose = points[0];
  if (!nose) return null;
  let maxX = -Infinity;
  for (const p of points) {
    if (p[0] < nose[0]) nose = p;
    maxX = Math.max(maxX, p[0]);
  }
  return { nose, chord: maxX - nose[0] };
}

/**
 * B's outline to overlay on A's: as drawn when both share a nose and a chord (two snapshots of
 * one sketch), else moved and scaled uniformly so that its nose and chord are A's — another
 * sketch may be drawn at another size or place, and what is compared is the shape.
 */
export function outlineOnto(a: readonly Point[], b: readonly Point[]): { points: Point[]; fitted: boolean } {
  const ra = noseAndChord(a);
  const rb = noseAndChord(b);
  // An empty outline (a sketch with no section yet) has no nose to fit to: shown as drawn.
  if (!ra || !rb) return { points: b.map((p) => [p[0], p[1]] as Point), fitted: false };
  const same = Math.abs(ra.chord - rb.chord) <= 1e-12 * Math.max(1, ra.chord) && ra.nose[0] === rb.nose[0] && ra.nose[1] === rb.nose[1];
  if (same || !(rb.chord > 0) || !(ra.chord > 0)) return { points: b.map((p) => [p[0], p[1]] as Point), fitted: false };
  const k = ra.chord / rb.chord;
  return { points: b.map(([x, y]) => [ra.nose[0] + (x - rb.nose[0]) * k, ra.nose[1] + (y - rb.nose[1]) * k] as Point), fitted: true };
}

function outline(points: readonly Point[], view: View, colour: string, dash?: number[]): StrokePath {
  return { points: points.flatMap((p) => toScreen(view, p)), colour, width: 2, dash, closed: true };
}

function noseLabel(points: readonly Point[], view: View, text: string, colour: string, dy: number): TextItem | null {
  if (points.length === 0) return null;
  const nose = points.reduce((best, p) => (p[0] < best[0] ? p : best), firstItem(points));
  const [x, y] = toScreen(view, nose);
  return { x: x - 10, y: y + dy, text, colour, font: "600 12px 'Work Sans', system-ui, sans-serif", align: 'right', baseline: 'middle' };
}

export function renderReview(markers: readonly PinMarker[], compare: CompareOutlines | null, view: View): DrawList {
  const list: DrawList = { paths: [], dots: [], texts: [] };
  if (compare) {
    list.paths.push(outline(compare.a, view, COMPARE_A, COMPARE_A_DASH_PX), outline(compare.b, view, COMPARE_B));
    for (const t of [noseLabel(compare.a, view, compare.labelA, COMPARE_A, -9), noseLabel(compare.b, view, compare.labelB, COMPARE_B, 9)]) if (t) list.texts!.push(t);
  }
  for (const m of drawOrder(markers)) {
    const [tx, ty] = toScreen(view, m.at);
    const [hx, hy] = pinHead(view, m.at);
    const colour = m.status === 'resolved' ? PIN_RESOLVED : PIN_OPEN;
    list.paths.push({ points: [tx, ty, hx, hy + PIN_HEAD_RADIUS_PX], colour, width: 1.5, dash: m.status === 'draft' ? [3, 2] : undefined });
    list.dots.push({ x: tx, y: ty, radius: 2.5, fill: colour });
    if (m.selected) list.dots.push({ x: hx, y: hy, radius: PIN_HEAD_RADIUS_PX + 3, fill: 'rgba(255, 255, 255, 0.12)', stroke: PIN_SELECTED_RING, strokeWidth: 1.5 });
    if (m.status === 'open') list.dots.push({ x: hx, y: hy, radius: PIN_HEAD_RADIUS_PX, fill: PIN_OPEN, stroke: '#111c22', strokeWidth: 1.5 });
    // Resolved: a hollow ring, so open pins stand out at a glance.
    else if (m.status === 'resolved') list.dots.push({ x: hx, y: hy, radius: PIN_HEAD_RADIUS_PX - 1, fill: '#111c22', stroke: PIN_RESOLVED, strokeWidth: 2 });
    else list.dots.push({ x: hx, y: hy, radius: PIN_HEAD_RADIUS_PX, fill: 'rgba(244, 114, 182, 0.35)', stroke: PIN_OPEN, strokeWidth: 1.5 });
  }
  return list;
}
