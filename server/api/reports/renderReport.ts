import PDFDocument from 'pdfkit';
import { frictionSentence, gasModelSentence, referenceSentence } from '../../../shared/flight/referenceText.ts';
import { thicknessRatio } from '../../../shared/solver/thicknessRatio.ts';
import { interpolateViridis } from 'd3-scale-chromatic';
import { RESULTS_CAUTION } from '../../../shared/model/caution.ts';
import { formatQuantity, toDisplay, unitLabel, type Quantity, type UnitSystem } from '../../../shared/flight/units.ts';
import { shownXcpOverC, xcpLeftOut, XCP_UNDEFINED_NOTE } from '../../../shared/flight/xcp.ts';
import { unpackStudyRows, type StudyRow } from '../../../shared/model/study.ts';
import { sketchCase } from '../../../shared/model/sketch.ts';
import type { Coefficients, Facet, Point, SolveResult, TheoryResult } from '../../../shared/solver/types.ts';
import { ACCENT, INK, INK_SOFT, RULE, drawLineChart, drawMachKey, drawStepChart, machColour, niceTicks, tickLabel, type LineChart } from './pdfCharts.ts';
import { facetLoads } from '../../../shared/flight/facetLoads.ts';
import type { SketchAnalysis } from '../../../shared/flight/analyseSketch.ts';
import { line, paragraph, registerFonts, widthOf } from './pdfText.ts';
import type { ReportData, ReportStudy } from './reportData.ts';
import { drawApprovalRecord } from './pdfApproval.ts';
import { formatNumber } from '../../../shared/format/number.ts';
import { firstItem, itemAt } from '../../../shared/util/invariant.ts';

/**
 * The PDF report of a sketch, drawn with pdfkit vectors only: title block, caution, the section
 * and its wave map coloured by pressure (from the stored analysis' solved points and waves),
 * condition, coefficients of the three theories, hinge moment, loads in the requester's units,
 * and optionally a study's charts and tables. Fonts are embedded (see pdfText.ts). Every page
 * carries the sketch, revision, page number and the caution in its footer.
 */

/** Largest study whose every point is printed as a table; bigger ones print the per-Mach table only. */
export const REPORT_POINT_TABLE_MAX = 300;
/** Largest section whose vertices are printed as a table. */
export const REPORT_VERTEX_TABLE_MAX = 400;

const PAGE = { width: 595.28, height: 841.89 };
const M = { left: 44, right: 44, top: 44, bottom: 58 };
const CONTENT_W = PAGE.width - M.left - M.right;
const BOTTOM = PAGE.height - M.bottom;

const CANVAS_BG = '#111c22';
const SECTION_FILL = '#2b3c44';
const SECTION_OUTLINE = '#c9d6da';
const UNSOLVED = '#6b7d84';
const LIMIT = '#ffb547';

export function renderReport(data: ReportData): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margins: M,
    bufferPages: true,
    autoFirstPage: true,
    info: {
      Title: `${data.title} — Shockwright report`,
      Author: data.generatedBy,
      Subject: `Sketch revision ${data.revision}${data.study ? `, study ${data.study.name}` : ''}`,
      Creator: 'Shockwright',
      CreationDate: data.generatedAt,
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  registerFonts(doc);
  const ctx: Ctx = { doc, y: M.top, data };

  titleBlock(ctx);
  ctx.y = drawApprovalRecord(doc, { x: M.left, y: ctx.y, width: CONTENT_W }, data.review, data.revision);
  cautionBox(ctx);
  designPointsTable(ctx);
  waveMapPanel(ctx);
  conditionAndStatus(ctx);
  cpChart(ctx);
  coefficientsTable(ctx);
  loadsTables(ctx);
  facetTable(ctx);
  coordinatesTable(ctx);
  if (data.study) studyPages(ctx, data.study);
  footers(ctx);
  doc.end();
  return done;
}

interface Ctx {
  doc: PDFKit.PDFDocument;
  y: number;
  data: ReportData;
}

/** Starts a new page when fewer than `height` points are left. */
function ensure(ctx: Ctx, height: number): void {
  if (ctx.y + height > BOTTOM) newPage(ctx);
}

function newPage(ctx: Ctx): void {
  ctx.doc.addPage();
  ctx.y = M.top;
}

/** A section heading, kept on the same page as at least `keep` points of what follows. */
function heading(ctx: Ctx, text: string, keep = 90): void {
  ensure(ctx, 21 + keep);
  line(ctx.doc, text, M.left, ctx.y, { size: 11, weight: 'bold', color: ACCENT });
  ctx.y += 15;
  ctx.doc.moveTo(M.left, ctx.y).lineTo(M.left + CONTENT_W, ctx.y).lineWidth(0.6).strokeColor(RULE).stroke();
  ctx.y += 6;
}

/** Every number in the report is printed by the one formatter (shared/format/number.ts). */
const num = (v: number | null | undefined, digits = 4): string => formatNumber(v, digits);
const sci = num;
const deg = (v: number | null | undefined) => (v === null || v === undefined ? '—' : `${num(v, 4)}°`);
const qty = (v: number | null | undefined, q: Quantity, units: UnitSystem) => (v === null || v === undefined ? '—' : formatQuantity(v, q, units, 4));

/** The selected design point's name (what the wave map and the tables show). */
function selectedName(data: ReportData): string {
  return data.document.designPoints.find((p) => p.id === data.points.selectedPointId)?.name ?? '';
}

function titleBlock(ctx: Ctx): void {
  const { doc, data } = ctx;
  line(doc, 'SHOCKWRIGHT', M.left, ctx.y, { size: 8, weight: 'bold', color: ACCENT });
  line(doc, data.study ? 'Section and study report' : 'Section report', M.left, ctx.y, { size: 8, color: INK_SOFT, width: CONTENT_W, align: 'right' });
  ctx.y += 16;
  ctx.y += paragraph(doc, data.title, M.left, ctx.y, CONTENT_W, { size: 19, weight: 'bold', color: INK });
  const when = data.generatedAt.toISOString().replace('T', ' ').slice(0, 16);
  const meta = [
    `Sketch revision ${data.revision}`,
    data.teamName ? `team ${data.teamName}` : null,
    `generated ${when} UTC by ${data.generatedBy}`,
    `units: ${data.units === 'si' ? 'SI' : 'US customary'}`,
  ].filter(Boolean);
  ctx.y += paragraph(doc, meta.join(' · '), M.left, ctx.y + 2, CONTENT_W, { size: 8.5, color: INK_SOFT }) + 9;
}

