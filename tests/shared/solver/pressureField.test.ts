/**
 * The pressure field and the pressure signature (shared/solver/pressureField.ts,
 * pressureSignature.ts) and the signature CSV. Sections are our own biconvex arcs.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { reached } from '../../helpers/reached';
import { expectClose } from '../../helpers/expectClose';
import { signatureCsv } from '../../../shared/model/sketchExport';
import { RESULTS_CAUTION } from '../../../shared/model/caution';
import { pressureField, pressureRows, pressureSteps } from '../../../shared/solver/pressureField';
import { pressureSignature } from '../../../shared/solver/pressureSignature';
import { solveSection } from '../../../shared/solver/solveSection';
import type { Wave } from '../../../shared/solver/types';
import { itemAt } from '../../../shared/util/invariant';
import { biconvex, input, lens } from './sections';

/** p/p∞ behind a shock where its path crosses height y. */
function shockPressureAt(w: Wave, y: number): number {
  for (let k = 0; k + 1 < w.path.length; k++) {
    const a = itemAt(w.path, k);
    const b = itemAt(w.path, k + 1);
    if ((a[1] - y) * (b[1] - y) <= 0) {
      if (!w.pRatioBehindAlong) throw new Error(`${w.id} has no pressures along its path`);
      return itemAt(w.pRatioBehindAlong, k);
    }
  }
  throw new Error(`${w.id} does not reach y = ${y}`);
}

/** p/p∞ of step k of a profile, a step outside the section (null there). */
function stepPressure(p: readonly (number | null)[], k: number): number {
  const value = itemAt(p, k);
  if (value === null) throw new Error(`step ${k} lies inside the section`);
  return value;
}

