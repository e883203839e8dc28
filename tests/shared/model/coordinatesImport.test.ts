import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { findBinaryContent, formatCoordinatesIssue, parseCoordinates, type CoordinatesParseResult } from '../../../shared/model/coordinatesFile.ts';
import { guessFileUnit, planImport } from '../../../shared/model/coordinatesImport.ts';
import { sectionShape } from '../../../shared/model/sectionShape.ts';
import { isSimplePolygon } from '../../../shared/model/polygon.ts';
import type { Point } from '../../../shared/model/sketch.ts';
import { expectClose } from '../../helpers/expectClose.ts';
import { reached } from '../../helpers/reached.ts';

const FIXTURES = path.resolve(import.meta.dirname, '../../fixtures/coordinates');
const fixture = (name: string) => readFileSync(path.join(FIXTURES, name), 'utf8');

function read(r: CoordinatesParseResult) {
  if (!r.ok) throw new Error(`not read: ${r.issues.map(formatCoordinatesIssue).join(' / ')}`);
  return r;
}

function refusal(r: CoordinatesParseResult): string[] {
  if (r.ok) throw new Error('the file was read, a refusal was expected');
  return r.issues.map(formatCoordinatesIssue);
}

describe('parseCoordinates: the two-block layout', () => {
  it('reads title, count line, upper and lower surfaces nose → tail into one loop, joining the shared nose and tail', () => {
    const r = read(parseCoordinates(fixture('tern-fin-root-two-blocks-mm.dat')));
    expect(r.layout).toBe('twoBlocks');
    expect(r.surfaces).toEqual({ upper: 9, lower: 9 });
    expect(r.header).toMatch(/^HD-7 Tern fin root/);
    expect(r.points).toHaveLength(16);
    // Upper nose → tail, then lower tail → nose (without the shared ends).
    expect(r.points.slice(0, 9).map((p) => p[0])).toEqual([0, 40, 80, 120, 160, 200, 240, 280, 320]);
    expect(r.points.slice(9)).toEqual([[280, -3.5], [240, -6], [200, -7.5], [160, -8], [120, -7.5], [80, -6], [40, -3.5]]);
    expect(isSimplePolygon(r.points)).toBe(true);
    expect(r.notes).toEqual([
      'Two blocks (count on line 2): 9 upper points (lines 4–12) and 9 lower points (lines 14–22), each nose → tail.',
      'The surfaces share the nose and the tail; they are kept once.',
    ]);
    // 16 mm over 320 mm at mid-chord: t/c = 0.05 (the fixture's design, by hand).
    expectClose(sectionShape(r.points).thicknessRatio, 0.05, 1e-12);
  });

  it('keeps a blunt base (tails not shared) and reads tab-separated decimal commas', () => {
    const r = read(parseCoordinates(fixture('tern-canard-two-blocks-inches.txt')));
    expect(r.layout).toBe('twoBlocks');
    expect(r.decimalMark).toBe('comma');
    expect(r.points).toEqual([[0, 0], [2.5, 0.15], [5, 0.025], [5, -0.025], [2.5, -0.15]]);
    expect(r.notes).toContain('The surfaces share the nose; it is kept once.');
    expect(r.notes[0]).toBe('Decimal commas: the file writes numbers such as “0,0” (read as 0.0), with spaces or tabs between x and y.');
  });

  it('splits by the counts when the blocks have no blank line between them', () => {
    const r = read(parseCoordinates('Tern vane\n3 3\n0 0\n0.5 0.04\n1 0\n0 0\n0.5 -0.04\n1 0\n'));
    expect(r.layout).toBe('twoBlocks');
    expect(r.points).toEqual([[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]]);
  });

  it('refuses a count line that does not match the blocks, naming the count line and both blocks', () => {
    expect(refusal(parseCoordinates(fixture('tern-fin-root-miscounted.dat')))).toEqual([
      'Line 2: the count line announces 9 upper and 8 lower points, but the upper surface (lines 4–12) has 9 and the lower (lines 14–22) has 9.',
    ]);
  });

  it('refuses a surface written tail → nose, naming its first line', () => {
    const text = 'Tern vane\n3 3\n\n1 0\n0.5 0.04\n0 0\n\n0 0\n0.5 -0.04\n1 0\n';
    expect(refusal(parseCoordinates(text))).toEqual([
      'Line 4: the upper surface (lines 4–6) runs from x = 1 to x = 0; in the two-block layout each surface goes from the nose to the tail.',
    ]);
  });

  it('reads a loop whose first point is two whole numbers as a loop (no blocks, counts do not fit)', () => {
    const r = read(parseCoordinates('120 0\n60 9\n0 0\n60 -9\n'));
    expect(r.layout).toBe('loop');
    expect(r.points).toHaveLength(4);
  });
});