function cautionBox(ctx: Ctx): void {
  const { doc } = ctx;
  const text = `${RESULTS_CAUTION} Figures come from inviscid shock-expansion theory with linear (Ackeret) and second-order (Busemann) theory beside it; friction drag is a flat-plate estimate.`;
  const innerW = CONTENT_W - 20;
  // Measure by drawing off-page first would cost a pass; estimate lines from widths instead.
  const lines = Math.ceil(widthOf(doc, text, { size: 8.5 }) / innerW) + 1;
  const h = 16 + lines * 8.5 * 1.3 + 6;
  doc.rect(M.left, ctx.y, CONTENT_W, h).lineWidth(0.8).fillColor('#fff8ec').strokeColor('#efc47a').fillAndStroke();
  line(doc, 'Caution', M.left + 10, ctx.y + 6, { size: 9, weight: 'bold', color: '#7a4b00' });
  paragraph(doc, text, M.left + 10, ctx.y + 19, innerW, { size: 8.5, color: '#4a3a1a' });
  ctx.y += h + 12;
}

// ---- section and wave map ----

/** The canvas's pressure scale: viridis from 0.4 up, symmetric in ln(p/p∞), ≥ ±ln 1.25, 0.05 steps. */
function pressureScale(ratios: number[]): { colour: (p: number | null) => string; min: number; max: number } {
  let span = Math.log(1.25);
  for (const p of ratios) if (p > 0 && Number.isFinite(p)) span = Math.max(span, Math.abs(Math.log(p)));
  span = Math.ceil(span / 0.05 - 1e-9) * 0.05;
  const colour = (p: number | null) => {
    if (p === null || !(p > 0)) return UNSOLVED;
    const t = Math.min(1, Math.max(0, (Math.log(p) + span) / (2 * span)));
    return interpolateViridis(0.4 + 0.6 * t);
  };
  return { colour, min: Math.exp(-span), max: Math.exp(span) };
}

/** Height range of the wave map's frame: it takes the drawing's aspect within these bounds. */
const WAVE_MAP_MIN_H = 170;
const WAVE_MAP_MAX_H = 330;
/** Room left of and under the frame for the axes' labels. */
const AXIS_LEFT = 34;
const AXIS_BOTTOM = 24;

/**
 * The section and its wave map in a frame the drawing fills: the frame takes the width of the
 * page and the height the drawing's aspect asks for (within WAVE_MAP_MIN_H…MAX_H; a taller
 * drawing is cut at the top and bottom around the section, a flatter one gets more of the
 * field above and below). Axes in x/c and y/c from the leading edge, a grid, and a scale bar
 * with its physical length on the sketch's chord.
 */
export interface WaveMapLayout {
  /** Points per drawing unit. */
  scale: number;
  /** Frame height, points (the width is given). */
  height: number;
  /** What is drawn: the section and every wave's line, with 3 % of the width added left and right. */
  drawing: { minX: number; maxX: number; minY: number; maxY: number };
  /** The y range the frame shows (drawing units). */
  minY: number;
  maxY: number;
}

/**
 * Where the wave map goes in a frame `frameW` points wide: scaled so the drawing spans the
 * width; the frame's height is the drawing's (plus 6 %) within WAVE_MAP_MIN_H…MAX_H. A taller
 * drawing is cut above and below around the section's middle; a flatter one shows more field.
 */
export function waveMapLayout(analysis: SketchAnalysis, frameW: number): WaveMapLayout {
  const pts: Point[] = analysis.solvedPoints;
  const all: Point[] = [...pts];
  for (const w of analysis.result?.waves ?? []) {
    all.push(w.origin, w.end);
    for (const r of w.rays ?? []) all.push(r.end);
  }
  const xs = all.map((p) => p[0]);
  const ys = all.map((p) => p[1]);
  const secYs = pts.map((p) => p[1]);
  const rawMinX = Math.min(...xs);
  const rawMaxX = Math.max(...xs);
  const padX = (rawMaxX - rawMinX) * 0.03 || 0.1;
  const drawing = { minX: rawMinX - padX, maxX: rawMaxX + padX, minY: Math.min(...ys), maxY: Math.max(...ys) };
  const scale = frameW / (drawing.maxX - drawing.minX);
  const want = (drawing.maxY - drawing.minY) * 1.06 * scale;
  const height = Math.min(WAVE_MAP_MAX_H, Math.max(WAVE_MAP_MIN_H, want));
  const midY = want <= height ? (drawing.maxY + drawing.minY) / 2 : (Math.max(...secYs) + Math.min(...secYs)) / 2;
  return { scale, height, drawing, minY: midY - height / 2 / scale, maxY: midY + height / 2 / scale };
}

