import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { csvCell, csvHeader, csvNote, csvNumber, csvRow, csvText } from '../../../shared/format/csv.ts';
import { parseCoordinates } from '../../../shared/model/coordinatesFile.ts';
import { facetCsv, sectionCsv } from '../../../shared/model/sketchExport.ts';
import { studyCsv, STUDY_COLUMNS, STUDY_CSV_COLUMNS, type StudyResults } from '../../../shared/model/study.ts';
import { defaultSketchDocument, selectedPoint } from '../../../shared/model/sketch.ts';
import { parseSolveInput } from '../../../shared/model/solveInput.ts';
import { solveSection } from '../../../shared/solver/index.ts';
import { RESULTS_CAUTION } from '../../../shared/model/caution.ts';
import { reached } from '../../helpers/reached.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/**
 * A minimal reader of RFC 4180 CSV, as a spreadsheet splits a file: returns the rows of cells as
 * written (quotes removed). Used to check that no typed text escapes its cell.
 */
function readCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  let wasQuoted = false;
  const endCell = () => {
    row.push(wasQuoted ? `"${cell}` : cell);
    cell = '';
    wasQuoted = false;
  };
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"' && cell === '') {
      quoted = true;
      wasQuoted = true;
    } else if (ch === ',') endCell();
    else if (ch === '\n') {
      endCell();
      rows.push(row);
      row = [];
    } else cell += ch;
  }
  if (cell !== '' || row.length) {
    endCell();
    rows.push(row);
  }
  return rows;
}

/** A cell a spreadsheet would run as a formula: unquoted (or quoted) text starting with = + - @ tab CR. */
function runsAsFormula(cell: string): boolean {
  const text = cell.startsWith('"') ? cell.slice(1) : cell;
  if (/^-?\d/.test(text) && Number.isFinite(Number(text))) return false; // a number
  return /^[\s]*[=+\-@]|^[\t\r]/.test(text);
}

const HOSTILE = ['=HYPERLINK("http://x.test","click")', '+1+1', '-2+3', '@SUM(A1)', '\t=1', '\r=1', '  =1', 'a,"=1"', 'line\n=1,2', '=1"', '"', ''];

describe('[CSV1]–[CSV4] CSV cells safe to open in a spreadsheet (OWASP "CSV Injection", common practice)', () => {
  it('[CSV1][CSV2] text is always quoted and a formula start neutralised', () => {
    expect(csvText('Tern fin')).toBe('"Tern fin"');
    expect(csvText('=1+1')).toBe(`"'=1+1"`);
    expect(csvText('+1')).toBe(`"'+1"`);
    expect(csvText('-1')).toBe(`"'-1"`);
    expect(csvText('@A1')).toBe(`"'@A1"`);
    expect(csvText('\t=1')).toBe(`"'\t=1"`);
    expect(csvText('\rx')).toBe(`"'\rx"`);
    expect(csvText('say "hi", then')).toBe('"say ""hi"", then"');
  });

  it('[CSV3] numbers stay numbers: -0.123 and 1e-7 are bare, null is empty, non-finite is text', () => {
    expect(csvNumber(-0.123)).toBe('-0.123');
    expect(csvNumber(1e-7)).toBe('1e-7');
    expect(csvNumber(null)).toBe('');
    expect(csvCell(-4)).toBe('-4');
    expect(csvCell(true)).toBe('true');
    expect(csvNumber(-Infinity)).toBe(`"'-Infinity"`);
    expect(csvRow(['upper', -0.5, null, '=x'])).toBe(`"upper",-0.5,,"'=x"`);
    expect(() => csvHeader(['x', 'y,z'])).toThrow(/not a plain name/);
  });

  it('[CSV1][CSV2] no typed text (generated) escapes its cell or runs as a formula; numbers read back equal', () => {
    const hits = reached('csv cells');
    fc.assert(
      fc.property(fc.oneof(fc.constantFrom(...HOSTILE), fc.string({ unit: 'grapheme-ascii' }), fc.string()), fc.double({ noNaN: true, noDefaultInfinity: true }), (text, n) => {
        const rows = readCsv(`${csvRow([text, n, text])}\n`);
        expect(rows).toHaveLength(1);
        expect(rows[0]).toHaveLength(3);
        for (const cell of [itemAt(itemAt(rows, 0), 0), itemAt(itemAt(rows, 0), 2)]) expect(runsAsFormula(cell), JSON.stringify(cell)).toBe(false);
        expect(Number(itemAt(rows, 0)[1])).toBe(n + 0);
        hits.hit();
      }),
      { numRuns: 600 },
    );
    hits.expectAtLeast(500);
  });

  it('[CSV4] a note keeps typed text in its own quoted cell on one line', () => {
    expect(csvNote('Shockwright section', 'HD-7, "Tern"\n=1')).toBe(`# Shockwright section,"HD-7, ""Tern"" =1"`);
    expect(csvNote('Shockwright study', '=cmd', 'sketch', 'Fin', 'revision', 4)).toBe(`# Shockwright study,"'=cmd","sketch","Fin","revision",4`);
  });
});

describe('every CSV writer uses the safe cells', () => {
  const doc = defaultSketchDocument();
  const { condition } = selectedPoint(doc);
  const parsed = parseSolveInput({ section: doc.section, flow: { mach: condition.mach, alphaDeg: condition.alphaDeg, gamma: condition.gamma } });
  if (!parsed.ok) throw new Error('demo does not parse');
  const result = solveSection(parsed.value);

  for (const title of HOSTILE) {
    it(`section, facet and study CSV with the title ${JSON.stringify(title)}: no cell runs as a formula, numbers stay numbers`, () => {
      const section = sectionCsv(title, doc.section.points);
      const back = parseCoordinates(section);
      expect(back.ok && back.points).toEqual(doc.section.points);
      const facets = facetCsv(title, result);
      const results: StudyResults = {
        version: 1, machs: [2], alphasDeg: [0], flapsDeg: [null], altitudeM: null, friction: 'none', columns: STUDY_COLUMNS, summaries: [], counts: { ok: 1 },
        rows: [STUDY_COLUMNS.map((c) => (c === 'status' ? 'ok' : c === 'limit' ? title : -0.125))],
      };
      const study = studyCsv({ title, studyName: title, revision: 3, caution: RESULTS_CAUTION }, results);
      for (const file of [section, facets, study]) {
        for (const row of readCsv(file)) {
          for (const cell of row) expect(runsAsFormula(cell), `${JSON.stringify(cell)} in ${file.split('\n')[0]}`).toBe(false);
        }
      }
      const studyRows = readCsv(study).filter((r) => !itemAt(r, 0).startsWith('#'));
      expect(studyRows[0]).toEqual([...STUDY_CSV_COLUMNS]);
      expect(itemAt(studyRows, 1)[STUDY_COLUMNS.indexOf('cl')]).toBe('-0.125');
      expect(readCsv(section).filter((r) => !itemAt(r, 0).startsWith('#')).slice(1).map((r) => r.map(Number))).toEqual(doc.section.points);
    });
  }
});
