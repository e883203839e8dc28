import { interpolateViridis } from 'd3-scale-chromatic';
import { line } from './pdfText.ts';
import { formatFixed, formatNumber } from '../../../shared/format/number.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/**
 * Vector drawings for the PDF report: line charts (one line per Mach number) and the colour
 * scales. Plain pdfkit paths: no browser, no raster images, crisp at any zoom.
 */

export const INK = '#14212b';
export const INK_SOFT = '#5b6b73';
export const RULE = '#d5dcda';
export const ACCENT = '#0b6e69';

/** Colour of the i-th of n Mach lines: viridis without its light end (readable on white). */
export function machColour(i: number, n: number): string {
  return interpolateViridis(n <= 1 ? 0.35 : (0.85 * i) / (n - 1));
}

/** Tick values: 1, 2 or 5 × 10^k steps, about `count` of them, covering [min, max]. */
export function niceTicks(min: number, max: number, count = 5): { lo: number; hi: number; step: number; ticks: number[] } {
  if (!(max > min)) {
    const pad = Math.abs(min) > 0 ? Math.abs(min) * 0.1 : 1;
    return niceTicks(min - pad, max + pad, count);
  }
  const raw = (max - min) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((f) => f * mag).find((s) => s >= raw) ?? 10 * mag;
  const lo = Number((Math.floor(min / step + 1e-9) * step).toPrecision(12));
  const hi = Number((Math.ceil(max / step - 1e-9) * step).toPrecision(12));
  const ticks: number[] = [];
  for (let v = lo; v <= hi + step * 1e-6; v += step) ticks.push(Math.abs(v) < step * 1e-9 ? 0 : Number(v.toPrecision(12)));
  return { lo, hi, step, ticks };
}

/** A tick value with as many decimals as the step needs (2.5 → one, 0.02 → two). */
export function tickLabel(v: number, step: number): string {
  let decimals = 0;
  while (decimals < 6 && Math.abs(step * 10 ** decimals - Math.round(step * 10 ** decimals)) > 1e-9 * 10 ** decimals) decimals++;
  return formatFixed(v, decimals);
}

/** The plot area of a chart box: the box less room for the title, tick labels and axis titles. */
interface PlotArea {
  /** The box's left edge (the rotated y title sits there). */
  x: number;
  px: number;
  py: number;
  pw: number;
  ph: number;
}

function plotArea(x: number, y: number, w: number, h: number, bottom: number): PlotArea {
  const pad = { left: 44, right: 8, top: 18 };
  return { x, px: x + pad.left, py: y + pad.top, pw: w - pad.left - pad.right, ph: h - pad.top - bottom };
}

/** An empty plot frame that says why there is nothing in it. */
function drawEmptyPlot(doc: PDFKit.PDFDocument, a: PlotArea, message: string): void {
  doc.rect(a.px, a.py, a.pw, a.ph).lineWidth(0.5).strokeColor(RULE).stroke();
  line(doc, message, a.px, a.py + a.ph / 2 - 5, { size: 8, color: INK_SOFT, width: a.pw, align: 'center' });
}

type Ticks = ReturnType<typeof niceTicks>;

/**
 * Grid, zero line, frame, tick labels and the two axis titles (the y title rotated along the
 * left edge); `xTitleGap` is the x title's distance below the plot.
 */
function drawPlotFrame(
  doc: PDFKit.PDFDocument,
  a: PlotArea,
  axes: { xt: Ticks; yt: Ticks; X: (v: number) => number; Y: (v: number) => number },
  titles: { x: string; y: string; xTitleGap: number },
): void {
  const { px, py, pw, ph } = a;
  const { xt, yt, X, Y } = axes;
  doc.lineWidth(0.4).strokeColor('#e7ecea');
  for (const t of yt.ticks) doc.moveTo(px, Y(t)).lineTo(px + pw, Y(t)).stroke();
  for (const t of xt.ticks) doc.moveTo(X(t), py).lineTo(X(t), py + ph).stroke();
  if (yt.lo < 0 && yt.hi > 0) doc.lineWidth(0.6).strokeColor('#b8c3c0').moveTo(px, Y(0)).lineTo(px + pw, Y(0)).stroke();
  doc.rect(px, py, pw, ph).lineWidth(0.6).strokeColor('#9aa8a4').stroke();
  for (const t of yt.ticks) line(doc, tickLabel(t, yt.step), px - 40, Y(t) - 3.5, { size: 6.5, color: INK_SOFT, width: 37, align: 'right' });
  for (const t of xt.ticks) line(doc, tickLabel(t, xt.step), X(t) - 20, py + ph + 3, { size: 6.5, color: INK_SOFT, width: 40, align: 'center' });
  line(doc, titles.x, px, py + ph + titles.xTitleGap, { size: 7.5, color: INK, width: pw, align: 'center' });
  doc.save();
  doc.rotate(-90, { origin: [a.x + 6, py + ph / 2] });
  line(doc, titles.y, a.x + 6 - ph / 2, py + ph / 2 - 4, { size: 7.5, color: INK, width: ph, align: 'center' });
  doc.restore();
}