function waveMapPanel(ctx: Ctx): void {
  const { doc, data } = ctx;
  const { analysis } = data;
  const result = analysis.result;
  const pts: Point[] = analysis.solvedPoints;
  const frameW = CONTENT_W - AXIS_LEFT;
  const layout = waveMapLayout(analysis, frameW);
  const s = layout.scale;
  const h = layout.height;
  const { minX, maxX } = layout.drawing;
  const { minY, maxY } = layout;

  heading(ctx, `Section and wave map${data.document.designPoints.length > 1 ? ` — ${selectedName(data)}` : ''}`, h + AXIS_BOTTOM + 40);
  const x0 = M.left + AXIS_LEFT;
  const y0 = ctx.y;
  doc.rect(x0, y0, frameW, h).fillColor(CANVAS_BG).fill();
  const X = (p: Point) => x0 + (p[0] - minX) * s;
  const Y = (p: Point) => y0 + (maxY - p[1]) * s;

  // Axes in x/c and y/c from the reference leading edge (the canvas's own grid, drawn lighter).
  const ref = result?.geometry.reference ?? null;
  const le: Point = ref ? ref.leadingEdge : [minX, 0];
  const chord = ref ? ref.chord : maxX - minX;
  const xt = niceTicks((minX - le[0]) / chord, (maxX - le[0]) / chord, 10);
  const yt = niceTicks((minY - le[1]) / chord, (maxY - le[1]) / chord, Math.max(3, Math.round(h / 45)));
  doc.save();
  doc.rect(x0, y0, frameW, h).clip();
  doc.lineWidth(0.35).strokeColor('#22343d');
  for (const t of xt.ticks) {
    const gx = X([le[0] + t * chord, 0]);
    doc.moveTo(gx, y0).lineTo(gx, y0 + h).stroke();
  }
  for (const t of yt.ticks) {
    const gy = Y([0, le[1] + t * chord]);
    doc.moveTo(x0, gy).lineTo(x0 + frameW, gy).stroke();
  }
  doc.restore();
  for (const t of xt.ticks) {
    const gx = X([le[0] + t * chord, 0]);
    if (gx < x0 - 0.5 || gx > x0 + frameW + 0.5) continue;
    doc.moveTo(gx, y0 + h).lineTo(gx, y0 + h + 3).lineWidth(0.5).strokeColor(INK_SOFT).stroke();
    line(doc, tickLabel(t, xt.step), gx - 20, y0 + h + 4, { size: 6.5, color: INK_SOFT, width: 40, align: 'center' });
  }
  for (const t of yt.ticks) {
    const gy = Y([0, le[1] + t * chord]);
    if (gy < y0 - 0.5 || gy > y0 + h + 0.5) continue;
    doc.moveTo(x0 - 3, gy).lineTo(x0, gy).lineWidth(0.5).strokeColor(INK_SOFT).stroke();
    line(doc, tickLabel(t, yt.step), M.left, gy - 3.5, { size: 6.5, color: INK_SOFT, width: AXIS_LEFT - 5, align: 'right' });
  }
  line(doc, 'x/c from the leading edge', x0, y0 + h + 13, { size: 7, color: INK, width: frameW, align: 'center' });
  doc.save();
  doc.rotate(-90, { origin: [M.left + 2, y0 + h / 2] });
  line(doc, 'y/c', M.left + 2 - 20, y0 + h / 2 - 4, { size: 7, color: INK, width: 40, align: 'center' });
  doc.restore();

  const ratios: number[] = [];
  for (const w of result?.waves ?? []) {
    ratios.push(w.pRatioBehind);
    for (const r of w.rays ?? []) ratios.push(r.pRatio);
  }
  for (const f of [...(result?.surfaces.upper ?? []), ...(result?.surfaces.lower ?? [])]) if (f.pRatio !== null) ratios.push(f.pRatio);
  const scale = pressureScale(ratios);

  doc.save();
  doc.rect(x0, y0, frameW, h).clip();
  for (const w of result?.waves ?? []) {
    if (w.kind === 'fan') {
      doc.lineWidth(0.6);
      for (const r of w.rays ?? []) doc.moveTo(X(w.origin), Y(w.origin)).lineTo(X(r.end), Y(r.end)).strokeColor(scale.colour(r.pRatio)).stroke();
    } else if (w.kind === 'shock') {
      doc.lineWidth(1.5).moveTo(X(w.origin), Y(w.origin)).lineTo(X(w.end), Y(w.end)).strokeColor(scale.colour(w.pRatioBehind)).stroke();
    } else {
      doc.lineWidth(0.7).dash(3, { space: 2.5 });
      doc.moveTo(X(w.origin), Y(w.origin)).lineTo(X(w.end), Y(w.end)).strokeColor(w.kind === 'slip' ? '#e9f1f2' : scale.colour(w.pRatioBehind)).stroke();
      doc.undash();
    }
  }
  // The section, then each facet coloured by its pressure.
  if (pts.length >= 3) {
    doc.polygon(...pts.map((p): [number, number] => [X(p), Y(p)])).lineWidth(0.8).fillColor(SECTION_FILL).strokeColor(SECTION_OUTLINE).fillAndStroke();
  }
  doc.lineWidth(2.2).lineCap('round');
  for (const f of [...(result?.surfaces.upper ?? []), ...(result?.surfaces.lower ?? [])]) {
    doc.moveTo(X(f.from), Y(f.from)).lineTo(X(f.to), Y(f.to)).strokeColor(scale.colour(f.solved ? f.pRatio : null)).stroke();
  }
  doc.lineCap('butt');
  for (const l of result?.limits ?? []) doc.circle(X(l.at), Y(l.at), 4).lineWidth(1.2).strokeColor(LIMIT).stroke();
  if (analysis.flap) doc.circle(X(analysis.flap.hinge), Y(analysis.flap.hinge), 2.4).fillColor('#ffffff').fill();

  // Scale bar, bottom left inside the frame: a round fraction of the chord about 1/6 of the frame.
  const target = frameW / 6 / (s * chord);
  const barC = [0.05, 0.1, 0.2, 0.25, 0.5, 1, 2, 5].reduce((b, v) => (Math.abs(v - target) < Math.abs(b - target) ? v : b), 0.25);
  const scaleBarW = barC * chord * s;
  const bx = x0 + 10;
  const by = y0 + h - 12;
  doc.rect(bx - 4, by - 13, scaleBarW + 8, 19).fillColor(CANVAS_BG).fillOpacity(0.85).fill().fillOpacity(1);
  doc.moveTo(bx, by).lineTo(bx + scaleBarW, by).moveTo(bx, by - 3).lineTo(bx, by + 3).moveTo(bx + scaleBarW, by - 3).lineTo(bx + scaleBarW, by + 3).lineWidth(1).strokeColor('#e9f1f2').stroke();
  line(doc, `${num(barC)} c = ${qty(barC * data.document.loads.chordM, 'length', data.units)}`, bx, by - 12, { size: 6.5, color: '#e9f1f2' });
  doc.restore();
  doc.rect(x0, y0, frameW, h).lineWidth(0.6).strokeColor('#9aa8a4').stroke();
  ctx.y = y0 + h + AXIS_BOTTOM + 4;

  // Legend: the colour bar in p/p∞, and what the marks mean.
  const barW = 180;
  const grad = doc.linearGradient(M.left, 0, M.left + barW, 0);
  for (let i = 0; i <= 10; i++) grad.stop(i / 10, interpolateViridis(0.4 + 0.06 * i));
  doc.rect(M.left, ctx.y, barW, 7).fill(grad);
  for (const t of [0, 0.5, 1]) {
    const p = Math.exp(Math.log(scale.min) + t * (Math.log(scale.max) - Math.log(scale.min)));
    const lx = t === 0 ? M.left : t === 1 ? M.left + barW - 40 : M.left + barW / 2 - 20;
    line(doc, num(p, 3), lx, ctx.y + 9, { size: 6.5, color: INK_SOFT, width: 40, align: t === 0 ? 'left' : t === 1 ? 'right' : 'center' });
  }
  line(doc, 'p/p∞ behind each wave and on each facet', M.left + barW + 10, ctx.y - 1, { size: 7.5, color: INK });
  const waveNote = result?.waves.length
    ? 'Solid: shocks; thin rays: expansion fans; dashed: Mach lines and the slip line. Amber rings: where the theory stops holding.'
    : analysis.result
      ? 'The wave map is not stored for this section (very large sections are stored without it).'
      : 'The section could not be solved; only its outline is drawn.';
  paragraph(doc, `${waveNote}${analysis.flap ? ' White dot: flap hinge.' : ''}`, M.left + barW + 10, ctx.y + 9, CONTENT_W - barW - 10, { size: 7, color: INK_SOFT });
  ctx.y += 34;
}

// ---- tables ----

interface Column {
  label: string;
  width: number;
  align?: 'left' | 'right';
}

