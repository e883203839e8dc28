import { AXIS, CANVAS_BACKGROUND, GRID_LABEL, GRID_MAJOR, GRID_MINOR } from './colors';
import type { DrawList, StrokePath, TextItem } from './drawPaths';
import { gridLines, scaleBar } from './grid';
import { LEGEND_BAR_PX, type LegendModel } from './legend';
import type { Size, View } from './view';
import { formatNumber } from '@shared/format/number';

export const CANVAS_FONT = "11px 'Work Sans', system-ui, sans-serif";
const LABEL_FONT = "500 11px 'Work Sans', system-ui, sans-serif";
/** The exaggeration note: amber like the other "read this before trusting the picture" marks. */
const HUD_NOTE = '#ffcf7a';

/** Background, the chord-unit grid (minor, major every fifth line, the axes) and labels. */
export function renderGrid(view: View, size: Size, showGrid: boolean): DrawList {
  const paths: StrokePath[] = [
    { points: [0, 0, size.width, 0, size.width, size.height, 0, size.height], colour: CANVAS_BACKGROUND, width: 0, closed: true, fill: CANVAS_BACKGROUND },
  ];
  const texts: TextItem[] = [];
  if (!showGrid) return { paths, dots: [], texts };
  const grid = gridLines(view, size);
  for (const line of grid.vertical) {
    const x = Math.round(line.at) + 0.5;
    paths.push({ points: [x, 0, x, size.height], colour: line.axis ? AXIS : line.major ? GRID_MAJOR : GRID_MINOR, width: 1 });
    // x labels along the bottom, clear of the scale bar in the bottom-left corner.
    if (line.major && !line.axis && x > 150) texts.push({ x: x + 3, y: size.height - 6, text: label(line.value), colour: GRID_LABEL, font: CANVAS_FONT });
  }
  for (const line of grid.horizontal) {
    const y = Math.round(line.at) + 0.5;
    paths.push({ points: [0, y, size.width, y], colour: line.axis ? AXIS : line.major ? GRID_MAJOR : GRID_MINOR, width: 1 });
    // y labels along the left edge, clear of the x labels and the scale bar at the bottom.
    if (line.major && !line.axis && y < size.height - 50 && y > 14) texts.push({ x: 6, y: y - 3, text: label(line.value), colour: GRID_LABEL, font: CANVAS_FONT });
  }
  return { paths, dots: [], texts };
}

function label(v: number): string {
  return formatNumber(v, 6);
}

/**
 * Heads-up items in screen space: the scale bar (bottom left) and the pressure legend (bottom
 * right). Drawn on the canvas so that a PNG export carries them.
 */
export function renderHud(view: View, size: Size, legend: LegendModel | null, showGrid: boolean, styles: readonly LineStyleKey[] = [], chord = 1): DrawList {
  const paths: StrokePath[] = [];
  const texts: TextItem[] = [];
  const bars: DrawList['bars'] = [];
  const dots: DrawList['dots'] = [];
  if (styles.length > 0) {
    // The line-style key, above the pressure legend (bottom right): what each kind of line is.
    const w = 220;
    const x = size.width - w - 20;
    const rowH = 16;
    const bottom = size.height - (legend ? 86 : 14);
    const top = bottom - rowH * styles.length - 10;
    paths.push({ points: [x - 10, top, x + w + 10, top, x + w + 10, bottom, x - 10, bottom], colour: '#2a3c44', width: 1, closed: true, fill: 'rgba(17, 28, 34, 0.9)' });
    styles.forEach((s, i) => {
      const y = top + 13 + i * rowH;
      if (s.dot) dots.push({ x: x + 14, y: y - 4, radius: s.dot.radius, fill: s.dot.fill, stroke: s.dot.stroke, strokeWidth: 1 });
      else if (s.swatch) paths.push({ points: [x, y - 9, x + 28, y - 9, x + 28, y + 1, x, y + 1], colour: s.swatch, width: 0, closed: true, fill: s.swatch, alpha: s.alpha });
      else paths.push({ points: [x, y - 4, x + 28, y - 4], colour: s.colour, width: s.width, dash: s.dash, alpha: s.alpha });
      texts.push({ x: x + 38, y, text: s.label, colour: '#d7e3e6', font: CANVAS_FONT });
    });
  }
  if (showGrid) {
    const bar = scaleBar(view, chord);
    const x0 = 16;
    const y0 = size.height - 28;
    paths.push({ points: [x0, y0 - 8, 8 + x0 + bar.pixels + 8, y0 - 8, 8 + x0 + bar.pixels + 8, y0 + 10, x0, y0 + 10], colour: 'rgba(17, 28, 34, 0.85)', width: 0, closed: true, fill: 'rgba(17, 28, 34, 0.85)' });
    paths.push({ points: [x0 + 8, y0 - 3, x0 + 8, y0, x0 + 8 + bar.pixels, y0, x0 + 8 + bar.pixels, y0 - 3], colour: '#d7e3e6', width: 1.5 });
    texts.push({ x: x0 + 8 + bar.pixels / 2, y: y0 + 9, text: bar.label, colour: '#d7e3e6', font: LABEL_FONT, align: 'center', baseline: 'bottom' });
  }
  const ex = view.exaggeration ?? 1;
  if (ex !== 1) {
    // Always said on the canvas (and so in a PNG): the picture is stretched, the numbers are not.
    const text = `vertical ×${ex} (view only)`;
    const y = size.height - (showGrid ? 46 : 18);
    paths.push({ points: [16, y - 13, 172, y - 13, 172, y + 5, 16, y + 5], colour: HUD_NOTE, width: 1, closed: true, fill: 'rgba(17, 28, 34, 0.85)' });
    texts.push({ x: 24, y, text, colour: HUD_NOTE, font: LABEL_FONT, baseline: 'alphabetic' });
  }
  if (legend) {
    const w = LEGEND_BAR_PX;
    const x = size.width - w - 20;
    const y = size.height - 58;
    paths.push({ points: [x - 10, y - 22, x + w + 10, y - 22, x + w + 10, y + 36, x - 10, y + 36], colour: '#2a3c44', width: 1, closed: true, fill: 'rgba(17, 28, 34, 0.9)' });
    texts.push({ x, y: y - 8, text: legend.title, colour: '#d7e3e6', font: LABEL_FONT });
    bars.push({ x, y, width: w, height: 10, stops: legend.stops });
    for (const tick of legend.ticks) {
      const tx = x + tick.t * w;
      paths.push({ points: [tx, y + 10, tx, y + 14], colour: '#d7e3e6', width: 1 });
      texts.push({ x: tx, y: y + 26, text: tick.label, colour: '#d7e3e6', font: CANVAS_FONT, align: tick.align });
    }
  }
  return { paths, dots, texts, bars };
}

/** One entry of the line-style key: a stroke sample, a dot or a filled swatch, and its words. */
export interface LineStyleKey {
  label: string;
  colour: string;
  width: number;
  dash?: number[];
  alpha?: number;
  dot?: { radius: number; fill: string; stroke?: string };
  swatch?: string;
}