export interface ChartSeries {
  colour: string;
  /** Points in order; null breaks the line. */
  points: ([number, number] | null)[];
}

export interface LineChart {
  title: string;
  xLabel: string;
  yLabel: string;
  series: ChartSeries[];
  /** Highlighted points (best L/D): ringed dots. */
  markers?: { x: number; y: number; colour: string }[];
  /** Marks on the x axis (nose detachment boundary): small coloured triangles. */
  axisMarks?: { x: number; colour: string }[];
  /** Fix the x range (else from the data). */
  xRange?: [number, number];
}

/** Draws a line chart in the box (x, y, w, h); the title sits inside the box's top. */
export function drawLineChart(doc: PDFKit.PDFDocument, x: number, y: number, w: number, h: number, chart: LineChart): void {
  const area = plotArea(x, y, w, h, 30);
  const { px, py, pw, ph } = area;
  line(doc, chart.title, x, y, { size: 9, weight: 'bold', color: INK });

  const xs: number[] = [];
  const ys: number[] = [];
  for (const s of chart.series) {
    for (const p of s.points) {
      if (p && Number.isFinite(p[0]) && Number.isFinite(p[1])) {
        xs.push(p[0]);
        ys.push(p[1]);
      }
    }
  }
  for (const m of chart.markers ?? []) {
    xs.push(m.x);
    ys.push(m.y);
  }
  if (xs.length === 0) {
    drawEmptyPlot(doc, area, 'No valid points to plot.');
    return;
  }
  const xr = chart.xRange ?? [Math.min(...xs), Math.max(...xs)];
  const xt = niceTicks(xr[0], xr[1], 6);
  const yt = niceTicks(Math.min(...ys), Math.max(...ys), 5);
  const X = (v: number) => px + ((v - xt.lo) / (xt.hi - xt.lo)) * pw;
  const Y = (v: number) => py + ph - ((v - yt.lo) / (yt.hi - yt.lo)) * ph;

  drawPlotFrame(doc, area, { xt, yt, X, Y }, { x: chart.xLabel, y: chart.yLabel, xTitleGap: 14 });

  // Lines, clipped to the plot area.
  doc.save();
  doc.rect(px, py, pw, ph).clip();
  doc.lineWidth(0.9).lineJoin('round');
  for (const s of chart.series) {
    let open = false;
    for (const p of s.points) {
      if (!p || !Number.isFinite(p[1])) {
        if (open) doc.strokeColor(s.colour).stroke();
        open = false;
        continue;
      }
      if (!open) doc.moveTo(X(p[0]), Y(p[1]));
      else doc.lineTo(X(p[0]), Y(p[1]));
      open = true;
    }
    if (open) doc.strokeColor(s.colour).stroke();
    // A lone point between gaps would not show as a line: dot every point of short series.
    if (s.points.filter(Boolean).length <= 2) for (const p of s.points) if (p) doc.circle(X(p[0]), Y(p[1]), 1.3).fillColor(s.colour).fill();
  }
  for (const m of chart.markers ?? []) {
    doc.circle(X(m.x), Y(m.y), 2.6).lineWidth(0.9).fillColor('#ffffff').strokeColor(m.colour).fillAndStroke();
  }
  doc.restore();

  for (const m of chart.axisMarks ?? []) {
    if (m.x < xt.lo || m.x > xt.hi) continue;
    const mx = X(m.x);
    doc.moveTo(mx, py + ph).lineTo(mx - 2.6, py + ph + 4.5).lineTo(mx + 2.6, py + ph + 4.5).closePath().fillColor(m.colour).fill();
  }
}