/** A table with a header row; rows move to a new page (with the header again) as needed. */
function table(ctx: Ctx, columns: Column[], rows: string[][], opts: { size?: number; rowHeight?: number; emphasise?: (i: number) => boolean } = {}): void {
  const { doc } = ctx;
  const size = opts.size ?? 8.5;
  const rh = opts.rowHeight ?? size * 1.75;
  const header = () => {
    let x = M.left;
    for (const c of columns) {
      line(doc, c.label, x + 3, ctx.y + 2, { size: size - 0.5, weight: 'bold', color: INK_SOFT, width: c.width - 6, align: c.align ?? 'left' });
      x += c.width;
    }
    ctx.y += rh;
    doc.moveTo(M.left, ctx.y - 2).lineTo(M.left + columns.reduce((a, c) => a + c.width, 0), ctx.y - 2).lineWidth(0.6).strokeColor(RULE).stroke();
  };
  ensure(ctx, rh * 3);
  header();
  rows.forEach((row, i) => {
    if (ctx.y + rh > BOTTOM) {
      newPage(ctx);
      header();
    }
    if (i % 2 === 1) doc.rect(M.left, ctx.y - 2, columns.reduce((a, c) => a + c.width, 0), rh).fillColor('#f4f6f5').fill();
    let x = M.left;
    row.forEach((cell, j) => {
      const c = itemAt(columns, j);
      line(doc, cell, x + 3, ctx.y + 1, { size, weight: opts.emphasise?.(i) && j === 0 ? 'bold' : 'regular', color: INK, width: c.width - 6, align: c.align ?? 'left' });
      x += c.width;
    });
    ctx.y += rh;
  });
  ctx.y += 8;
}

function conditionAndStatus(ctx: Ctx): void {
  const { data } = ctx;
  const d = sketchCase(data.document);
  const u = data.units;
  heading(ctx, data.document.designPoints.length > 1 ? `Condition — design point “${selectedName(data)}”` : 'Condition');
  const rows: string[][] = [
    ['Mach number M∞', num(d.condition.mach, 5)],
    ['Incidence α (nose up +)', deg(d.condition.alphaDeg)],
    ['Ratio of specific heats γ', num(d.condition.gamma, 5)],
    ['Altitude (1976 standard atmosphere)', d.condition.altitudeM === null ? 'not given (no loads or friction)' : qty(d.condition.altitudeM, 'altitude', u)],
    ['Flap', d.flap ? `hinge at x/c = ${num(d.flap.hingeXOverC, 4)}, deflection δ = ${deg(d.flap.deflectionDeg)} (trailing edge down +)` : 'none'],
    ['Moment point', d.momentPoint ? `(${num(d.momentPoint[0])}, ${num(d.momentPoint[1])}) in drawing units` : 'quarter of the drawn chord aft of the leading edge, on its line'],
    ['Physical chord and span', `${qty(d.loads.chordM, 'length', u)} chord, ${qty(d.loads.spanM, 'length', u)} span`],
    [
      'Friction',
      d.loads.friction === 'none'
        ? 'none (wave drag only)'
        : d.loads.friction === 'mixed'
          ? `mixed, transition at Re ${sci(d.loads.transitionReynolds ?? 5e5)}; flat plate, reference-temperature method`
          : `${d.loads.friction} flat plate, reference-temperature method`,
    ],
    ['Section (as drawn)', `${d.section.points.length} vertices${(() => { const t = thicknessRatio(d.section.points); return t === null ? '' : `, max thickness ${num(100 * t, 3)} % of chord (normal to the chord line)`; })()}`],
  ];
  table(ctx, [{ label: 'Quantity', width: 190 }, { label: 'Value', width: CONTENT_W - 190 }], rows);
  const refText = referenceSentence(data.analysis, qty(d.loads.chordM, 'length', u));
  if (refText) {
    ensure(ctx, 24);
    ctx.y += paragraph(ctx.doc, refText, M.left, ctx.y, CONTENT_W, { size: 8, color: INK }) + 6;
  }

  const a = data.analysis;
  ensure(ctx, 60);
  const ok = a.status === 'ok';
  line(ctx.doc, `Status: ${a.status}`, M.left, ctx.y, { size: 9.5, weight: 'bold', color: ok ? '#2e7d32' : '#b3261e' });
  ctx.y += 14;
  const notes: string[] = [];
  if (ok) notes.push('Attached flow over the whole section; all three theories apply.');
  if (a.problem) notes.push(a.problem);
  for (const l of a.result?.limits ?? []) notes.push(l.message);
  if (!ok && a.result?.coefficients) notes.push('The exact coefficients carry p = 0 (Cp = −2/(γM∞²)) on the facets past the vacuum limit, the theory\'s limiting value.');
  else if (!ok && a.result?.theories) notes.push('Exact coefficients are not given. The linear and second-order columns assume small deflections everywhere and ignore this limit; do not size anything with them here.');
  for (const w of a.result?.warnings ?? []) notes.push(w);
  for (const n of notes) {
    ensure(ctx, 24);
    ctx.y += paragraph(ctx.doc, n, M.left, ctx.y, CONTENT_W, { size: 8.5, color: INK }) + 2;
  }
  ctx.y += 8;
}

function coefficientsTable(ctx: Ctx): void {
  const { data } = ctx;
  const r: SolveResult | null = data.analysis.result;
  heading(ctx, 'Coefficients (per unit span)');
  const c = r?.coefficients ?? null;
  const lin = r?.theories?.linear ?? null;
  const sec = r?.theories?.secondOrder ?? null;
  type Key = keyof Pick<Coefficients, 'cl' | 'cd' | 'cm' | 'xcpOverC' | 'liftToDrag'>;
  // x_cp/c only where it means a location (shared/flight/xcp.ts): a dash and a note below.
  const value = (t: Coefficients | null, k: Key) => (k === 'xcpOverC' ? shownXcpOverC(t?.xcpOverC, t?.cn) : (t?.[k] ?? null));
  const diff = (t: TheoryResult | null, k: Key) => {
    if (!t || !c) return '—';
    const d = k === 'cl' || k === 'cd' || k === 'cm' ? t.difference[k] : (() => {
      const e = value(c, k);
      const v = value(t, k);
      return e === null || v === null || Math.abs(e) < 1e-9 ? null : (100 * (v - e)) / Math.abs(e);
    })();
    return d === null ? '—' : `${d > 0 ? '+' : ''}${num(d, 3)} %`;
  };
  const rows: [string, Key][] = [
    ['cl (lift over q∞·c)', 'cl'],
    ['cd (wave drag over q∞·c)', 'cd'],
    ['cm (about the moment point, nose up +)', 'cm'],
    ['x_cp/c (from the leading edge)', 'xcpOverC'],
    ['L/D (wave drag only)', 'liftToDrag'],
  ];
  const body = rows.map(([label, k]) => [label, num(value(c, k)), num(value(lin, k)), diff(lin, k), num(value(sec, k)), diff(sec, k)]);
  const hm = data.analysis.flap?.hingeMoment;
  if (hm) body.push(['ch (hinge moment over q∞·c_f², TE down +)', num(hm.exact), num(hm.linear), '', num(hm.secondOrder), '']);
  table(ctx, [
    { label: '', width: 187 },
    { label: 'exact', width: 66, align: 'right' },
    { label: 'linear', width: 66, align: 'right' },
    { label: 'vs exact', width: 60, align: 'right' },
    { label: 'second-order', width: 68, align: 'right' },
    { label: 'vs exact', width: 60, align: 'right' },
  ], body);
  if ([c, lin, sec].some((t) => t && xcpLeftOut(t.xcpOverC, t.cn))) {
    ensure(ctx, 20);
    ctx.y += paragraph(ctx.doc, `— in x_cp/c: ${XCP_UNDEFINED_NOTE}; cm gives the moment there.`, M.left, ctx.y, CONTENT_W, { size: 7.5, color: INK_SOFT }) + 6;
  }
  if (data.analysis.flap) {
    ensure(ctx, 20);
    ctx.y += paragraph(ctx.doc, `Flap chord c_f = ${num(data.analysis.flap.flapChordOverC, 4)} c. A negative ch tends to raise the trailing edge (restoring for a flap deflected down).`, M.left, ctx.y, CONTENT_W, { size: 7.5, color: INK_SOFT }) + 6;
  }
}

