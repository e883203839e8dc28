import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  defaultSketchDocument,
  FIRST_DESIGN_POINT_ID,
  MAX_DESIGN_POINTS,
  normalizeDocument,
  selectedPoint,
  sketchCase,
  sketchDocumentSchema,
  type DesignPoint,
  type SketchDocument,
} from '../../../shared/model/sketch.ts';
import { applyOp, invertOp, sketchOpSchema, withOpId, type SketchOp, type SketchOpDraft } from '../../../shared/model/ops.ts';
import { applyEdit } from '../../../shared/protocol/transform.ts';
import { reached } from '../../helpers/reached.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/** A stored document as version 1 wrote it (one condition, the deflection on the flap). */
const V1 = {
  version: 1,
  section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] },
  condition: { mach: 2.4, alphaDeg: 3, gamma: 1.4, altitudeM: 9000 },
  flap: { hingeXOverC: 0.7, deflectionDeg: 6 },
  momentPoint: null,
  notes: 'Old fin',
  loads: { chordM: 0.3, spanM: 0.2, friction: 'turbulent' },
};

function point(id: string, name: string, mach = 2, alphaDeg = 2): DesignPoint {
  return { id, name, condition: { mach, alphaDeg, gamma: 1.4, altitudeM: null }, flapDeflectionDeg: 0 };
}

/** The demo wedge with three design points (cruise selected) and a flap. */
function threePoints(): SketchDocument {
  return {
    ...defaultSketchDocument(),
    flap: { hingeXOverC: 0.75 },
    designPoints: [point('point_cruise00000000000000', 'Cruise', 2, 1), point('point_pullup00000000000000', 'Pull-up', 1.8, 8), point('point_maxq0000000000000000', 'Max q', 3, 0)],
    selectedPointId: 'point_cruise00000000000000',
  };
}

function applied(doc: SketchDocument, op: SketchOpDraft | SketchOp): SketchDocument {
  const r = applyOp(doc, 'opId' in op ? op : withOpId(op));
  if (!r.ok) throw new Error(r.reason);
  return r.doc;
}