/** A horizontal colour bar for the Mach lines, labelled at both ends. */
export function drawMachKey(doc: PDFKit.PDFDocument, x: number, y: number, w: number, machs: number[]): void {
  line(doc, 'Line colour: Mach', x, y, { size: 7.5, color: INK });
  const bx = x + 72;
  const bw = Math.min(260, w - 72 - 160);
  const n = machs.length;
  const cell = bw / Math.max(1, n);
  machs.forEach((_, i) => doc.rect(bx + i * cell, y + 1, cell + 0.3, 7).fillColor(machColour(i, n)).fill());
  line(doc, `M ${fmt(itemAt(machs, 0))}`, bx, y + 10, { size: 6.5, color: INK_SOFT });
  if (n > 1) line(doc, `M ${fmt(itemAt(machs, n - 1))}`, bx + bw - 40, y + 10, { size: 6.5, color: INK_SOFT, width: 40, align: 'right' });
  line(doc, '▲ on the α axis: nose shock detaches', bx + bw + 14, y, { size: 7, color: INK_SOFT });
  line(doc, '○ best L/D of each Mach line', bx + bw + 14, y + 10, { size: 7, color: INK_SOFT });
}

const fmt = (v: number) => formatNumber(v, 4);

export interface StepSeries {
  colour: string;
  /** [a, b] dash pattern in points; solid when absent. */
  dash?: [number, number];
  width?: number;
  /** Horizontal steps: from x0 to x1 at y (one per facet). */
  steps: [number, number, number][];
}

export interface StepChart {
  title: string;
  xLabel: string;
  yLabel: string;
  /** Negative values up (the usual way to draw Cp). */
  invertY?: boolean;
  xRange?: [number, number];
  series: StepSeries[];
  legend: { colour: string; dash?: [number, number]; label: string }[];
}

/**
 * A chart of piecewise-constant values (a facet's Cp over its x extent) with a legend row under
 * the plot; the title sits inside the box's top.
 */
export function drawStepChart(doc: PDFKit.PDFDocument, x: number, y: number, w: number, h: number, chart: StepChart): void {
  const area = plotArea(x, y, w, h, 44);
  const { px, py, pw, ph } = area;
  line(doc, chart.title, x, y, { size: 9, weight: 'bold', color: INK });
  const ys = chart.series.flatMap((s) => s.steps.map((t) => t[2])).filter(Number.isFinite);
  const xs = chart.series.flatMap((s) => s.steps.flatMap((t) => [t[0], t[1]])).filter(Number.isFinite);
  if (ys.length === 0) {
    drawEmptyPlot(doc, area, 'No valid facets to plot.');
    return;
  }
  const xr = chart.xRange ?? [Math.min(...xs), Math.max(...xs)];
  const xt = niceTicks(xr[0], xr[1], 5);
  const yt = niceTicks(Math.min(0, ...ys), Math.max(0, ...ys), 6);
  const X = (v: number) => px + ((v - xt.lo) / (xt.hi - xt.lo)) * pw;
  const Y = (v: number) => (chart.invertY ? py + ((v - yt.lo) / (yt.hi - yt.lo)) * ph : py + ph - ((v - yt.lo) / (yt.hi - yt.lo)) * ph);

  drawPlotFrame(doc, area, { xt, yt, X, Y }, { x: chart.xLabel, y: chart.yLabel, xTitleGap: 13 });

  doc.save();
  doc.rect(px, py, pw, ph).clip();
  for (const s of chart.series) {
    doc.lineWidth(s.width ?? 1.1);
    if (s.dash) doc.dash(s.dash[0], { space: s.dash[1] });
    for (const [x0, x1, v] of s.steps) {
      if (!Number.isFinite(v)) continue;
      doc.moveTo(X(x0), Y(v)).lineTo(X(x1), Y(v)).strokeColor(s.colour).stroke();
    }
    doc.undash();
  }
  doc.restore();

  // Legend under the axis title.
  let lx = px;
  const ly = py + ph + 28;
  for (const item of chart.legend) {
    doc.lineWidth(1.2);
    if (item.dash) doc.dash(item.dash[0], { space: item.dash[1] });
    doc.moveTo(lx, ly + 4).lineTo(lx + 18, ly + 4).strokeColor(item.colour).stroke();
    doc.undash();
    lx += 22 + line(doc, item.label, lx + 22, ly, { size: 7, color: INK }) + 14;
  }
}