function loadsTables(ctx: Ctx): void {
  const { data } = ctx;
  const u = data.units;
  const loads = data.analysis.loads;
  heading(ctx, `Free stream and loads (${u === 'si' ? 'SI' : 'US customary'} units)`, loads ? 8 * 15 + 10 : 40);
  if (!loads) {
    ctx.y += paragraph(ctx.doc, data.analysis.loadsNote ?? 'No loads for this analysis.', M.left, ctx.y, CONTENT_W, { size: 8.5, color: INK }) + 10;
    return;
  }
  const atm = loads.atmosphere;
  const half = (CONTENT_W - 16) / 2;
  ensure(ctx, 8 * 15 + 10);
  // Taken after any page break: both tables start from the same top.
  const startY = ctx.y;
  const left: string[][] = [
    ['q∞ (dynamic pressure)', qty(loads.dynamicPressurePa, 'pressure', u)],
    ['V∞ (flight speed)', qty(loads.velocityMS, 'speed', u)],
    ['Re (on the chord)', sci(loads.reynoldsChord)],
    ['p∞', qty(atm.pressurePa, 'pressure', u)],
    ['T∞', qty(atm.temperatureK, 'temperature', u)],
    ['ρ∞', qty(atm.densityKgM3, 'density', u)],
    ['μ∞', `${sci(toDisplay(atm.viscosityPaS, 'viscosity', u))} ${unitLabel('viscosity', u)}`],
    ['a∞ (speed of sound, at the condition’s γ)', qty(loads.gas.speedOfSoundMS, 'speed', u)],
  ];
  const f = loads.friction;
  const right: string[][] = [
    ['cd wave', num(loads.cdWave)],
    ['cd friction', f.regime === 'none' ? 'none' : num(f.cdFriction)],
    ['cd total (estimate)', num(loads.cdTotal)],
    ['cf upper / lower', f.regime === 'none' ? '—' : `${num(f.cfUpper)} / ${num(f.cfLower)}`],
    ['L/D with friction', num(data.analysis.result?.coefficients ? data.analysis.result.coefficients.cl / loads.cdTotal : null)],
  ];
  // Two side-by-side tables: draw the left, remember its height, then the right from the same top.
  const tableAt = (x: number, rows: string[][]) => {
    let y = startY;
    rows.forEach((row, i) => {
      if (i % 2 === 1) ctx.doc.rect(x, y - 2, half, 15).fillColor('#f4f6f5').fill();
      line(ctx.doc, itemAt(row, 0), x + 3, y + 1, { size: 8.5, color: INK });
      line(ctx.doc, itemAt(row, 1), x + 3, y + 1, { size: 8.5, color: INK, width: half - 6, align: 'right' });
      y += 15;
    });
    return y;
  };
  const yl = tableAt(M.left, left);
  const yr = tableAt(M.left + half + 16, right);
  ctx.y = Math.max(yl, yr) + 10;

  const ps = loads.perSpan;
  const tot = loads.total;
  const span = data.document.loads.spanM;
  const rows: string[][] = [
    ['Lift', qty(ps.liftNPerM, 'forcePerSpan', u), qty(tot.liftN, 'force', u)],
    ['Drag, wave', qty(ps.dragWaveNPerM, 'forcePerSpan', u), qty(ps.dragWaveNPerM * span, 'force', u)],
    ['Drag, friction', qty(ps.dragFrictionNPerM, 'forcePerSpan', u), qty(ps.dragFrictionNPerM * span, 'force', u)],
    ['Drag, total', qty(ps.dragTotalNPerM, 'forcePerSpan', u), qty(tot.dragN, 'force', u)],
    ['Pitching moment (nose up +)', qty(ps.momentNMPerM, 'momentPerSpan', u), qty(tot.momentNM, 'moment', u)],
    ['Hinge moment (TE down +)', qty(ps.hingeMomentNMPerM, 'momentPerSpan', u), qty(tot.hingeMomentNM, 'moment', u)],
  ];
  table(ctx, [
    { label: '', width: 187 },
    { label: 'per unit span', width: 160, align: 'right' },
    { label: `over the span (${qty(span, 'length', u)})`, width: CONTENT_W - 347, align: 'right' },
  ], rows);
  ensure(ctx, 20);
  const foot = [
    'Loads act on the physical chord (of the section as drawn) and span given in the sketch.',
    frictionSentence(data.analysis),
    ...loads.friction.flags.map((flag) => `Friction outside a law's range — ${flag}`),
    gasModelSentence(data.analysis),
  ].filter((t): t is string => !!t);
  for (const t of foot) {
    ensure(ctx, 20);
    ctx.y += paragraph(ctx.doc, t, M.left, ctx.y, CONTENT_W, { size: 7.5, color: INK_SOFT }) + 3;
  }
  ctx.y += 3;
}

// ---- design points, Cp chart, per-facet and coordinates tables ----

