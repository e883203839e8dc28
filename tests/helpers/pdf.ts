import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync, writeFileSync, mkdirSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { itemAt } from '../../shared/util/invariant.ts';

/**
 * PDF checks for tests. Pages are counted in JavaScript (page objects in the file); text and
 * pictures come from Debian's poppler-utils (pdftotext, pdftoppm), which `npm test` installs
 * (server/lifecycle/system.ts).
 */
export function pdfPageCount(pdf: Buffer): number {
  // Page dictionaries are written uncompressed: "/Type /Page" (not "/Pages").
  return (pdf.toString('latin1').match(/\/Type\s*\/Page(?![a-zA-Z])/g) ?? []).length;
}

function withFile<T>(pdf: Buffer, fn: (file: string, dir: string) => T): T {
  const dir = mkdtempSync(path.join(tmpdir(), 'sw-pdf-'));
  try {
    const file = path.join(dir, 'report.pdf');
    writeFileSync(file, pdf);
    return fn(file, dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The text of the PDF (layout kept), by pdftotext. */
export function pdfText(pdf: Buffer): string {
  return withFile(pdf, (file) => {
    const r = spawnSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`pdftotext failed: ${r.stderr || r.error?.message}`);
    return r.stdout;
  });
}

/** Font names embedded in the PDF, by pdffonts (subset prefixes removed). */
export function pdfFonts(pdf: Buffer): { name: string; embedded: boolean }[] {
  return withFile(pdf, (file) => {
    const r = spawnSync('pdffonts', [file], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`pdffonts failed: ${r.stderr || r.error?.message}`);
    return r.stdout
      .split('\n')
      .slice(2)
      .filter((l) => l.trim())
      .map((l) => {
        const cols = l.trim().split(/\s+/);
        return { name: itemAt(cols, 0).replace(/^[A-Z]{6}\+/, ''), embedded: cols[cols.length - 5] === 'yes' };
      });
  });
}

/** Renders every page to PNG with pdftoppm into `outDir` as `<prefix>-<n>.png`; returns the files. */
export function pdfToPng(pdf: Buffer, outDir: string, prefix: string, dpi = 80): string[] {
  return withFile(pdf, (file, dir) => {
    const r = spawnSync('pdftoppm', ['-r', String(dpi), '-png', file, path.join(dir, 'page')], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`pdftoppm failed: ${r.stderr || r.error?.message}`);
    mkdirSync(outDir, { recursive: true });
    return readdirSync(dir)
      .filter((f) => f.endsWith('.png'))
      .sort()
      .map((f) => {
        const target = path.join(outDir, `${prefix}-${f.replace(/^page-0*/, '')}`);
        copyFileSync(path.join(dir, f), target);
        return target;
      });
  });
}
