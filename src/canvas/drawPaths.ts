/**
 * Plain drawing primitives in screen pixels. Renderers produce these (pure, testable); one
 * Konva Shape per layer strokes them all in its sceneFunc, which keeps hundreds of wave lines
 * to a single node and a single draw call per layer.
 */
import { present } from '@shared/util/invariant';

export interface StrokePath {
  /** Flat [x0, y0, x1, y1, …] in screen pixels. */
  points: number[];
  colour: string;
  width: number;
  dash?: number[];
  alpha?: number;
  closed?: boolean;
  /** Fill colour for closed paths. */
  fill?: string;
}

export interface Dot {
  x: number;
  y: number;
  radius: number;
  fill: string;
  stroke?: string;
  strokeWidth?: number;
}

export interface TextItem {
  x: number;
  y: number;
  text: string;
  colour: string;
  /** CSS font shorthand. */
  font: string;
  align?: CanvasTextAlign;
  baseline?: CanvasTextBaseline;
}

/** A horizontal colour gradient (legend). */
export interface GradientBar {
  x: number;
  y: number;
  width: number;
  height: number;
  stops: [number, string][];
}

/**
 * A picture of `rows` rows of `rowHeight` screen pixels, one pixel wide per column (the
 * pressure field): `pixels` holds RGBA bytes (4 per column, row by row), 0 = not filled. Drawn
 * at (x, y), `height` pixels tall (the last row may be cut), with `alpha` over everything.
 */
export interface RowImage {
  x: number;
  y: number;
  width: number;
  height: number;
  rows: number;
  rowHeight: number;
  alpha: number;
  pixels: Uint8ClampedArray<ArrayBuffer>;
}

export interface DrawList {
  /** A row picture drawn first, in one call (the pressure field). */
  image?: RowImage;
  paths: StrokePath[];
  dots: Dot[];
  texts?: TextItem[];
  bars?: GradientBar[];
  /**
   * The paths may be stroked in any order (thin lines whose overlaps nobody can see, e.g. the
   * wave map): unfilled paths of the same style are then stroked together, one call per style.
   */
  unordered?: boolean;
}

/**
 * Lines at most this wide are stroked 1 px wide: software rasterisers (Chromium without a GPU)
 * draw 1-px lines by a fast path, about three times cheaper than 1.1 px, and the difference
 * cannot be seen. The wave map's hundreds of fan rays are what this is for.
 */
export const HAIRLINE_MAX_PX = 1.25;

function strokeWidth(width: number): number {
  return width > 1 && width <= HAIRLINE_MAX_PX ? 1 : width;
}

export const EMPTY_DRAW_LIST: DrawList = { paths: [], dots: [] };

/** Draws a list on a 2D context (used inside Konva sceneFuncs and by tests with a fake). */
export function drawList(ctx: CanvasRenderingContext2D, list: DrawList): void {
  ctx.save();
  ctx.lineCap = 'round';
  ctx.lineJoin = 'round';
  if (list.image) drawRowImage(ctx, list.image);
  const ordered = list.unordered ? strokeBatches(ctx, list.paths) : list.paths;
  for (const p of ordered) {
    if (p.points.length < 4) continue;
    ctx.beginPath();
    const pts = p.points;
    ctx.moveTo(present(pts[0], 0, pts), present(pts[1], 1, pts));
    for (let i = 2; i < pts.length; i += 2) ctx.lineTo(present(pts[i], i, pts), present(pts[i + 1], i + 1, pts));
    if (p.closed) ctx.closePath();
    ctx.globalAlpha = p.alpha ?? 1;
    if (p.fill) {
      ctx.fillStyle = p.fill;
      ctx.fill();
    }
    if (p.width > 0) {
      ctx.setLineDash(p.dash ?? []);
      ctx.strokeStyle = p.colour;
      ctx.lineWidth = strokeWidth(p.width);
      ctx.stroke();
    }
  }
  ctx.globalAlpha = 1;
  ctx.setLineDash([]);
  for (const d of list.dots) {
    ctx.beginPath();
    ctx.arc(d.x, d.y, d.radius, 0, Math.PI * 2);
    ctx.fillStyle = d.fill;
    ctx.fill();
    if (d.stroke) {
      ctx.strokeStyle = d.stroke;
      ctx.lineWidth = d.strokeWidth ?? 1;
      ctx.stroke();
    }
  }
  for (const b of list.bars ?? []) {
    const g = ctx.createLinearGradient(b.x, 0, b.x + b.width, 0);
    for (const [t, c] of b.stops) g.addColorStop(t, c);
    ctx.fillStyle = g;
    ctx.fillRect(b.x, b.y, b.width, b.height);
  }
  for (const t of list.texts ?? []) {
    ctx.font = t.font;
    ctx.fillStyle = t.colour;
    ctx.textAlign = t.align ?? 'left';
    ctx.textBaseline = t.baseline ?? 'alphabetic';
    ctx.fillText(t.text, t.x, t.y);
  }
  ctx.restore();
}