describe('parseCoordinates: decimal commas', () => {
  it('reads "0,0125;0,0031" (semicolons between values) and says what it assumed', () => {
    const r = read(parseCoordinates(fixture('tern-fin-tip-decimal-comma.csv')));
    expect(r.decimalMark).toBe('comma');
    expect(r.header).toBe('x/c;y/c');
    expect(r.points).toEqual([[0, 0], [0.25, 0.02], [0.75, 0.02], [1, 0], [0.75, -0.02], [0.25, -0.02]]);
    expect(r.notes).toEqual([
      'Decimal commas: the file writes numbers such as “0,25” (read as 0.25), with semicolons between x and y.',
      'Line 8 repeats the first point to close the outline; it was left out.',
    ]);
  });

  it('reads space-separated decimal commas, and "0,0125;0,0031" as (0.0125, 0.0031)', () => {
    const spaced = read(parseCoordinates('0 0\n0,5 0,0031\n1 0\n0,5 -0,0031\n'));
    expect(spaced.points).toEqual([[0, 0], [0.5, 0.0031], [1, 0], [0.5, -0.0031]]);
    const semi = read(parseCoordinates('0;0\n0,0125;0,0031\n1;0\n0,0125;-0,0031\n'));
    expect(semi.points[1]).toEqual([0.0125, 0.0031]);
  });

  it('keeps "x,y" with decimal points as comma-separated values (no guess)', () => {
    const r = read(parseCoordinates('0,0\n0.5,0.03\n1,0\n0.5,-0.03\n'));
    expect(r.decimalMark).toBe('point');
    expect(r.points).toEqual([[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]]);
    expect(r.notes).toEqual([]);
  });

  it('refuses a line that uses the other decimal mark, or both in one number, by line', () => {
    expect(refusal(parseCoordinates('0;0\n0,5;0,03\n1;0\n0.5;-0,03\n'))).toEqual([
      'Line 4: “0.5” has a decimal point, but the rest of the file uses decimal commas; a file uses one decimal mark.',
    ]);
    expect(refusal(parseCoordinates('0 0\n0,5 0,03\n1 0\n0,5 -0,03\n0,25 1.234,5\n'))).toEqual([
      'Line 5: “1.234,5” mixes a decimal point and a decimal comma; a file uses one decimal mark.',
    ]);
    expect(refusal(parseCoordinates('0;0\n0,5;0,03\n1;0\n0,5;-0,03\n0.25 0.01\n'))).toEqual([
      'Line 5: reads as (0.25, 0.01) only with decimal points, but the rest of the file uses decimal commas; a file uses one decimal mark.',
    ]);
  });

  it('any outline written with decimal commas reads back as the same points as with decimal points (semicolons or spaces)', () => {
    const count = reached('decimal-comma round trips');
    // Star-shaped outlines (vertices at increasing angles about the origin) never cross themselves.
    const outline = fc
      .array(fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0.01, max: 500, noNaN: true })), { minLength: 3, maxLength: 40 })
      .map((raw) => {
        const total = raw.reduce((s, [w]) => s + w + 0.05, 0);
        let angle = 0;
        return raw.map(([w, r]) => {
          angle += ((w + 0.05) / total) * 2 * Math.PI * 0.999;
          const round = (v: number) => Number(v.toPrecision(6)) + 0;
          return [round(r * Math.cos(angle)), round(r * Math.sin(angle))] as const;
        });
      });
    fc.assert(
      fc.property(outline, fc.constantFrom(';', ' ', '\t', ' ; '), (pts, sep) => {
        const withPoints = pts.map(([x, y]) => `${x} ${y}`).join('\n');
        const withCommas = pts.map(([x, y]) => `${String(x).replace('.', ',')}${sep}${String(y).replace('.', ',')}`).join('\n');
        const a = parseCoordinates(withPoints);
        const b = parseCoordinates(withCommas);
        // The outline may be refused (crossing facets, repeated points): then both refuse alike.
        expect(b.ok).toBe(a.ok);
        if (a.ok && b.ok) {
          count.hit();
          expect(b.points).toEqual(a.points);
        }
      }),
      { numRuns: 300 },
    );
    count.expectAtLeast(250);
  });
});