describe('document versions', () => {
  it('[D4] a version 1 document reads back as one design point with its condition and flap deflection', () => {
    const doc = normalizeDocument(V1);
    expect(doc.version).toBe(2);
    expect(doc.designPoints).toEqual([{ id: FIRST_DESIGN_POINT_ID, name: 'Design point 1', condition: V1.condition, flapDeflectionDeg: 6 }]);
    expect(doc.selectedPointId).toBe(FIRST_DESIGN_POINT_ID);
    expect(doc.flap).toEqual({ hingeXOverC: 0.7 });
    expect(doc.notes).toBe('Old fin');
    // The same stored row read twice names its point the same way (edits name points by id).
    expect(normalizeDocument(V1)).toEqual(doc);
    // Its case is exactly the version 1 document's condition and flap.
    expect(sketchCase(doc)).toEqual({ section: V1.section, condition: V1.condition, flap: V1.flap, momentPoint: null, loads: V1.loads });
  });

  it('[D4] a version 1 document missing later fields gets their defaults, and its errors name version 1 fields', () => {
    const bare = normalizeDocument({ version: 1, section: V1.section, condition: { mach: 2, alphaDeg: 0 } });
    expect(selectedPoint(bare).condition).toEqual({ mach: 2, alphaDeg: 0, gamma: 1.4, altitudeM: null });
    expect(bare.flap).toBeNull();
    const bad = sketchDocumentSchema.safeParse({ ...V1, condition: { ...V1.condition, mach: 0.5 } });
    expect(bad.success).toBe(false);
    expect(itemAt(bad.error!.issues, 0).path).toEqual(['condition', 'mach']);
  });

  it('refuses an unknown version, unknown keys, repeated ids or names and a selection that is not a point [D1]–[D3]', () => {
    expect(itemAt(sketchDocumentSchema.safeParse({ ...V1, version: 3 }).error!.issues, 0).message).toBe('version must be 1 or 2');
    const doc = threePoints();
    const misspelt = sketchDocumentSchema.safeParse({ ...doc, designPoints: [{ ...doc.designPoints[0], gama: 1.3 }] });
    expect(misspelt.error!.issues[0]).toMatchObject({ code: 'unrecognized_keys', keys: ['gama'], path: ['designPoints', 0] });
    const twiceId = sketchDocumentSchema.safeParse({ ...doc, designPoints: [doc.designPoints[0], { ...doc.designPoints[1], id: 'point_cruise00000000000000' }] });
    expect(twiceId.error!.issues[0]).toMatchObject({ path: ['designPoints', 1, 'id'], message: 'repeats the id of design point 0' });
    const twiceName = sketchDocumentSchema.safeParse({ ...doc, designPoints: [doc.designPoints[0], { ...doc.designPoints[1], name: ' cruise ' }] });
    expect(twiceName.error!.issues[0]).toMatchObject({ path: ['designPoints', 1, 'name'], message: 'repeats the name “Cruise”' });
    const lost = sketchDocumentSchema.safeParse({ ...doc, selectedPointId: 'point_elsewhere00000000000' });
    expect(lost.error!.issues[0]).toMatchObject({ path: ['selectedPointId'], message: 'must name one of the design points' });
    const none = sketchDocumentSchema.safeParse({ ...doc, designPoints: [] });
    expect(itemAt(none.error!.issues, 0).message).toBe('a sketch needs at least one design point');
    const many = Array.from({ length: MAX_DESIGN_POINTS + 1 }, (_, i) => point(`point_p${String(i).padStart(19, '0')}`, `P${i}`));
    expect(itemAt(sketchDocumentSchema.safeParse({ ...doc, designPoints: many, selectedPointId: 'point_p0000000000000000000' }).error!.issues, 0).message).toBe(`at most ${MAX_DESIGN_POINTS} design points`);
  });

  it('refuses design point names with control characters or unpaired surrogates, naming the field', () => {
    const doc = threePoints();
    for (const name of ['Cruise\u0000', 'Line\nbreak', 'Half \uD800 pair', '   ']) {
      const r = sketchDocumentSchema.safeParse({ ...doc, designPoints: [{ ...doc.designPoints[0], name }, ...doc.designPoints.slice(1)] });
      expect(r.success, JSON.stringify(name)).toBe(false);
      expect(itemAt(r.error!.issues, 0).path).toEqual(['designPoints', 0, 'name']);
    }
    // A paired surrogate (an emoji) is ordinary text.
    expect(sketchDocumentSchema.safeParse({ ...doc, designPoints: [{ ...doc.designPoints[0], name: 'Cruise 🚀' }, ...doc.designPoints.slice(1)] }).success).toBe(true);
  });

  it('sketchCase gives a point its own condition and flap deflection; the hinge is the sketch’s', () => {
    const doc = applied(threePoints(), { type: 'setCondition', pointId: 'point_pullup00000000000000', field: 'flapDeflectionDeg', value: 8 });
    expect(sketchCase(doc, 'point_pullup00000000000000')).toMatchObject({ condition: { mach: 1.8, alphaDeg: 8 }, flap: { hingeXOverC: 0.75, deflectionDeg: 8 } });
    expect(sketchCase(doc)).toMatchObject({ condition: { mach: 2, alphaDeg: 1 }, flap: { hingeXOverC: 0.75, deflectionDeg: 0 } });
    expect(sketchCase({ ...doc, flap: null }, 'point_pullup00000000000000').flap).toBeNull();
  });
});

