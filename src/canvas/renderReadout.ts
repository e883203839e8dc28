import type { Point } from '@shared/model/sketch';
import { sectionShape } from '@shared/model/sectionShape';
import type { DrawList } from './drawPaths';
import { toScreen, type Size, type View } from './view';
import { formatFixed } from '@shared/format/number';

const FONT = "500 11px 'Work Sans', system-ui, sans-serif";
/** Rough width of one character of FONT, pixels (the box only needs to hold the text). */
const CHAR_PX = 6.4;
const LINE_PX = 15;

/** The lines of the drag readout: the section's t/c and ridge, then the dragged vertex. */
export function readoutLines(points: readonly Point[], at: Point): string[] {
  const lines: string[] = [];
  if (points.length >= 3) {
    const s = sectionShape(points);
    const ridge = s.ridgeXOverC === null ? '' : `   ridge x/c ${formatFixed(s.ridgeXOverC, 3)}`;
    lines.push(`t/c ${formatFixed(s.thicknessRatio * 100, 2)} %${ridge}`);
  }
  lines.push(`x ${formatFixed(at[0], 4)}   y ${formatFixed(at[1], 4)}`);
  return lines;
}

/**
 * The readout beside a dragged vertex: a small box above and to the right of it (flipped to
 * stay inside the canvas), drawn on the canvas so it follows the drag without touching the DOM.
 */
export function renderReadout(points: readonly Point[], at: Point | null, view: View, size: Size): DrawList {
  if (!at) return { paths: [], dots: [] };
  const lines = readoutLines(points, at);
  const width = Math.ceil(Math.max(...lines.map((l) => l.length)) * CHAR_PX) + 16;
  const height = lines.length * LINE_PX + 8;
  const [vx, vy] = toScreen(view, at);
  let x = vx + 14;
  let y = vy - 14 - height;
  if (x + width > size.width - 4) x = vx - 14 - width;
  if (y < 4) y = vy + 14;
  x = Math.max(4, x);
  return {
    paths: [{ points: [x, y, x + width, y, x + width, y + height, x, y + height], colour: '#5fd0c4', width: 1, closed: true, fill: 'rgba(12, 20, 24, 0.92)' }],
    dots: [],
    texts: lines.map((text, i) => ({ x: x + 8, y: y + 4 + (i + 1) * LINE_PX - 4, text, colour: i === 0 ? '#e9f1f2' : '#c9d6da', font: FONT })),
  };
}
