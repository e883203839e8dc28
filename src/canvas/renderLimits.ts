import type { SolveLimit, SolveResult } from '@shared/solver/types';
import { LIMIT_COLOUR } from './colors';
import type { DrawList } from './drawPaths';
import { toScreen, type Size, type View } from './view';
import { formatFixed, formatNumber } from '@shared/format/number';

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

/**
 * A ring at each limit's vertex and a label beside it: status, vertex and place, the numbers,
 * and the solver's sentence. Labels stay inside the canvas and stack when several limits
 * share a vertex (a nose that detaches on both surfaces).
 */
export function renderLimits(result: SolveResult | null, view: View, size: Size): { marks: DrawList; labels: LimitLabel[] } {
  const marks: DrawList = { paths: [], dots: [] };
  const labels: LimitLabel[] = [];
  if (!result) return { marks, labels };
  const stackAt = new Map<string, number>();
  result.limits.forEach((limit, i) => {
    const [x, y] = toScreen(view, limit.at);
    marks.dots.push({ x, y, radius: 9, fill: 'rgba(255, 181, 71, 0.18)', stroke: LIMIT_COLOUR, strokeWidth: 2 });
    const key = `${Math.round(x)},${Math.round(y)}`;
    const k = stackAt.get(key) ?? 0;
    stackAt.set(key, k + 1);
    const preferLeft = x > size.width * 0.6;
    let lx = preferLeft ? x - 14 - LIMIT_LABEL_WIDTH_PX : x + 14;
    let ly = y - 18 - LIMIT_LABEL_HEIGHT_PX - k * (LIMIT_LABEL_HEIGHT_PX + 6);
    lx = Math.min(Math.max(8, lx), Math.max(8, size.width - LIMIT_LABEL_WIDTH_PX - 8));
    ly = Math.min(Math.max(8, ly), Math.max(8, size.height - LIMIT_LABEL_HEIGHT_PX - 8));
    labels.push({
      key: `${limit.status}-${limit.surface}-${limit.vertex}-${i}`,
      x: lx,
      y: ly,
      title: `${limit.status} at vertex ${limit.vertex}, ${PLACE[limit.surface]}`,
      numbers: limitNumbers(limit),
      sentence: limit.message,
    });
  });
  return { marks, labels };
}