describe('design point ops', () => {
  it('add appends or inserts, refuses a taken name (ignoring case), a repeated id and a thirteenth point', () => {
    const doc = threePoints();
    const added = applied(doc, { type: 'addDesignPoint', point: point('point_dash0000000000000000', 'Dash', 4, 0), index: 1 });
    expect(added.designPoints.map((p) => p.name)).toEqual(['Cruise', 'Dash', 'Pull-up', 'Max q']);
    expect(added.selectedPointId).toBe('point_cruise00000000000000');
    expect(applied(doc, { type: 'addDesignPoint', point: point('point_dash0000000000000000', 'Dash'), index: 99, select: true })).toMatchObject({ selectedPointId: 'point_dash0000000000000000' });
    expect(applyOp(doc, withOpId({ type: 'addDesignPoint', point: point('point_dash0000000000000000', 'max Q'), index: 0 }))).toEqual({ ok: false, reason: 'There is already a design point named “Max q”.' });
    expect(applyOp(doc, withOpId({ type: 'addDesignPoint', point: point('point_cruise00000000000000', 'Other'), index: 0 }))).toEqual({ ok: false, reason: 'That design point is already in the sketch.' });
    let full = doc;
    for (let i = 3; i < MAX_DESIGN_POINTS; i++) full = applied(full, { type: 'addDesignPoint', point: point(`point_extra${String(i).padStart(15, '0')}`, `Extra ${i}`), index: i });
    expect(applyOp(full, withOpId({ type: 'addDesignPoint', point: point('point_last0000000000000000', 'Last'), index: 0 }))).toEqual({ ok: false, reason: `A sketch holds at most ${MAX_DESIGN_POINTS} design points.` });
  });

  it('remove keeps at least one point and moves the selection to the point taking its place', () => {
    const doc = threePoints();
    const withoutCruise = applied(doc, { type: 'removeDesignPoint', pointId: 'point_cruise00000000000000' });
    expect(withoutCruise.designPoints.map((p) => p.id)).toEqual(['point_pullup00000000000000', 'point_maxq0000000000000000']);
    expect(withoutCruise.selectedPointId).toBe('point_pullup00000000000000');
    const lastSelected = applied(applied(doc, { type: 'selectDesignPoint', pointId: 'point_maxq0000000000000000' }), { type: 'removeDesignPoint', pointId: 'point_maxq0000000000000000' });
    expect(lastSelected.selectedPointId).toBe('point_pullup00000000000000');
    const chosen = applied(doc, { type: 'removeDesignPoint', pointId: 'point_cruise00000000000000', select: 'point_maxq0000000000000000' });
    expect(chosen.selectedPointId).toBe('point_maxq0000000000000000');
    const one = applied(applied(withoutCruise, { type: 'removeDesignPoint', pointId: 'point_pullup00000000000000' }), { type: 'renameDesignPoint', pointId: 'point_maxq0000000000000000', name: 'Only' });
    expect(applyOp(one, withOpId({ type: 'removeDesignPoint', pointId: 'point_maxq0000000000000000' }))).toEqual({ ok: false, reason: 'A sketch keeps at least one design point.' });
  });

  it('rename trims, refuses a name another point has, and accepts a new case of its own name', () => {
    const doc = threePoints();
    expect(itemAt(applied(doc, { type: 'renameDesignPoint', pointId: 'point_cruise00000000000000', name: '  Cruise 2  ' }).designPoints, 0).name).toBe('Cruise 2');
    expect(itemAt(applied(doc, { type: 'renameDesignPoint', pointId: 'point_cruise00000000000000', name: 'CRUISE' }).designPoints, 0).name).toBe('CRUISE');
    expect(applyOp(doc, withOpId({ type: 'renameDesignPoint', pointId: 'point_cruise00000000000000', name: 'pull-up' }))).toEqual({ ok: false, reason: 'There is already a design point named “Pull-up”.' });
    expect(applyOp(doc, withOpId({ type: 'renameDesignPoint', pointId: 'point_cruise00000000000000', name: '' })).ok).toBe(false);
  });

  it('move puts a point at a position (past the end = last); select and edits name points by id', () => {
    const doc = threePoints();
    expect(applied(doc, { type: 'moveDesignPoint', pointId: 'point_cruise00000000000000', index: 2 }).designPoints.map((p) => p.name)).toEqual(['Pull-up', 'Max q', 'Cruise']);
    expect(applied(doc, { type: 'moveDesignPoint', pointId: 'point_maxq0000000000000000', index: 0 }).designPoints.map((p) => p.name)).toEqual(['Max q', 'Cruise', 'Pull-up']);
    expect(applied(doc, { type: 'moveDesignPoint', pointId: 'point_cruise00000000000000', index: 40 }).designPoints.map((p) => p.name)).toEqual(['Pull-up', 'Max q', 'Cruise']);
    const edited = applied(doc, { type: 'setCondition', pointId: 'point_maxq0000000000000000', field: 'mach', value: 3.4 });
    expect(edited.designPoints.map((p) => p.condition.mach)).toEqual([2, 1.8, 3.4]);
    expect(applyOp(doc, withOpId({ type: 'setCondition', pointId: 'point_gone0000000000000000', field: 'mach', value: 3 }))).toEqual({
      ok: false,
      reason: 'That design point is not in the sketch (perhaps someone removed it meanwhile).',
    });
    expect(applyOp(doc, withOpId({ type: 'setCondition', pointId: 'point_maxq0000000000000000', field: 'flapDeflectionDeg', value: 50 }))).toEqual({ ok: false, reason: 'Flap deflection must be at most 45°.' });
    expect(applied(doc, { type: 'selectDesignPoint', pointId: 'point_maxq0000000000000000' }).selectedPointId).toBe('point_maxq0000000000000000');
  });

  it('[O6] ops without a point id (old edit logs) mean the selected point; a version 1 log replays onto the upgraded document', () => {
    // The log of a version 1 sketch: a condition edit, a flap with its deflection, a whole-document save.
    const log: SketchOp[] = [
      withOpId({ type: 'setCondition', field: 'alphaDeg', value: 5 }),
      withOpId({ type: 'setFlap', flap: { hingeXOverC: 0.65, deflectionDeg: -4 } }),
    ];
    let state = { title: 'Old', document: normalizeDocument(V1) };
    for (const op of log) {
      const r = applyEdit(state, op);
      if (!r.ok) throw new Error(r.reason);
      state = r.state;
    }
    const replace = { type: 'replaceDocument' as const, opId: 'old-save', document: { ...V1, notes: 'saved' } as unknown as SketchDocument };
    const trusted = applyEdit(state, replace, { trusted: true });
    expect(trusted.ok && trusted.state.document.version).toBe(2);
    expect(trusted.ok && trusted.state.document.notes).toBe('saved');
    expect(sketchCase(state.document)).toMatchObject({ condition: { alphaDeg: 5 }, flap: { hingeXOverC: 0.65, deflectionDeg: -4 } });
    // With several points the id-less op goes to the selected one.
    const doc = applied(threePoints(), { type: 'selectDesignPoint', pointId: 'point_pullup00000000000000' });
    expect(applied(doc, { type: 'setCondition', field: 'mach', value: 2.9 }).designPoints.map((p) => p.condition.mach)).toEqual([2, 2.9, 3]);
  });
});

