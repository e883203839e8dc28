/**
 * Where the limit callouts go on the canvas. Invariants (tests cite them):
 *
 * - [L1] Callouts never overlap each other (a gap of `gap` pixels at least between any two).
 * - [L2] No callout covers any limit's ring (its vertex), its own or another's.
 * - [L3] Every callout lies wholly inside the canvas (with `margin`).
 * - [L4] Each limit gets a callout or is counted in `hidden` (then listed in the results panel):
 *   placed + hidden = limits. A callout away from its ring gets a leader line to it.
 *
 * Greedy, in the limits' order: for each, the first free box among the places beside the ring
 * (above right, above left, below right, below left), then the same places stacked outwards,
 * then any free slot of a grid over the canvas, nearest the ring first.
 */

export interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

export interface LabelPlacement {
  box: Box;
  /** From the box's nearest edge point to the ring, when the box is not beside its ring. */
  leader: [number, number, number, number] | null;
}

export interface LayoutOptions {
  width: number;
  height: number;
  labelWidth: number;
  labelHeight: number;
  /** Radius kept clear around each anchor (the ring and its stroke), pixels. */
  ringRadius: number;
  gap: number;
  margin: number;
}

/** Distance from a ring within which a callout counts as beside it (no leader line). */
const BESIDE_PX = 40;

export function boxesOverlap(a: Box, b: Box, gap = 0): boolean {
  return a.x < b.x + b.w + gap && b.x < a.x + a.w + gap && a.y < b.y + b.h + gap && b.y < a.y + a.h + gap;
}

/** The point of `box` nearest to (x, y). */
export function nearestOnBox(box: Box, x: number, y: number): [number, number] {
  return [Math.min(Math.max(x, box.x), box.x + box.w), Math.min(Math.max(y, box.y), box.y + box.h)];
}

function circleHitsBox(cx: number, cy: number, r: number, box: Box): boolean {
  const [nx, ny] = nearestOnBox(box, cx, cy);
  return (nx - cx) ** 2 + (ny - cy) ** 2 < r * r;
}

export interface LimitLayout {
  placements: (LabelPlacement | null)[];
  /** Limits without a callout (listed in the results panel). */
  hidden: number;
  /** When some are hidden: a free box for the line that says so (one callout gives way if none is free). */
  summary: Box | null;
}

export function layoutLimitLabels(anchors: readonly { x: number; y: number }[], o: LayoutOptions): LimitLayout {
  const { labelWidth: w, labelHeight: h, gap, margin } = o;
  const placed: Box[] = [];
  const inside = (b: Box) => b.x >= margin && b.y >= margin && b.x + b.w <= o.width - margin && b.y + b.h <= o.height - margin;
  const free = (b: Box) => inside(b) && !placed.some((p) => boxesOverlap(p, b, gap)) && !anchors.some((a) => circleHitsBox(a.x, a.y, o.ringRadius + gap, b));

  // A grid of slots over the whole canvas, for the callouts that find no room beside their ring.
  const slots: Box[] = [];
  for (let y = margin; y + h <= o.height - margin; y += h + gap) {
    for (let x = margin; x + w <= o.width - margin; x += w + gap) slots.push({ x, y, w, h });
  }

  const placements = anchors.map(({ x, y }) => {
    const off = o.ringRadius + gap + 4;
    const beside: Box[] = [];
    for (let k = 0; k < 8; k++) {
      const up = y - off - h - k * (h + gap);
      const down = y + off + k * (h + gap);
      const right = x + off;
      const left = x - off - w;
      beside.push({ x: right, y: up, w, h }, { x: left, y: up, w, h }, { x: right, y: down, w, h }, { x: left, y: down, w, h });
    }
    const byDistance = [...slots].sort((a, b) => dist(a, x, y) - dist(b, x, y));
    const box = beside.find(free) ?? byDistance.find(free);
    if (!box) return null;
    placed.push(box);
    const [nx, ny] = nearestOnBox(box, x, y);
    const far = Math.hypot(nx - x, ny - y) > BESIDE_PX;
    return { box, leader: far ? ([nx, ny, x, y] as [number, number, number, number]) : null };
  });
  if (!placements.includes(null)) return { placements, hidden: 0, summary: null };
  // Some found no room: one box says how many, in the first free slot, else in the last callout's.
  let summary = slots.find(free) ?? null;
  if (!summary) {
    const last = placements.findLastIndex((p) => p !== null);
    if (last >= 0) {
      summary = placements[last]?.box ?? null;
      placements[last] = null;
    }
  }
  return { placements, hidden: placements.filter((p) => p === null).length, summary };
}

function dist(b: Box, x: number, y: number): number {
  const [nx, ny] = nearestOnBox(b, x, y);
  return Math.hypot(nx - x, ny - y);
}
