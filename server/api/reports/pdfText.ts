import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { inflateSync } from 'node:zlib';

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

/**
 * The four fonts as plain TrueType, read and unpacked once per process. pdfkit reads WOFF too,
 * but inflates it in JavaScript on every document (most of a report's time); Node's zlib does it
 * once here.
 */
export function fontBuffers(): Record<(typeof FONT)[keyof typeof FONT], Buffer> {
  const load = (pkg: string, file: string) => woffToSfnt(readFileSync(fontFile(pkg, file)));
  cache ??= {
    [FONT.regular]: load('@fontsource/work-sans', 'work-sans-latin-400-normal.woff'),
    [FONT.bold]: load('@fontsource/work-sans', 'work-sans-latin-600-normal.woff'),
    [FONT.fallback]: load('@fontsource/dejavu-sans', 'dejavu-sans-latin-400-normal.woff'),
    [FONT.fallbackBold]: load('@fontsource/dejavu-sans', 'dejavu-sans-latin-700-normal.woff'),
  };
  return cache as Record<(typeof FONT)[keyof typeof FONT], Buffer>;
}

/**
 * WOFF 1.0 → the SFNT (TrueType/OpenType) file it wraps (W3C WOFF File Format 1.0, sections 3–5):
 * a 44-byte header, 20-byte table entries, each table zlib-compressed when compLength <
 * origLength. The output has the usual offset table and 4-byte aligned tables.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error('not a WOFF 1.0 font');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20;
    const tag = woff.readUInt32BE(at);
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const checksum = woff.readUInt32BE(at + 16);
    const raw = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(raw) : raw;
    if (data.length !== origLength) throw new Error('WOFF table has the wrong length after inflating');
    return { tag, checksum, data };
  });
  let pow = 1;
  while (pow * 2 <= numTables) pow *= 2;
  const headerSize = 12 + 16 * numTables;
  const total = headerSize + tables.reduce((sum, t) => sum + ((t.data.length + 3) & ~3), 0);
  const out = Buffer.alloc(total);
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(pow * 16, 6);
  out.writeUInt16BE(Math.log2(pow), 8);
  out.writeUInt16BE(numTables * 16 - pow * 16, 10);
  let offset = headerSize;
  tables.forEach((t, i) => {
    const rec = 12 + i * 16;
    out.writeUInt32BE(t.tag, rec);
    out.writeUInt32BE(t.checksum, rec + 4);
    out.writeUInt32BE(offset, rec + 8);
    out.writeUInt32BE(t.data.length, rec + 12);
    t.data.copy(out, offset);
    offset += (t.data.length + 3) & ~3;
  });
  return out;
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