/** Every design point side by side; the selected one (which the rest of the report shows) in bold. */
function designPointsTable(ctx: Ctx): void {
  const { data } = ctx;
  const u = data.units;
  const doc = data.document;
  const shownId = data.points.selectedPointId;
  heading(ctx, `Design points (${doc.designPoints.length})`, 50);
  const flap = !!doc.flap;
  const rows = doc.designPoints.map((p) => {
    const a = data.points.points.find((x) => x.id === p.id)?.analysis ?? null;
    const c = a?.result?.coefficients ?? null;
    const loads = a?.loads ?? null;
    return [
      p.name,
      num(p.condition.mach),
      deg(p.condition.alphaDeg),
      num(p.condition.gamma),
      p.condition.altitudeM === null ? '—' : qty(p.condition.altitudeM, 'altitude', u),
      ...(flap ? [deg(p.flapDeflectionDeg)] : []),
      a?.status ?? 'not solved',
      num(c?.cl ?? null),
      num(c?.cd ?? null),
      num(c?.cm ?? null),
      loads ? qty(loads.perSpan.liftNPerM, 'forcePerSpan', u) : '—',
    ];
  });
  // Column widths (points): name, Mach, α, γ, altitude, [flap δ], status, cl, cd, cm; lift takes the rest.
  const w = flap ? [76, 30, 32, 26, 58, 34, 38, 44, 46, 48] : [96, 34, 36, 30, 62, 0, 44, 48, 50, 50];
  const at = (i: number) => w[i] ?? 0;
  const fixed = w.reduce((a, b) => a + b, 0);
  table(
    ctx,
    [
      { label: 'design point', width: at(0) },
      { label: 'Mach', width: at(1), align: 'right' },
      { label: 'α', width: at(2), align: 'right' },
      { label: 'γ', width: at(3), align: 'right' },
      { label: 'altitude', width: at(4), align: 'right' },
      ...(flap ? [{ label: 'flap δ', width: at(5), align: 'right' as const }] : []),
      { label: 'status', width: at(6) },
      { label: 'cl', width: at(7), align: 'right' },
      { label: 'cd wave', width: at(8), align: 'right' },
      { label: 'cm', width: at(9), align: 'right' },
      { label: 'lift per span', width: CONTENT_W - fixed, align: 'right' },
    ],
    rows,
    { size: 7.5, emphasise: (i) => doc.designPoints[i]?.id === shownId },
  );
  const shown = doc.designPoints.find((p) => p.id === shownId);
  if (doc.designPoints.length > 1 && shown) {
    ctx.y += paragraph(ctx.doc, `Exact (shock-expansion) coefficients. The wave map, condition, Cp chart and tables below are for “${shown.name}” (bold), the sketch's selected design point.`, M.left, ctx.y - 4, CONTENT_W, { size: 7.5, color: INK_SOFT }) + 6;
  }
}

/** Cp along the chord for both surfaces and the three theories, negative up (common practice; the editor's Cp charts agree). */
function cpChart(ctx: Ctx): void {
  const r = ctx.data.analysis.result;
  if (!r) return;
  const h = 230;
  heading(ctx, 'Pressure coefficient along the chord', h + 10);
  const ref = r.geometry.reference;
  const xc = (p: Point) => (p[0] - ref.leadingEdge[0]) / ref.chord;
  const steps = (facets: Facet[], pick: (f: Facet) => number | null) =>
    facets.flatMap((f): [number, number, number][] => {
      const v = pick(f);
      const a = xc(f.from);
      const b = xc(f.to);
      return v === null ? [] : [[Math.min(a, b), Math.max(a, b), v]];
    });
  const UPPER = '#0b6e69';
  const LOWER = '#c0561b';
  const LINEAR: [number, number] = [4, 2.5];
  const SECOND: [number, number] = [1.2, 1.8];
  drawStepChart(ctx.doc, M.left, ctx.y, CONTENT_W, h, {
    title: `Cp on each facet — upper and lower surface, three theories`,
    xLabel: 'x/c from the leading edge',
    yLabel: 'Cp (negative up)',
    invertY: true,
    series: [
      { colour: UPPER, steps: steps(r.surfaces.upper, (f) => f.cp), width: 1.6 },
      { colour: LOWER, steps: steps(r.surfaces.lower, (f) => f.cp), width: 1.6 },
      { colour: UPPER, steps: steps(r.surfaces.upper, (f) => f.cpLinear), dash: LINEAR },
      { colour: LOWER, steps: steps(r.surfaces.lower, (f) => f.cpLinear), dash: LINEAR },
      { colour: UPPER, steps: steps(r.surfaces.upper, (f) => f.cpSecondOrder), dash: SECOND },
      { colour: LOWER, steps: steps(r.surfaces.lower, (f) => f.cpSecondOrder), dash: SECOND },
    ],
    legend: [
      { colour: UPPER, label: 'upper surface' },
      { colour: LOWER, label: 'lower surface' },
      { colour: INK, label: 'exact (shock-expansion)' },
      { colour: INK, dash: LINEAR, label: 'linear (Ackeret)' },
      { colour: INK, dash: SECOND, label: 'second-order (Busemann)' },
    ],
  });
  ctx.y += h + 8;
}

/** Each facet: where it is, its turn and wave, the state on it and its pressure and load. */
function facetTable(ctx: Ctx): void {
  const { data } = ctx;
  const r = data.analysis.result;
  if (!r) return;
  const u = data.units;
  heading(ctx, 'Per facet (selected design point)');
  const loads = facetLoads(data.analysis, data.document.loads);
  const byFacet = new Map(loads.ok ? loads.loads.facets.map((f) => [`${f.surface}|${f.facet}`, f]) : []);
  const rows = (['upper', 'lower'] as const).flatMap((surface) =>
    r.surfaces[surface].map((f) => {
      const l = byFacet.get(`${surface}|${f.index}`);
      return [
        `${surface} ${f.index}`,
        num(f.xMidOverC, 3),
        deg(f.thetaDeg),
        f.vacuum ? 'vacuum' : f.wave,
        num(f.mach),
        num(f.pRatio),
        num(f.cp),
        num(f.cpLinear),
        num(f.cpSecondOrder),
        l?.pressurePa === null || l === undefined ? '—' : qty(l.pressurePa, 'pressure', u),
        l?.normalNPerM === null || l === undefined ? '—' : qty(l.normalNPerM, 'forcePerSpan', u),
      ];
    }),
  );
  table(ctx, [
    { label: 'facet', width: 44 },
    { label: 'x_mid/c', width: 38, align: 'right' },
    { label: 'θ', width: 38, align: 'right' },
    { label: 'wave', width: 38 },
    { label: 'M', width: 38, align: 'right' },
    { label: 'p/p∞', width: 42, align: 'right' },
    { label: 'Cp exact', width: 44, align: 'right' },
    { label: 'Cp linear', width: 44, align: 'right' },
    { label: 'Cp 2nd-order', width: 50, align: 'right' },
    { label: 'p', width: 64, align: 'right' },
    { label: '(p − p∞)·length', width: CONTENT_W - 440, align: 'right' },
  ], rows, { size: 7, rowHeight: 11.5 });
  // With a flap the facets are the deflected section's (the hinge a vertex of each surface):
  // they are numbered against the table of the section as analysed, printed below.
  const flap = data.analysis.flap;
  const which = flap
    ? `Facet i is the edge from vertex i to i + 1 of the table “Section coordinates as analysed” (flap deflected ${deg(flap.deflectionDeg)} about the hinge at x/c = ${num(flap.hingeXOverC, 4)}, which is a vertex of both surfaces), as in every CSV export`
    : 'Facet i is the edge from vertex i to i + 1 of the coordinates table, as on the canvas and in every CSV export';
  const note = loads.ok
    ? `${which}; rows run nose → tail on each surface. θ: deflection from the free stream (+ into the flow); wave at the facet's leading vertex. p and (p − p∞)·length per unit span (positive pressing on the facet) at the condition's altitude on the ${qty(data.document.loads.chordM, 'length', u)} chord; the Export menu's “Loads per facet (CSV)” has the forces and moments in both axes.`
    : `${which}; rows run nose → tail on each surface. No pressures in ${u === 'si' ? 'Pa' : 'lbf/ft²'}: ${loads.reason}`;
  ctx.y += paragraph(ctx.doc, note, M.left, ctx.y - 4, CONTENT_W, { size: 7.5, color: INK_SOFT }) + 6;
}

