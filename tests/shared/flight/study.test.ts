import { reached } from '../../helpers/reached.ts';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';
import { planStudy, runStudy, runStudySliced, studyRow } from '../../../shared/flight/study.ts';
import { RESULTS_CAUTION } from '../../../shared/model/caution.ts';
import { defaultSketchDocument, sketchCase, type SketchCase } from '../../../shared/model/sketch.ts';
import {
  STUDY_COLUMNS,
  STUDY_MAX_POINTS,
  packStudyRows,
  roundSignificant,
  studyCsv,
  studyDefinitionSchema,
  unpackStudyRows,
  type StudyDefinitionInput,
  type StudyResults,
} from '../../../shared/model/study.ts';
import { expectClose, expectCloseRel } from '../../helpers/expectClose.ts';
import { firstItem, itemAt } from '../../../shared/util/invariant.ts';
import { CHORD_M, SPAN_M, handLoads, wedgeDocument } from './wedgeByHand.ts';

/** Our own 6 %-thick diamond fin with a 25 % flap (the demo's kind of section). */
function flappedDiamond(): SketchCase {
  return {
    ...sketchCase(defaultSketchDocument()),
    section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] },
    condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: 11_000 },
    flap: { hingeXOverC: 0.75, deflectionDeg: 0 },
    loads: { chordM: 0.4, spanM: 0.3, friction: 'turbulent' },
  };
}

const def = (input: StudyDefinitionInput) => studyDefinitionSchema.parse(input);

function done(outcome: ReturnType<typeof runStudy>): StudyResults {
  if (outcome.status !== 'done') throw new Error(`study did not finish: ${JSON.stringify(outcome)}`);
  return outcome.results;
}

describe('study definitions [ST2] [ST4]', () => {
  it('expands ranges inclusively, reads 0.1 steps as typed, sorts lists, and sweeps a flapless sketch at null', () => {
    const doc = { ...flappedDiamond(), flap: null };
    const p = planStudy(doc, def({ mach: { kind: 'range', start: 1.5, end: 2.5, step: 0.1 }, alpha: { startDeg: -2, endDeg: 2, stepDeg: 1 }, flapDeg: [5, -5] }));
    if (!p.ok) throw new Error(p.reason);
    expect(p.plan.machs).toEqual([1.5, 1.6, 1.7, 1.8, 1.9, 2, 2.1, 2.2, 2.3, 2.4, 2.5]);
    expect(p.plan.alphasDeg).toEqual([-2, -1, 0, 1, 2]);
    expect(p.plan.flapsDeg).toEqual([null]);
    expect(p.plan.total).toBe(55);
    const list = planStudy(flappedDiamond(), def({ mach: { kind: 'list', values: [3, 1.5, 3, 2] }, alpha: { startDeg: 0, endDeg: 0, stepDeg: 1 } }));
    if (!list.ok) throw new Error(list.reason);
    expect(list.plan.machs).toEqual([1.5, 2, 3]);
    expect(list.plan.flapsDeg).toEqual([0]); // no deflections given: the sketch's own
  });

  it('refuses an end below the start, a Mach number at or below 1, and more than STUDY_MAX_POINTS points', () => {
    const bad = studyDefinitionSchema.safeParse({ mach: { kind: 'range', start: 3, end: 2, step: 0.5 }, alpha: { startDeg: 0, endDeg: 1, stepDeg: 1 } });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]).toMatchObject({ path: ['mach', 'end'], message: 'must not be below the start' });
    expect(studyDefinitionSchema.safeParse({ mach: { kind: 'list', values: [1] }, alpha: { startDeg: 0, endDeg: 1, stepDeg: 1 } }).success).toBe(false);
    const huge = studyDefinitionSchema.safeParse({ mach: { kind: 'range', start: 1.1, end: 5, step: 0.04 }, alpha: { startDeg: -30, endDeg: 30, stepDeg: 0.1 }, flapDeg: [0, 1, 2] });
    expect(huge.success).toBe(false);
    expect(huge.error!.issues.map((i) => i.message).join(' ')).toMatch(new RegExp(`at most ${STUDY_MAX_POINTS}`));
  });
});

describe('roundSignificant [ST3]', () => {
  it('keeps 7 significant figures: within one unit of the 7th figure of toPrecision(7), and exactly 7 figures long', () => {
    const checked = reached('[ST3] rounded values');
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 }), (v) => {
        const r = roundSignificant(v);
        checked.hit();
        expect(Number(r.toPrecision(7))).toBe(r);
        expect(Math.abs(r - Number(v.toPrecision(7)))).toBeLessThanOrEqual(Math.abs(v) * 1.01e-6);
      }),
      { numRuns: 300 },
    );
    checked.expectAtLeast(300);
    expect([0.1234567891, -3.14159265, 12345678.9, 2.5e-9, 0, 1].map(roundSignificant)).toEqual([0.1234568, -3.141593, 12345680, 2.5e-9, 0, 1]);
  });
});

