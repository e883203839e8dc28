import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';

/**
 * Fonts and text for the PDF reports. Both fonts ship inside npm packages (nothing is fetched at
 * run time) and are embedded, subset, by pdfkit: Work Sans (the app's face) for text, and DejaVu
 * Sans for the characters Work Sans's Latin files lack (α, γ, θ, ∞, √, …). Each string is split
 * into runs by font, so a label like "q∞ at α = 4°" prints in Work Sans with a DejaVu "∞" and "α".
 */
export const FONT = {
  regular: 'sw-regular',
  bold: 'sw-bold',
  fallback: 'sw-fallback',
  fallbackBold: 'sw-fallback-bold',
} as const;
export type FontWeight = 'regular' | 'bold';

const require = createRequire(import.meta.url);
const fontFile = (pkg: string, file: string) => path.join(path.dirname(require.resolve(`${pkg}/package.json`)), 'files', file);

let cache: Record<string, Buffer> | null = null;

/** The four font files, read once per process. */
export function fontBuffers(): Record<(typeof FONT)[keyof typeof FONT], Buffer> {
  cache ??= {
    [FONT.regular]: readFileSync(fontFile('@fontsource/work-sans', 'work-sans-latin-400-normal.woff')),
    [FONT.bold]: readFileSync(fontFile('@fontsource/work-sans', 'work-sans-latin-600-normal.woff')),
    [FONT.fallback]: readFileSync(fontFile('@fontsource/dejavu-sans', 'dejavu-sans-latin-400-normal.woff')),
    [FONT.fallbackBold]: readFileSync(fontFile('@fontsource/dejavu-sans', 'dejavu-sans-latin-700-normal.woff')),
  };
  return cache as Record<(typeof FONT)[keyof typeof FONT], Buffer>;
}

export function registerFonts(doc: PDFKit.PDFDocument): void {
  for (const [name, data] of Object.entries(fontBuffers())) doc.registerFont(name, data);
}

/**
 * Characters the Work Sans Latin files (5.3.0) have glyphs for: printable ASCII, Latin-1
 * (° ² ³ · × ± µ …) and the typographic punctuation below; checked glyph by glyph against the
 * files. Everything else goes to DejaVu Sans, which covers Greek and the mathematical symbols.
 */
const WORK_SANS_EXTRA = new Set([0x2013, 0x2014, 0x2018, 0x2019, 0x201c, 0x201d, 0x2022, 0x2026, 0x2032, 0x2212]);
export function inWorkSans(codePoint: number): boolean {
  return (codePoint >= 0x20 && codePoint <= 0x7e) || (codePoint >= 0xa0 && codePoint <= 0xff) || WORK_SANS_EXTRA.has(codePoint);
}

export interface Run {
  text: string;
  font: string;
}

/** Splits text into runs of one font each. */
export function runsOf(text: string, weight: FontWeight = 'regular'): Run[] {
  const runs: Run[] = [];
  for (const ch of text) {
    const font = inWorkSans(ch.codePointAt(0)!) ? FONT[weight] : weight === 'bold' ? FONT.fallbackBold : FONT.fallback;
    const last = runs.at(-1);
    if (last && last.font === font) last.text += ch;
    else runs.push({ text: ch, font });
  }
  return runs;
}

export interface TextStyle {
  size: number;
  weight?: FontWeight;
  color?: string;
}

export function widthOf(doc: PDFKit.PDFDocument, text: string, style: TextStyle): number {
  let w = 0;
  for (const r of runsOf(text, style.weight)) w += doc.font(r.font).fontSize(style.size).widthOfString(r.text);
  return w;
}

/**
 * One line of text at (x, y) (top of the line), never wrapped, aligned within `width` when
 * given. Returns the width drawn.
 */
export function line(doc: PDFKit.PDFDocument, text: string, x: number, y: number, style: TextStyle & { width?: number; align?: 'left' | 'right' | 'center' }): number {
  const w = widthOf(doc, text, style);
  let cx = x;
  if (style.width !== undefined && style.align === 'right') cx = x + style.width - w;
  else if (style.width !== undefined && style.align === 'center') cx = x + (style.width - w) / 2;
  doc.fillColor(style.color ?? '#14212b');
  for (const r of runsOf(text, style.weight)) {
    doc.font(r.font).fontSize(style.size);
    doc.text(r.text, cx, y, { lineBreak: false });
    cx += doc.widthOfString(r.text);
  }
  return w;
}

/** Word-wrapped text within `width`; returns the height used. */
export function paragraph(doc: PDFKit.PDFDocument, text: string, x: number, y: number, width: number, style: TextStyle & { lineGap?: number }): number {
  const lineHeight = style.size * 1.3 + (style.lineGap ?? 0);
  const space = widthOf(doc, ' ', style);
  let current = '';
  let currentWidth = 0;
  let cy = y;
  const flush = () => {
    line(doc, current, x, cy, style);
    cy += lineHeight;
    current = '';
    currentWidth = 0;
  };
  for (const word of text.split(/\s+/).filter(Boolean)) {
    const w = widthOf(doc, word, style);
    if (current && currentWidth + space + w > width) flush();
    current = current ? `${current} ${word}` : word;
    currentWidth = current === word ? w : currentWidth + space + w;
  }
  if (current) flush();
  return cy - y;
}