describe('pressure field and signature', () => {
  const pts = biconvex(20, 0.1);
  const result = solveSection(input(pts, 2, 0, { fieldExtentChords: 4 }));

  it('pressureField: along y = −0.5 the free stream, a jump at the nose shock to its pressure there, an expansion, and back near 1 past the tail shock', () => {
    const along = pressureField(result.waves, pts);
    const row = along(-0.5, -1, 5);
    expect(row.x).toHaveLength(row.p.length + 1);
    expect(row.p[0]).toBe(1);
    const nose = result.waves.find((w) => w.id === 'wave_lower_0')!;
    expectClose(stepPressure(row.p, 1), shockPressureAt(nose, -0.5), 1e-12);
    const inner = row.p.slice(1, -1) as number[];
    // Behind the nose shock the rays expand the flow below the free stream before the tail shock.
    expect(Math.min(...inner)).toBeLessThan(0.8);
    expectClose(stepPressure(row.p, -1), 1, 0.02);
    for (let k = 0; k + 1 < row.x.length; k++) expect(itemAt(row.x, k + 1)).toBeGreaterThan(itemAt(row.x, k));
  });

  it('pressureField: mirror symmetry at α = 0 (y and −y read the same), null inside the section, the free stream with no waves', () => {
    const along = pressureField(result.waves, pts);
    expect(along(0.7, -1, 5)).toEqual(along(-0.7, -1, 5));
    const through = along(0, -1, 5);
    const inside = through.p.findIndex((p) => p === null);
    expect(inside).toBeGreaterThan(0);
    expectClose(itemAt(through.x, inside), 0, 1e-12);
    expectClose(itemAt(through.x, inside + 1), 1, 1e-12);
    expect(pressureField([], pts)(3, -1, 5)).toEqual({ x: [-1, 5], p: [1] });
  });

  it('pressureRows (the scanline) gives exactly pressureField row by row: rows through path vertices, at the field\'s edges, in any order, and beyond the waves', () => {
    const along = pressureField(result.waves, pts);
    const vertexYs = result.waves.flatMap((w) => [...w.path, ...(w.rays ?? []).flatMap((r) => r.path)].map((p) => p[1]));
    const ys = [...vertexYs.slice(0, 60), 0, 0.1, -0.1, 7, -7, ...Array.from({ length: 80 }, (_, i) => 2.5 - (5 * i) / 79)];
    expect(pressureRows(result.waves, pts, ys, -1, 5)).toEqual(ys.map((y) => along(y, -1, 5)));
    // A window narrower than the waves (crossings outside it count at its ends), and none at all.
    expect(pressureRows(result.waves, pts, ys, 0.3, 0.6)).toEqual(ys.map((y) => along(y, 0.3, 0.6)));
    expect(pressureRows(result.waves, pts, [], -1, 5)).toEqual([]);
    expect(pressureRows([], pts, [3, 0], -1, 5)).toEqual([pressureField([], pts)(3, -1, 5), pressureField([], pts)(0, -1, 5)]);
  });

  it('pressureSteps: each step carries the caller\'s class of its p (−1 inside the section), worked out per wave side, not per step', () => {
    const ys = Array.from({ length: 41 }, (_, i) => 1 - i / 20);
    const classed: number[] = [];
    const classOf = (p: number) => {
      classed.push(p);
      return Math.round(100 * Math.log(p));
    };
    let steps = 0;
    let insideSteps = 0;
    pressureSteps(result.waves, pts, ys, -1, 5, (_row, x0, x1, p, pClass) => {
      steps++;
      expect(x1).toBeGreaterThan(x0);
      if (p === null) {
        insideSteps++;
        expect(pClass).toBe(-1);
      } else expect(pClass).toBe(Math.round(100 * Math.log(p)));
    }, classOf);
    expect(insideSteps).toBeGreaterThan(0);
    // The classes come from the wave segments' two sides and the free stream, far fewer than the steps.
    expect(classed.length).toBeLessThan(steps);
    // Without a class function every class is 0 outside the section.
    pressureSteps(result.waves, pts, [0.3], -1, 5, (_row, _x0, _x1, p, pClass) => expect(pClass).toBe(p === null ? -1 : 0));
  });

  it('pressureRows equals pressureField on cambered lenses at any Mach and incidence (property)', () => {
    const checked = reached('scanline rows equal to single rows');
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 40 }),
        fc.double({ min: 0.02, max: 0.12, noNaN: true }),
        fc.double({ min: -0.03, max: 0.03, noNaN: true }),
        fc.double({ min: 1.4, max: 5, noNaN: true }),
        fc.double({ min: -6, max: 6, noNaN: true }),
        (m, t, camber, mach, alphaDeg) => {
          const section = lens(m, t, camber);
          const solved = solveSection(input(section, mach, alphaDeg, { fieldExtentChords: 2 }));
          if (solved.waves.length === 0) return;
          const along = pressureField(solved.waves, section);
          const ys = Array.from({ length: 61 }, (_, i) => 1.5 - (3 * i) / 60);
          checked.hit();
          expect(pressureRows(solved.waves, section, ys, -0.5, 3)).toEqual(ys.map((y) => along(y, -0.5, 3)));
        },
      ),
      { numRuns: 40 },
    );
    checked.expectAtLeast(30);
  });

  it('pressureSignature: the peak falls with distance like the far-field nose shock, and 2 chords below equals the field read directly', () => {
    const near = pressureSignature(result, 'below', 2)!;
    const far = pressureSignature(result, 'below', 8)!;
    const above = pressureSignature(result, 'above', 2)!;
    expect(near.max - 1).toBeGreaterThan(far.max - 1);
    // Weak-shock theory (G. B. Whitham, 1974): (Δp)² · distance levels off far away.
    expect((far.max - 1) ** 2 * 8).toBeGreaterThan(0.5 * (near.max - 1) ** 2 * 2);
    expectClose(above.max, near.max, 1e-12);
    const direct = solveSection(input(pts, 2, 0, { fieldExtentChords: 20 }));
    const nose = direct.waves.find((w) => w.id === 'wave_lower_0')!;
    // The first step off the free stream is the nose shock's pressure where it crosses the line
    // (the next steps, behind rays that met the shock further in, may sit a little higher: the
    // weak reflected wave the interactions neglect).
    const jump = near.p.find((p) => p !== 1) as number;
    expectClose(jump, shockPressureAt(nose, near.y), 1e-9);
    expectClose(near.max, jump, 0.01);
    expect(near.y).toBeCloseTo(-0.05 - 2, 12);
  });

  it('signatureCsv: the title in its own quoted, neutralised cell [CSV1][CSV2][CSV4], bare numbers [CSV3], the caution, one row per step edge', () => {
    const sig = pressureSignature(result, 'below', 2)!;
    const text = signatureCsv('=cmd|"calc"\nnext', result, sig);
    const lines = text.split('\n');
    expect(lines[0]).toBe('# Shockwright pressure signature:,"\'=cmd|""calc"" next"');
    expect(text).toContain(RESULTS_CAUTION);
    const header = lines.indexOf('x_over_c_from_nose,p_over_pinf_ahead,p_over_pinf_behind');
    expect(header).toBeGreaterThan(0);
    expect(lines.length - header - 2).toBe(sig.xOverC.length);
    expect(lines[header + 1]).toMatch(/^-?[\d.e-]+,,1$/);
  });
});