describe('parseCoordinates: binary files', () => {
  it('refuses a file with NUL bytes as "not a text file", naming the line', () => {
    const zipLike = 'PK\u0003\u0004\u0014\u0000\u0006\u0000\u0008\u0000\u0000\u0000!\u0000';
    expect(refusal(parseCoordinates(zipLike))).toEqual([
      'Line 1: not a text file (it holds NUL bytes). Save the coordinates as plain text (.txt, .dat or .csv) and choose that file.',
    ]);
  });

  it('refuses undecodable bytes in quantity, but reads a title with one odd character', () => {
    const noise = Array.from({ length: 400 }, (_, i) => (i % 3 === 0 ? '\uFFFD' : i % 50 === 0 ? '\n' : 'x')).join('');
    expect(findBinaryContent(noise)?.line).toBe(1);
    expect(refusal(parseCoordinates(noise))[0]).toMatch(/^Line 1: not a text file \(\d+ of its first 400 characters are not readable text\)/);
    const r = read(parseCoordinates('Tern fin root, 5 \uFFFD thick\n0 0\n0.5 0.025\n1 0\n0.5 -0.025\n'));
    expect(r.points).toHaveLength(4);
  });
});

describe('planImport and guessFileUnit', () => {
  const mm = read(parseCoordinates(fixture('tern-fin-root-two-blocks-mm.dat')));

  it('normalises a file in mm to unit chord and offers its chord (0.32 m) to the loads', () => {
    const r = planImport(mm.points, { unit: 'mm', scale: 'unitChord', loadsChordFromFile: true });
    if (!r.ok) throw new Error(r.reason);
    expect(r.plan.chord).toBe(1);
    expect(r.plan.fileChord).toBe(320);
    expectClose(r.plan.chordM!, 0.32, 1e-15);
    expectClose(r.plan.loadsChordM!, 0.32, 1e-15);
    expect(r.plan.pointCount).toBe(16);
    expectClose(r.plan.thicknessRatio, 0.05, 1e-12);
    expect(r.plan.points[4]).toEqual([0.5, 0.025]);
    const keepLoads = planImport(mm.points, { unit: 'mm', scale: 'unitChord', loadsChordFromFile: false });
    expect(keepLoads.ok && keepLoads.plan.loadsChordM).toBeNull();
  });

  it('keeps the physical size: the outline in metres and the chord in the loads (5 in = 0.127 m, by definition of the inch)', () => {
    const inches = read(parseCoordinates(fixture('tern-canard-two-blocks-inches.txt')));
    const r = planImport(inches.points, { unit: 'in', scale: 'physical', loadsChordFromFile: false });
    if (!r.ok) throw new Error(r.reason);
    expect(r.plan.points).toEqual([[0, 0], [0.0635, 0.00381], [0.127, 0.000635], [0.127, -0.000635], [0.0635, -0.00381]]);
    expect(r.plan.chord).toBe(0.127);
    expect(r.plan.loadsChordM).toBe(0.127);
    // 0.3 in over 5 in at the ridge, by hand; the chord line runs to one corner of the 0.05 in
    // base (the tail is the max-x vertex), which tilts it by 0.3° and changes t/c by 1.5e-5.
    expectClose(r.plan.thicknessRatio, 0.06, 2e-5);
    const mm = planImport(read(parseCoordinates(fixture('tern-fin-root-two-blocks-mm.dat'))).points, { unit: 'mm', scale: 'physical', loadsChordFromFile: false });
    expect(mm.ok && mm.plan.points[4]).toEqual([0.16, 0.008]);
    expect(mm.ok && mm.plan.loadsChordM).toBe(0.32);
  });

  it('a chord-relative file sets no loads chord; a chord beyond 1000 m is refused with the reason', () => {
    const tip = read(parseCoordinates(fixture('tern-fin-tip-decimal-comma.csv')));
    const r = planImport(tip.points, { unit: 'chord', scale: 'physical', loadsChordFromFile: true });
    expect(r.ok && r.plan.loadsChordM).toBeNull();
    const huge = planImport(mm.points.map(([x, y]) => [x * 10_000, y * 10_000] as Point), { unit: 'm', scale: 'physical', loadsChordFromFile: true });
    expect(huge).toEqual({ ok: false, reason: "The chord would be 3200000 m, more than the 1000 m a sketch's loads take; check the file's unit." });
  });

  it('guesses the unit from the title, else from the size of the chord, and says why', () => {
    expect(guessFileUnit('Tern fin root, chord 320 mm', mm.points)).toEqual({ unit: 'mm', why: 'the title says millimetres' });
    expect(guessFileUnit('Tern canard, 5 in chord', mm.points).unit).toBe('in');
    expect(guessFileUnit(null, [[0, 0], [0.5, 0.02], [1, 0]]).unit).toBe('chord');
    expect(guessFileUnit(null, mm.points).why).toMatch(/chord is 320 and the file names no unit: taken as millimetres/);
    // "in" as an ordinary word is not a unit.
    expect(guessFileUnit('Tern fin root in section', [[0, 0], [0.5, 0.02], [1, 0]]).unit).toBe('chord');
  });
});
