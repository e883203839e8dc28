import { describe, expect, it } from 'vitest';
import { formatCoordinatesIssue, parseCoordinates, MAX_LISTED_ISSUES } from '../../../shared/model/coordinatesFile.ts';
import { facetCsv, fileSafeName, resultJson, sectionCsv, FACET_CSV_COLUMNS } from '../../../shared/model/sketchExport.ts';
import { RESULTS_CAUTION } from '../../../shared/model/caution.ts';
import { defaultSketchDocument, selectedPoint } from '../../../shared/model/sketch.ts';
import { parseSolveInput } from '../../../shared/model/solveInput.ts';
import { solveSection } from '../../../shared/solver/index.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

describe('parseCoordinates', () => {
  it('reads whitespace-separated x y with comments and blank lines', () => {
    const text = '# Tern fin root\n\n0 0\n0.4   0.025  # ridge\n1\t0\n0.4 -0.025\n';
    const r = parseCoordinates(text);
    expect(r).toEqual({
      ok: true,
      points: [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]],
      header: null,
      notes: [],
      layout: 'loop',
      decimalMark: 'point',
      surfaces: null,
    });
  });

  it('reads CSV with a header, CRLF line ends and exponents', () => {
    const r = parseCoordinates('x,y\r\n0,0\r\n5e-1,2.5E-2\r\n1,0\r\n.5,-.025\r\n');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.header).toBe('x,y');
    expect(r.points).toEqual([[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]]);
  });

  it('accepts semicolons and drops a closing point equal to the first, saying so', () => {
    const r = parseCoordinates('0;0\n0.5;0.03\n1;0\n0.5;-0.03\n0;0\n');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.points).toHaveLength(4);
    expect(r.notes).toEqual(['Line 5 repeats the first point to close the outline; it was left out.']);
  });

  it('lists every bad line with its number and replaces nothing', () => {
    const text = ['x y', '0 0', '0.5 abc', '1 0 7', '', '0.5 -0.02', 'y x'].join('\n');
    const r = parseCoordinates(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map(formatCoordinatesIssue)).toEqual([
      'Line 3: “abc” is not a number.',
      'Line 4: expected two values (x y), found 3.',
      'Line 7: “y” is not a number.',
    ]);
  });

  it('reports a repeated vertex with both line numbers', () => {
    const r = parseCoordinates('# c\n0 0\n0.5 0.03\n1 0\n0.5 0.03\n');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(formatCoordinatesIssue(itemAt(r.issues, 0))).toBe('Line 5: repeats the point on line 3 (0.5, 0.03); each vertex must be distinct.');
  });

  it('reports crossing facets by their lines', () => {
    const r = parseCoordinates('0 0\n1 1\n1 0\n0 1\n');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(itemAt(r.issues, 0).message).toMatch(/^the facet from line \d to line \d crosses or touches the facet from line \d to line \d/);
  });

  it('refuses too few points and a file of collinear points as whole-file problems', () => {
    const few = parseCoordinates('0 0\n1 0\n');
    expect(few).toEqual({ ok: false, issues: [{ line: null, message: 'a section needs at least 3 points; the file has 2.' }] });
    expect(formatCoordinatesIssue(itemAt((few as { issues: { line: null; message: string }[] }).issues, 0))).toBe(
      'A section needs at least 3 points; the file has 2.',
    );
    const empty = parseCoordinates('');
    expect(empty.ok).toBe(false);
  });

  it(`lists at most ${MAX_LISTED_ISSUES} bad lines and counts the rest`, () => {
    const r = parseCoordinates(Array.from({ length: 30 }, () => '1 2 3').join('\n'));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues).toHaveLength(MAX_LISTED_ISSUES + 1);
    expect(r.issues.at(-1)).toEqual({ line: null, message: '… and 10 more lines with problems.' });
  });
});

describe('exports', () => {
  const doc = defaultSketchDocument();
  const { condition } = selectedPoint(doc);
  const parsed = parseSolveInput({ section: doc.section, flow: { mach: condition.mach, alphaDeg: condition.alphaDeg, gamma: condition.gamma } });
  if (!parsed.ok) throw new Error('demo does not parse');
  const result = solveSection(parsed.value);

  it('the section CSV reads back to the same points', () => {
    const csv = sectionCsv('Tern fin root\nsecond line', doc.section.points);
    expect(csv.split('\n')[0]).toBe('# Shockwright section,"Tern fin root second line"');
    const back = parseCoordinates(csv);
    expect(back.ok && back.points).toEqual(doc.section.points);
  });

  it('the facet CSV has one row per facet, the columns named and the caution', () => {
    const csv = facetCsv('Demo', result).trimEnd().split('\n');
    expect(csv[2]).toBe(`# ${RESULTS_CAUTION}`);
    expect(csv[3]).toMatch(/^# x_mid_over_c from the leading edge \(0, 0\) over the reference chord 1 \(the solved outline\)/);
    expect(csv[4]).toBe(FACET_CSV_COLUMNS.join(','));
    expect(csv.slice(5)).toHaveLength(4);
    const first = itemAt(csv, 5).split(',');
    expect(first).toHaveLength(FACET_CSV_COLUMNS.length);
    expect(first[0]).toBe('"upper"');
    expect(Number(first[FACET_CSV_COLUMNS.indexOf('cp')])).toBe(itemAt(result.surfaces.upper, 0).cp);
  });

  it('the result JSON carries the caution, the document and the result', () => {
    const json = JSON.parse(resultJson('Demo', doc, result));
    expect(json.caution).toBe(RESULTS_CAUTION);
    expect(json.document).toEqual(doc);
    expect(json.result.coefficients.cl).toBe(result.coefficients!.cl);
  });

  it('makes file names from titles', () => {
    expect(fileSafeName('Tern fin root — double wedge, 5% thick')).toBe('Tern-fin-root-double-wedge-5-thick');
    expect(fileSafeName('###')).toBe('sketch');
  });
});