describe('invertOp on design points [O3]', () => {
  const base = threePoints();
  const cases: [string, SketchDocument, SketchOpDraft][] = [
    ['add', base, { type: 'addDesignPoint', point: point('point_dash0000000000000000', 'Dash', 4, 0), index: 1 }],
    ['add and select', base, { type: 'addDesignPoint', point: point('point_dash0000000000000000', 'Dash', 4, 0), index: 3, select: true }],
    ['remove an unselected point', base, { type: 'removeDesignPoint', pointId: 'point_pullup00000000000000' }],
    ['remove the selected point', base, { type: 'removeDesignPoint', pointId: 'point_cruise00000000000000' }],
    ['rename', base, { type: 'renameDesignPoint', pointId: 'point_maxq0000000000000000', name: 'Max dynamic pressure' }],
    ['move', base, { type: 'moveDesignPoint', pointId: 'point_cruise00000000000000', index: 2 }],
    ['select', base, { type: 'selectDesignPoint', pointId: 'point_maxq0000000000000000' }],
    ['set a named point’s Mach', base, { type: 'setCondition', pointId: 'point_pullup00000000000000', field: 'mach', value: 2.2 }],
    ['set a named point’s deflection', base, { type: 'setCondition', pointId: 'point_pullup00000000000000', field: 'flapDeflectionDeg', value: -7 }],
    ['set the selected point’s altitude (no id)', base, { type: 'setCondition', field: 'altitudeM', value: 12_000 }],
    ['switch the flap off', base, { type: 'setFlap', flap: null }],
    ['move the hinge', base, { type: 'setFlap', flap: { hingeXOverC: 0.6 } }],
    ['flap with a deflection (old logs)', base, { type: 'setFlap', pointId: 'point_maxq0000000000000000', flap: { hingeXOverC: 0.6, deflectionDeg: 3 } }],
    ['flap switched on with a deflection', { ...base, flap: null }, { type: 'setFlap', flap: { hingeXOverC: 0.6, deflectionDeg: 3 } }],
  ];
  it.each(cases)('%s followed by its inverse gives the document back', (_name, before, draft) => {
    const op = withOpId(draft);
    const after = applied(before, op);
    const inverse = invertOp(before, op);
    expect(sketchOpSchema.safeParse(inverse).success).toBe(true);
    const back = applied(after, inverse);
    // A flap switched on and off again keeps the deflection the point was given meanwhile.
    if (_name === 'flap switched on with a deflection') expect({ ...back, designPoints: before.designPoints }).toEqual(before);
    else expect(back).toEqual(before);
    expect(sketchDocumentSchema.safeParse(after).success).toBe(true);
  });

  it('random sequences of design point edits undo in reverse order to the start, and every step is a valid document [O2][O3]', () => {
    const hits = reached('design point undo');
    const names = ['Cruise', 'Pull-up', 'Max q', 'Dash', 'Climb'];
    const opArb = fc.record({ kind: fc.integer({ min: 0, max: 6 }), a: fc.nat(20), b: fc.nat(20), name: fc.constantFrom(...names), value: fc.double({ min: 1.2, max: 4, noNaN: true }) });
    fc.assert(
      fc.property(fc.array(opArb, { minLength: 1, maxLength: 25 }), (steps) => {
        let doc = threePoints();
        const history: { before: SketchDocument; op: SketchOp }[] = [];
        let fresh = 0;
        for (const s of steps) {
          const pts = doc.designPoints;
          const p = itemAt(pts, s.a % pts.length);
          const draft: SketchOpDraft = [
            { type: 'addDesignPoint', point: point(`point_new${String(fresh++).padStart(17, '0')}`, `${s.name} ${s.b}`), index: s.b % (pts.length + 2), select: s.b % 2 === 0 },
            { type: 'removeDesignPoint', pointId: p.id },
            { type: 'renameDesignPoint', pointId: p.id, name: s.name },
            { type: 'moveDesignPoint', pointId: p.id, index: s.b % (pts.length + 1) },
            { type: 'selectDesignPoint', pointId: p.id },
            { type: 'setCondition', pointId: p.id, field: 'mach', value: s.value },
            { type: 'setCondition', pointId: p.id, field: 'flapDeflectionDeg', value: s.b - 10 },
          ][s.kind] as SketchOpDraft;
          const op = withOpId(draft);
          const r = applyOp(doc, op);
          if (!r.ok) continue;
          expect(sketchDocumentSchema.safeParse(r.doc).success).toBe(true);
          history.push({ before: doc, op });
          doc = r.doc;
        }
        if (history.length === 0) return;
        hits.hit();
        for (const { before, op } of [...history].reverse()) {
          const r = applyOp(doc, invertOp(before, op));
          if (!r.ok) throw new Error(r.reason);
          doc = r.doc;
          expect(doc).toEqual(before);
        }
      }),
      { numRuns: 300 },
    );
    hits.expectAtLeast(250);
  });
});