/**
 * The section's vertices, in drawing units and physical lengths, two columns of vertices. With a
 * flap, first the section as analysed (flap deflected, hinge vertices inserted: the vertices the
 * per-facet table is numbered against), then the section as drawn.
 */
function coordinatesTable(ctx: Ctx): void {
  const { data } = ctx;
  const flap = data.analysis.flap;
  if (flap) {
    vertexTable(
      ctx,
      data.analysis.solvedPoints,
      `Section coordinates as analysed — flap deflected ${deg(flap.deflectionDeg)} about x/c = ${num(flap.hingeXOverC, 4)} (${data.analysis.solvedPoints.length} vertices)`,
      `The section the solver saw: the flap rotated by δ = ${deg(flap.deflectionDeg)} (trailing edge down +) about the hinge, midway between the surfaces at x/c = ${num(flap.hingeXOverC, 4)}, a vertex inserted where each surface crosses the hinge line. The per-facet table is numbered against these vertices.`,
    );
  }
  vertexTable(ctx, data.document.section.points, `Section coordinates as drawn (${data.document.section.points.length} vertices)`, flap ? 'The section as stored and shown on the canvas, flap undeflected.' : null);
}

function vertexTable(ctx: Ctx, pts: readonly Point[], title: string, intro: string | null): void {
  const { data } = ctx;
  const u = data.units;
  const r = data.analysis.result;
  heading(ctx, title);
  if (intro) ctx.y += paragraph(ctx.doc, intro, M.left, ctx.y, CONTENT_W, { size: 7.5, color: INK_SOFT }) + 4;
  if (pts.length > REPORT_VERTEX_TABLE_MAX) {
    ctx.y += paragraph(ctx.doc, `The section has ${pts.length} vertices; tables of more than ${REPORT_VERTEX_TABLE_MAX} are not printed. Export the coordinates as CSV from the editor.`, M.left, ctx.y, CONTENT_W, { size: 8.5, color: INK }) + 8;
    return;
  }
  // Physical lengths from the reference leading edge, scaled so the drawn chord is the sketch's chord.
  const chord = r?.geometry.reference.chord ?? null;
  const le = r?.geometry.reference.leadingEdge ?? null;
  const k = chord ? data.document.loads.chordM / chord : null;
  const cell = (p: Point, i: number) => [
    String(i),
    num(p[0], 5),
    num(p[1], 5),
    k !== null && le ? qty((p[0] - le[0]) * k, 'length', u) : '—',
    k !== null && le ? qty((p[1] - le[1]) * k, 'length', u) : '—',
  ];
  const half = Math.ceil(pts.length / 2);
  const rows = Array.from({ length: half }, (_, i) => {
    const a = pts[i];
    const b = pts[i + half];
    return [...(a ? cell(a, i) : []), ...(b ? cell(b, i + half) : ['', '', '', '', ''])];
  });
  const group = (): Column[] => [
    { label: '#', width: 24, align: 'right' },
    { label: 'x', width: 50, align: 'right' },
    { label: 'y', width: 50, align: 'right' },
    { label: 'x from LE', width: 64, align: 'right' },
    { label: 'y from LE', width: 64, align: 'right' },
  ];
  const gap: Column = { label: '', width: 0 };
  void gap;
  table(ctx, [...group(), ...group()], rows, { size: 7, rowHeight: 11.5 });
  ctx.y += paragraph(ctx.doc, `x, y in drawing units (body axes, x aft, y up, in drawing order); physical positions from the leading edge on the ${qty(data.document.loads.chordM, 'length', u)} chord.`, M.left, ctx.y - 4, CONTENT_W, { size: 7.5, color: INK_SOFT }) + 6;
}

// ---- study ----

function describeStudy(study: ReportStudy, units: UnitSystem): string {
  const r = study.results;
  const span = (v: number[], unit: string) => (v.length === 1 ? `${num(v[0])}${unit}` : `${num(v[0])}${unit} to ${num(v[v.length - 1])}${unit} (${v.length} values)`);
  const flaps = r.flapsDeg[0] === null ? 'no flap' : `flap ${r.flapsDeg.map((f) => `${num(f)}°`).join(', ')}`;
  const alt = r.altitudeM === null ? 'no altitude (wave drag only)' : `altitude ${qty(r.altitudeM, 'altitude', units)}, ${r.friction === 'none' ? 'no friction' : `${r.friction} friction`}`;
  return `Mach ${span(r.machs, '')} × α ${span(r.alphasDeg, '°')} × ${flaps}; ${alt}.`;
}