describe('runStudy', () => {
  const doc = flappedDiamond();
  const definition = def({ mach: { kind: 'list', values: [1.4, 2, 3.2] }, alpha: { startDeg: -20, endDeg: 24, stepDeg: 4 }, flapDeg: [-10, 0, 10], altitudeM: 11_000, friction: 'turbulent' });

  it('[ST1] every row equals a single analyseSketch at the same Mach, α and deflection (wave map off)', () => {
    const results = done(runStudy(doc, definition));
    const rows = unpackStudyRows(results);
    expect(rows).toHaveLength(3 * 12 * 3);
    let i = 0;
    for (const flapDeg of [-10, 0, 10]) {
      for (const mach of [1.4, 2, 3.2]) {
        for (let alphaDeg = -20; alphaDeg <= 24; alphaDeg += 4) {
          const single = analyseSketch(doc, { waves: false, mach, alphaDeg, flapDeg, altitudeM: 11_000, friction: 'turbulent' });
          // Packed rows keep 7 significant figures ([ST3]); compare with the single solve packed alike.
          expect(results.rows[i]).toEqual(packStudyRows([studyRow(single, mach, alphaDeg, flapDeg)])[0]);
          i++;
        }
      }
    }
    // The sweep crosses the nose detachment boundary, so both kinds of rows are compared.
    expect(new Set(rows.map((r) => r.status))).toEqual(new Set(['ok', 'detached']));
  });

  it('[ST3] packing keeps 7 significant figures and round-trips the columns', () => {
    const results = done(runStudy(doc, def({ mach: { kind: 'list', values: [2.2] }, alpha: { startDeg: 3, endDeg: 3, stepDeg: 1 }, flapDeg: [5], altitudeM: 9000 })));
    const single = studyRow(analyseSketch(doc, { waves: false, mach: 2.2, alphaDeg: 3, flapDeg: 5, altitudeM: 9000 }), 2.2, 3, 5);
    const row = itemAt(unpackStudyRows(results), 0);
    expect(results.columns).toEqual(STUDY_COLUMNS);
    for (const k of ['cl', 'cd', 'cdFriction', 'cm', 'chExact', 'clLinear', 'cdSecondOrder'] as const) expectCloseRel(row[k]!, single[k]!, 5e-7);
    expect(row.status).toBe('ok');
    expect(row.limit).toBeNull();
  });

  it('total drag is wave + friction at an altitude, and wave drag alone without one', () => {
    const high = firstItem(unpackStudyRows(done(runStudy(doc, def({ mach: { kind: 'list', values: [2] }, alpha: { startDeg: 2, endDeg: 2, stepDeg: 1 }, altitudeM: 11_000 })))));
    expect(high.cdFriction!).toBeGreaterThan(0);
    expectClose(high.cdTotal!, high.cd! + high.cdFriction!, 1e-7);
    expectCloseRel(high.liftToDrag!, high.cl! / high.cdTotal!, 1e-6);
    const none = firstItem(unpackStudyRows(done(runStudy(doc, def({ mach: { kind: 'list', values: [2] }, alpha: { startDeg: 2, endDeg: 2, stepDeg: 1 }, altitudeM: null })))));
    expect(none.cdFriction).toBeNull();
    expect(none.cdTotal).toBe(none.cd);
    expect(none.liftToDrag).toBe(none.liftToDragWave);
  });

  it('hinge moment sign at study level: restoring (dch/dδ < 0), zero for the symmetric diamond at α = 0, δ = 0 (common practice)', () => {
    const results = done(runStudy(doc, def({ mach: { kind: 'list', values: [1.6, 2.5, 4] }, alpha: { startDeg: 0, endDeg: 0, stepDeg: 1 }, flapDeg: [-8, -4, 0, 4, 8] })));
    const rows = unpackStudyRows(results);
    for (const mach of [1.6, 2.5, 4]) {
      const line = rows.filter((r) => r.mach === mach).sort((a, b) => a.flapDeg! - b.flapDeg!);
      expect(line.map((r) => r.status)).toEqual(['ok', 'ok', 'ok', 'ok', 'ok']);
      for (let k = 1; k < line.length; k++) {
        expect(itemAt(line, k).chExact!).toBeLessThan(itemAt(line, k - 1).chExact!);
        expect(itemAt(line, k).chLinear!).toBeLessThan(itemAt(line, k - 1).chLinear!);
      }
      const zero = line.find((r) => r.flapDeg === 0)!;
      expectClose(zero.chExact!, 0, 1e-9);
      expect(line.find((r) => r.flapDeg === 8)!.chExact!).toBeLessThan(0);
    }
  });

  it('the nose detachment boundary is α = φ_lower + θmax: detached at the nose just above it, not just below (θmax(M=2) = 22.97°, NACA Report 1135, from memory)', () => {
    const results = done(runStudy(doc, def({ mach: { kind: 'list', values: [1.5, 2, 3] }, alpha: { startDeg: 0, endDeg: 1, stepDeg: 1 }, flapDeg: [0] })));
    const phiLowerDeg = (Math.atan2(-0.03, 0.5) * 180) / Math.PI;
    const m2 = results.summaries.find((s) => s.mach === 2)!;
    expectClose(m2.detachAlphaHighDeg!, phiLowerDeg + 22.97, 0.01);
    expectClose(m2.detachAlphaLowDeg!, -phiLowerDeg - 22.97, 0.01); // symmetric section
    for (const s of results.summaries) {
      const noseDetached = (alphaDeg: number) =>
        analyseSketch(doc, { waves: false, mach: s.mach, alphaDeg, flapDeg: 0 }).result!.limits.some((l) => l.status === 'detached' && l.surface === 'lower' && l.vertex === 0);
      expect(noseDetached(s.detachAlphaHighDeg! + 0.01)).toBe(true);
      expect(noseDetached(s.detachAlphaHighDeg! - 0.01)).toBe(false);
    }
  });

  it('best L/D per Mach and deflection is the largest L/D among that line’s ok points', () => {
    const results = done(runStudy(doc, definition));
    const rows = unpackStudyRows(results);
    for (const s of results.summaries) {
      expect(s.best.map((b) => b.flapDeg)).toEqual([-10, 0, 10]);
      for (const b of s.best) {
        const line = rows.filter((r) => r.mach === s.mach && r.flapDeg === b.flapDeg && r.status === 'ok');
        const top = Math.max(...line.map((r) => r.liftToDrag!));
        expectCloseRel(b.liftToDrag, top, 1e-6);
        expect(line.find((r) => r.alphaDeg === b.alphaDeg)!.liftToDrag).toBe(top);
      }
    }
  });

  it('reports progress up to the total and stops between points when cancelled', () => {
    const seen: number[] = [];
    const full = runStudy(doc, definition, { progressEvery: 20, onProgress: (p) => seen.push(p.done) });
    expect(full.status).toBe('done');
    expect(seen.at(-1)).toBe(108);
    expect(seen).toEqual([...seen].sort((a, b) => a - b));
    let calls = 0;
    // The flag is read after each point: the 31st read says stop, so 31 points were computed.
    const cancelled = runStudy(doc, definition, { isCancelled: () => ++calls > 30 });
    expect(cancelled).toEqual({ status: 'cancelled', done: 31, total: 108 });
  });

  it('the sliced runner gives the same results and can be cancelled between slices', async () => {
    const pause = () => new Promise<void>((r) => setImmediate(r));
    const sliced = await runStudySliced(doc, definition, { pause, sliceMs: 0 });
    expect(done(sliced as ReturnType<typeof runStudy>)).toEqual(done(runStudy(doc, definition)));
    let progressCalls = 0;
    let stop = false;
    const cancelled = await runStudySliced(doc, definition, {
      pause,
      sliceMs: 0,
      onProgress: () => (stop = ++progressCalls >= 2),
      isCancelled: () => stop,
    });
    expect(cancelled.status).toBe('cancelled');
  });

  it('slicePoints caps every slice by count, however long the clock allows', async () => {
    const planned = planStudy(doc, definition);
    const points = planned.ok ? planned.plan.total : 0;
    expect(points).toBe(3 * 12 * 3);
    const sizes: number[] = [];
    let last = 0;
    const sliced = await runStudySliced(doc, definition, {
      pause: () => new Promise<void>((r) => setImmediate(r)),
      sliceMs: 60_000,
      slicePoints: 7,
      onProgress: ({ done }) => {
        sizes.push(done - last);
        last = done;
      },
    });
    expect(done(sliced as ReturnType<typeof runStudy>)).toEqual(done(runStudy(doc, definition)));
    // One progress call per slice: 7 points each, the last one the rest (108 = 15 × 7 + 3).
    expect(sizes).toEqual([...Array.from({ length: 15 }, () => 7), 3]);
    expect(sizes.reduce((a, b) => a + b, 0)).toBe(points);
  });

  it('a flap deflection that folds the section gives invalid rows with the reason, not an exception', () => {
    const deep = { ...doc, section: { points: [[0, 0], [0.6, 0.3], [1, 0], [0.62, -0.3]] as [number, number][] }, flap: { hingeXOverC: 0.6, deflectionDeg: 0 } };
    const rows = unpackStudyRows(done(runStudy(deep, def({ mach: { kind: 'list', values: [3] }, alpha: { startDeg: 0, endDeg: 0, stepDeg: 1 }, flapDeg: [0, 45] }))));
    expect(rows[1]).toMatchObject({ flapDeg: 45, status: 'invalid', cl: null, limit: expect.stringContaining('folds the section') });
  });

  it('CSV export carries the caution, a header and one line per point', () => {
    const results = done(runStudy(doc, definition));
    const csv = studyCsv({ title: 'HD-7 fin', studyName: 'Envelope', revision: 4, caution: RESULTS_CAUTION }, results);
    const lines = csv.trimEnd().split('\n');
    expect(lines[2]).toBe(`# ${RESULTS_CAUTION}`);
    expect(lines[3]).toMatch(/^# loads in SI: liftNPerM, dragNPerM .* N\/m .* N·m\/m per unit span on a 0.4 m chord; liftN, dragN, momentNM, hingeMomentNM over the 0.3 m span$/);
    expect(lines[4]).toBe([...STUDY_COLUMNS, 'liftN', 'dragN', 'momentNM', 'hingeMomentNM'].join(','));
    expect(lines).toHaveLength(5 + 108);
  });

  it('loads columns: a double wedge at Mach 2, α 5°, 11 km gives lift, drag and moment in N/m and, in the CSV, N over the 3 m span equal to a hand integration (1976 standard p∞ 22 700 Pa)', () => {
    const wedge = sketchCase(wedgeDocument());
    const results = done(runStudy(wedge, def({ mach: { kind: 'list', values: [2] }, alpha: { startDeg: 4, endDeg: 5, stepDeg: 1 }, altitudeM: 11_000, friction: 'none' })));
    expect(results.chordM).toBe(CHORD_M);
    expect(results.spanM).toBe(SPAN_M);
    const row = unpackStudyRows(results).find((r) => r.alphaDeg === 5)!;
    const hand = handLoads();
    expectCloseRel(row.liftNPerM!, hand.lift, 3e-5);
    expectCloseRel(row.dragNPerM!, hand.drag, 3e-5);
    expectCloseRel(row.momentNMPerM!, hand.moment, 3e-5);
    expect(row.hingeMomentNMPerM).toBeNull();
    const csv = studyCsv({ title: 'wedge', studyName: 'loads', revision: 1, caution: RESULTS_CAUTION }, results).trimEnd().split('\n');
    const header = itemAt(csv, 4).split(',');
    const line = itemAt(csv, 6).split(',');
    expectCloseRel(Number(line[header.indexOf('liftN')]), hand.lift * SPAN_M, 3e-5);
    expectCloseRel(Number(line[header.indexOf('momentNM')]), hand.moment * SPAN_M, 3e-5);
  });

  it('loads columns are null without an altitude, and a study stored before them reads them as null', () => {
    const results = done(runStudy(sketchCase(wedgeDocument()), def({ mach: { kind: 'list', values: [2] }, alpha: { startDeg: 5, endDeg: 5, stepDeg: 1 }, altitudeM: null })));
    expect(unpackStudyRows(results)[0]).toMatchObject({ liftNPerM: null, dragNPerM: null, momentNMPerM: null });
    // A study stored before the loads columns: the same rows without them.
    const withAltitude = done(runStudy(sketchCase(wedgeDocument()), def({ mach: { kind: 'list', values: [2] }, alpha: { startDeg: 5, endDeg: 5, stepDeg: 1 }, altitudeM: 11_000 })));
    const keep = withAltitude.columns.map((c, i) => [c, i] as const).filter(([c]) => !c.endsWith('PerM'));
    const old = { columns: keep.map(([c]) => c), rows: withAltitude.rows.map((r) => keep.map(([, i]) => r[i] ?? null)) };
    const [row] = unpackStudyRows(old);
    expect(row).toMatchObject({ liftNPerM: null, dragNPerM: null, momentNMPerM: null, hingeMomentNMPerM: null, status: 'ok' });
    expect(row!.cl).toBeGreaterThan(0);
  });
});
