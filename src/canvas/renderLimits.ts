import type { SolveLimit, SolveResult } from '@shared/solver/types';
import { LIMIT_COLOUR } from './colors';
import type { DrawList } from './drawPaths';
import { toScreen, type Size, type View } from './view';
import { formatFixed, formatNumber } from '@shared/format/number';
import { layoutLimitLabels } from './limitLayout';

/** Width of a limit label on the canvas, pixels. */
export const LIMIT_LABEL_WIDTH_PX = 300;
/** Room one label takes vertically (title, numbers, up to three lines of sentence), pixels. */
export const LIMIT_LABEL_HEIGHT_PX = 78;

export interface LimitLabel {
  key: string;
  x: number;
  y: number;
  /** `detached at vertex 0, lower surface` */
  title: string;
  /** The numbers: `θ 11.8°, θmax 9.4°`. */
  numbers: string;
  /** The solver's one-sentence explanation. */
  sentence: string;
  /** A line from the callout's edge to its ring, when the callout sits away from it. */
  leader: [number, number, number, number] | null;
}

const PLACE: Record<SolveLimit['surface'], string> = {
  upper: 'upper surface',
  lower: 'lower surface',
  trailingEdge: 'trailing edge',
  leadingEdge: 'leading edge',
};

const deg = (v: number) => `${formatFixed(v, 1)}°`;

/** The figures that go with a limit, in the order an engineer checks them. */
export function limitNumbers(limit: SolveLimit): string {
  const parts: string[] = [];
  if (limit.thetaDeg !== undefined) parts.push(`θ ${deg(limit.thetaDeg)}`);
  if (limit.thetaMaxDeg !== undefined) parts.push(`θmax ${deg(limit.thetaMaxDeg)}`);
  if (limit.machBehind !== undefined) parts.push(`M behind ${formatFixed(limit.machBehind, 3)}`);
  if (limit.nuDeg !== undefined) parts.push(`ν ${deg(limit.nuDeg)}`);
  if (limit.nuMaxDeg !== undefined) parts.push(`νmax ${deg(limit.nuMaxDeg)}`);
  if (parts.length === 0) parts.push(`at (${formatNumber(limit.at[0], 4)}, ${formatNumber(limit.at[1], 4)})`);
  return parts.join(', ');
}

/** Radius of the ring drawn at a limit's vertex, pixels (callouts keep clear of it). */
export const LIMIT_RING_RADIUS_PX = 9;
/** Space between callouts, and between a callout and a ring, pixels. */
const LABEL_GAP_PX = 6;
const CANVAS_MARGIN_PX = 8;

/**
 * A ring at each limit's vertex and a callout for it: status, vertex and place, the numbers,
 * and the solver's sentence. Callouts are placed by `layoutLimitLabels` ([L1]–[L4]): never over
 * each other or over any limit's ring, always inside the canvas; one set away from its ring gets
 * a leader line; when the canvas has no room for all, one box says how many are not labelled
 * (they are all listed in the results panel).
 */
export function renderLimits(result: SolveResult | null, view: View, size: Size): { marks: DrawList; labels: LimitLabel[]; hidden: number } {
  const marks: DrawList = { paths: [], dots: [] };
  const labels: LimitLabel[] = [];
  if (!result) return { marks, labels, hidden: 0 };
  const anchors = result.limits.map((limit) => {
    const [x, y] = toScreen(view, limit.at);
    marks.dots.push({ x, y, radius: LIMIT_RING_RADIUS_PX, fill: 'rgba(255, 181, 71, 0.18)', stroke: LIMIT_COLOUR, strokeWidth: 2 });
    return { x, y };
  });
  const layout = layoutLimitLabels(anchors, {
    width: size.width,
    height: size.height,
    labelWidth: LIMIT_LABEL_WIDTH_PX,
    labelHeight: LIMIT_LABEL_HEIGHT_PX,
    ringRadius: LIMIT_RING_RADIUS_PX + 1,
    gap: LABEL_GAP_PX,
    margin: CANVAS_MARGIN_PX,
  });
  const unlabelled: number[] = [];
  result.limits.forEach((limit, i) => {
    const placed = layout.placements[i];
    if (!placed) {
      unlabelled.push(limit.vertex);
      return;
    }
    if (placed.leader) marks.paths.push({ points: [...placed.leader], colour: LIMIT_COLOUR, width: 1, dash: [3, 3], alpha: 0.8 });
    labels.push({
      key: `${limit.status}-${limit.surface}-${limit.vertex}-${i}`,
      x: placed.box.x,
      y: placed.box.y,
      title: `${limit.status} at vertex ${limit.vertex}, ${PLACE[limit.surface]}`,
      numbers: limitNumbers(limit),
      sentence: limit.message,
      leader: placed.leader,
    });
  });
  if (layout.summary && unlabelled.length > 0) {
    const n = unlabelled.length;
    const vertices = [...new Set(unlabelled)].sort((a, b) => a - b);
    labels.push({
      key: 'limits-more',
      x: layout.summary.x,
      y: layout.summary.y,
      title: `${n} more limit${n === 1 ? '' : 's'} not labelled here`,
      numbers: `at vertex ${vertices.join(', ')}`,
      sentence: 'The canvas has no free room for their callouts; zoom in, or read them in the results beside the canvas.',
      leader: null,
    });
  }
  return { marks, labels, hidden: layout.hidden };
}