function studyPages(ctx: Ctx, study: ReportStudy): void {
  const { doc, data } = ctx;
  newPage(ctx);
  const results = study.results;
  const rows = unpackStudyRows(results);
  heading(ctx, `Study: ${study.name}`);
  ctx.y += paragraph(doc, describeStudy(study, data.units), M.left, ctx.y, CONTENT_W, { size: 8.5, color: INK });
  const counts = Object.entries(results.counts).map(([k, v]) => `${k} ${v}`).join(', ');
  const rev = study.revision === data.revision ? `computed on revision ${study.revision} (the revision of this report)` : `computed on revision ${study.revision}; this report's section is revision ${data.revision}`;
  ctx.y += paragraph(doc, `${rows.length} points, ${rev}; by ${study.createdByName ?? 'someone'} on ${study.createdAt.slice(0, 10)}. Status counts: ${counts}.`, M.left, ctx.y, CONTENT_W, { size: 8.5, color: INK_SOFT }) + 4;

  // Charts show one flap deflection (the one nearest zero) with a line per Mach number.
  const flap = results.flapsDeg.reduce<number | null>((best, f) => (f === null ? null : best === null || Math.abs(f) < Math.abs(best) ? f : best), results.flapsDeg[0] ?? null);
  const machs = results.machs;
  const colour = (m: number) => machColour(machs.indexOf(m), machs.length);
  const lineOf = (m: number, pick: (r: StudyRow) => [number | null, number | null]) =>
    rows.filter((r) => r.mach === m && r.flapDeg === flap).map((r) => {
      const [x, y] = pick(r);
      return x === null || y === null ? null : ([x, y] as [number, number]);
    });
  const series = (pick: (r: StudyRow) => [number | null, number | null]) => machs.map((m) => ({ colour: colour(m), points: lineOf(m, pick) }));
  const best = results.summaries.flatMap((s) => s.best.filter((b) => b.flapDeg === flap).map((b) => ({ mach: s.mach, ...b })));
  const detach = results.summaries.flatMap((s) => [s.detachAlphaHighDeg, s.detachAlphaLowDeg].filter((a): a is number => a !== null).map((x) => ({ x, colour: colour(s.mach) })));
  const alphaRange: [number, number] = [itemAt(results.alphasDeg, 0), itemAt(results.alphasDeg, results.alphasDeg.length - 1)];

  if (flap !== null) ctx.y += paragraph(doc, `Charts at flap deflection δ = ${num(flap)}°.`, M.left, ctx.y, CONTENT_W, { size: 8.5, color: INK_SOFT });
  ctx.y += 4;
  drawMachKey(doc, M.left, ctx.y, CONTENT_W, machs);
  ctx.y += 24;

  const charts: LineChart[] = [
    { title: 'cl against α (exact)', xLabel: 'α (°)', yLabel: 'cl', series: series((r) => [r.alphaDeg, r.cl]), axisMarks: detach, xRange: alphaRange },
    { title: 'Drag polar: cl against cd (wave + friction)', xLabel: 'cd total', yLabel: 'cl', series: series((r) => [r.cdTotal, r.cl]), markers: best.map((b) => ({ x: b.cdTotal, y: b.cl, colour: colour(b.mach) })) },
    { title: 'L/D against α', xLabel: 'α (°)', yLabel: 'L/D', series: series((r) => [r.alphaDeg, r.liftToDrag]), markers: best.map((b) => ({ x: b.alphaDeg, y: b.liftToDrag, colour: colour(b.mach) })), axisMarks: detach, xRange: alphaRange },
    { title: 'cm against α (exact)', xLabel: 'α (°)', yLabel: 'cm', series: series((r) => [r.alphaDeg, r.cm]), axisMarks: detach, xRange: alphaRange },
  ];
  if (results.flapsDeg[0] !== null && results.flapsDeg.length > 1) {
    // Hinge moment against deflection at the swept α nearest the sketch's own.
    const alpha = sketchCase(data.document).condition.alphaDeg;
    const a0 = results.alphasDeg.reduce((b, a) => (Math.abs(a - alpha) < Math.abs(b - alpha) ? a : b), firstItem(results.alphasDeg));
    charts.push({
      title: `Hinge moment ch against δ at α = ${num(a0)}° (exact)`,
      xLabel: 'δ (°, trailing edge down +)',
      yLabel: 'ch',
      series: machs.map((m) => ({ colour: colour(m), points: rows.filter((r) => r.mach === m && r.alphaDeg === a0).map((r) => (r.chExact === null ? null : ([r.flapDeg!, r.chExact] as [number, number]))) })),
    });
  }
  const cw = (CONTENT_W - 18) / 2;
  const chH = 196;
  for (let i = 0; i < charts.length; i += 2) {
    ensure(ctx, chH + 8);
    drawLineChart(doc, M.left, ctx.y, cw, chH, itemAt(charts, i));
    if (charts[i + 1]) drawLineChart(doc, M.left + cw + 18, ctx.y, cw, chH, itemAt(charts, i + 1));
    ctx.y += chH + 10;
  }

  heading(ctx, 'Per Mach number: nose shock detachment and best L/D');
  const summaryRows = results.summaries.flatMap((s) => {
    const bests = s.best.length ? s.best : [null];
    return bests.map((b, i) => [
      i === 0 ? num(s.mach) : '',
      i === 0 ? deg(s.detachAlphaLowDeg) : '',
      i === 0 ? deg(s.detachAlphaHighDeg) : '',
      b ? (b.flapDeg === null ? '—' : deg(b.flapDeg)) : '—',
      b ? deg(b.alphaDeg) : '—',
      b ? num(b.liftToDrag) : 'no ok point',
      b ? num(b.cl) : '—',
      b ? num(b.cdTotal) : '—',
    ]);
  });
  table(ctx, [
    { label: 'Mach', width: 52, align: 'right' },
    { label: 'detaches below α', width: 74, align: 'right' },
    { label: 'detaches above α', width: 74, align: 'right' },
    { label: 'flap δ', width: 52, align: 'right' },
    { label: 'best L/D at α', width: 70, align: 'right' },
    { label: 'best L/D', width: 60, align: 'right' },
    { label: 'cl there', width: 60, align: 'right' },
    { label: 'cd total there', width: CONTENT_W - 442, align: 'right' },
  ], summaryRows, { size: 7.5 });

  heading(ctx, 'Study points');
  if (rows.length > REPORT_POINT_TABLE_MAX) {
    ctx.y += paragraph(doc, `The study has ${rows.length} points; tables of more than ${REPORT_POINT_TABLE_MAX} are not printed. Export the full table as CSV from the study page.`, M.left, ctx.y, CONTENT_W, { size: 8.5, color: INK }) + 8;
    return;
  }
  table(ctx, [
    { label: 'Mach', width: 38, align: 'right' },
    { label: 'α', width: 38, align: 'right' },
    { label: 'δ', width: 34, align: 'right' },
    { label: 'status', width: 52 },
    { label: 'cl', width: 52, align: 'right' },
    { label: 'cd total', width: 56, align: 'right' },
    { label: 'cm', width: 56, align: 'right' },
    { label: 'L/D', width: 48, align: 'right' },
    { label: 'ch', width: 56, align: 'right' },
    { label: 'cl linear', width: CONTENT_W - 430, align: 'right' },
  ], rows.map((r) => [num(r.mach), deg(r.alphaDeg), r.flapDeg === null ? '—' : deg(r.flapDeg), r.status, num(r.cl), num(r.cdTotal), num(r.cm), num(r.liftToDrag), num(r.chExact), num(r.clLinear)]), { size: 7, rowHeight: 11.5 });
}

function footers(ctx: Ctx): void {
  const { doc, data } = ctx;
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // Drawing below the bottom margin would start a new page; lift the margin while drawing.
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = PAGE.height - M.bottom + 14;
    doc.moveTo(M.left, y - 5).lineTo(M.left + CONTENT_W, y - 5).lineWidth(0.5).strokeColor(RULE).stroke();
    line(doc, `Shockwright · ${data.title} · revision ${data.revision}`, M.left, y, { size: 7, color: INK_SOFT });
    line(doc, `page ${i - range.start + 1} of ${range.count}`, M.left, y, { size: 7, color: INK_SOFT, width: CONTENT_W, align: 'right' });
    paragraph(doc, RESULTS_CAUTION, M.left, y + 11, CONTENT_W, { size: 6.5, color: INK_SOFT });
    doc.page.margins.bottom = bottom;
  }
}
