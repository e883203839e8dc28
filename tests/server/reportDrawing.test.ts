import { describe, expect, it } from 'vitest';
import { FONT, fontBuffers, runsOf, woffToSfnt } from '../../server/api/reports/pdfText.ts';
import { niceTicks, tickLabel } from '../../server/api/reports/pdfCharts.ts';
import { reportFileName } from '../../server/api/reports/service.ts';

describe('report drawing helpers', () => {
  it('runsOf sends Greek and mathematical symbols to the fallback font and keeps Latin text in Work Sans', () => {
    expect(runsOf('q∞ at α = 4°, 1.2 kg/m³ — ok')).toEqual([
      { text: 'q', font: FONT.regular },
      { text: '∞', font: FONT.fallback },
      { text: ' at ', font: FONT.regular },
      { text: 'α', font: FONT.fallback },
      { text: ' = 4°, 1.2 kg/m³ — ok', font: FONT.regular },
    ]);
    expect(runsOf('θmax', 'bold')).toEqual([{ text: 'θ', font: FONT.fallbackBold }, { text: 'max', font: FONT.bold }]);
  });

  it('woffToSfnt unpacks the shipped WOFF files into TrueType with every table (W3C WOFF 1.0)', () => {
    const fonts = fontBuffers();
    for (const ttf of Object.values(fonts)) {
      expect(ttf.readUInt32BE(0)).toBe(0x00010000); // TrueType outlines
      const numTables = ttf.readUInt16BE(4);
      expect(numTables).toBeGreaterThan(8);
      const tags = Array.from({ length: numTables }, (_, i) => ttf.toString('latin1', 12 + 16 * i, 16 + 16 * i));
      expect(tags).toEqual(expect.arrayContaining(['cmap', 'glyf', 'head', 'hmtx', 'loca']));
    }
    expect(() => woffToSfnt(Buffer.from('not a font at all, really not'))).toThrow('not a WOFF 1.0 font');
  });

  it('niceTicks covers the data in 1-2-2.5-5 steps and tickLabel prints the decimals the step needs', () => {
    expect(niceTicks(-0.55, 0.6, 5)).toMatchObject({ lo: -0.75, hi: 0.75, step: 0.25 }); // 1.15/5 = 0.23 → 0.25
    expect(niceTicks(-0.55, 0.6, 6)).toMatchObject({ lo: -0.6, hi: 0.6, step: 0.2 });
    expect(niceTicks(-7.4, 7.2, 6).ticks).toEqual([-7.5, -5, -2.5, 0, 2.5, 5, 7.5]);
    expect(tickLabel(-7.5, 2.5)).toBe('−7.5');
    expect(tickLabel(0.04, 0.02)).toBe('0.04');
    expect(tickLabel(10, 5)).toBe('10');
    expect(niceTicks(3, 3).ticks.length).toBeGreaterThan(1); // a flat line still gets an axis
  });

  it('report file names keep letters, digits and dashes', () => {
    expect(reportFileName('Tern fin root — 5% wedge', 12)).toBe('Tern-fin-root-5-wedge-r12-report.pdf');
    expect(reportFileName('###', 0)).toBe('sketch-r0-report.pdf');
  });
});