/** A scratch canvas the row pictures are put on before being drawn scaled (reused). */
let scratch: { canvas: OffscreenCanvas | HTMLCanvasElement; ctx: OffscreenCanvasRenderingContext2D | CanvasRenderingContext2D } | null = null;

function scratchContext(width: number, height: number) {
  if (!scratch) {
    const canvas = typeof OffscreenCanvas !== 'undefined' ? new OffscreenCanvas(width, height) : typeof document !== 'undefined' ? document.createElement('canvas') : null;
    const ctx = canvas?.getContext('2d') as OffscreenCanvasRenderingContext2D | CanvasRenderingContext2D | null | undefined;
    if (!canvas || !ctx) return null;
    scratch = { canvas, ctx };
  }
  if (scratch.canvas.width < width) scratch.canvas.width = width;
  if (scratch.canvas.height < height) scratch.canvas.height = height;
  return scratch;
}

/**
 * Draws a row picture: its pixels are put on a scratch canvas one pixel per row and drawn
 * stretched to the rows' height without smoothing — one image draw, where filling the same
 * rows as rectangles costs the software rasteriser several times more (README [DR3]).
 */
function drawRowImage(ctx: CanvasRenderingContext2D, image: RowImage): void {
  if (image.width <= 0 || image.rows <= 0 || typeof ImageData === 'undefined') return;
  const s = scratchContext(image.width, image.rows);
  if (!s) return;
  s.ctx.putImageData(new ImageData(image.pixels, image.width, image.rows), 0, 0);
  ctx.save();
  ctx.beginPath();
  ctx.rect(image.x, image.y, image.width, image.height);
  ctx.clip();
  ctx.globalAlpha = image.alpha;
  ctx.imageSmoothingEnabled = false;
  ctx.drawImage(s.canvas, 0, 0, image.width, image.rows, image.x, image.y, image.width, image.rows * image.rowHeight);
  ctx.restore();
}

/**
 * Strokes the open, unfilled paths of an unordered list grouped by style (one path and one
 * stroke call per colour, width, alpha and dash) and returns the others, to be drawn in order.
 */
function strokeBatches(ctx: CanvasRenderingContext2D, paths: readonly StrokePath[]): StrokePath[] {
  const rest: StrokePath[] = [];
  const groups = new Map<string, StrokePath[]>();
  for (const p of paths) {
    if (p.fill || p.closed || p.width <= 0 || p.points.length < 4) {
      rest.push(p);
      continue;
    }
    const key = `${p.colour}|${strokeWidth(p.width)}|${p.alpha ?? 1}|${p.dash?.join(',') ?? ''}`;
    const group = groups.get(key);
    if (group) group.push(p);
    else groups.set(key, [p]);
  }
  for (const group of groups.values()) {
    const first = present(group[0], 0, group);
    ctx.beginPath();
    for (const p of group) {
      const pts = p.points;
      ctx.moveTo(present(pts[0], 0, pts), present(pts[1], 1, pts));
      for (let i = 2; i < pts.length; i += 2) ctx.lineTo(present(pts[i], i, pts), present(pts[i + 1], i + 1, pts));
    }
    ctx.globalAlpha = first.alpha ?? 1;
    ctx.setLineDash(first.dash ?? []);
    ctx.strokeStyle = first.colour;
    ctx.lineWidth = strokeWidth(first.width);
    ctx.stroke();
  }
  return rest;
}
