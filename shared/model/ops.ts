import { z } from 'zod';
import { firstItem, itemAt } from '../util/invariant.ts';
import { newId } from './ids.ts';
import { textSchema } from './text.ts';
import { findRepeatedPoint, findRepeatedPointNear, findSelfIntersection, findSelfIntersectionNear, repeatTolerance, signedArea } from './polygon.ts';
import {
  conditionSchema,
  designPointIdSchema,
  designPointNameSchema,
  designPointSchema,
  designPointsProblem,
  findDesignPoint,
  flapDeflectionDegSchema,
  flapSchema,
  loadsSettingsSchema,
  MAX_SECTION_COORDINATE,
  MAX_SECTION_VERTICES,
  MAX_DESIGN_POINTS,
  pointSchema,
  sameDesignPointName,
  selectedPoint,
  type Condition,
  type DesignPoint,
  type Point,
  type SketchDocument,
} from './sketch.ts';

/**
 * Small edit ops on a sketch document. The editor's undo/redo, its autosave rebase and (later)
 * the realtime channel all speak these. Invariants (see shared/model/README.md):
 *
 * - [O1] `applyOp` never mutates its inputs; it returns a new document or a reason.
 * - [O2] A document that `applyOp` returns is valid: its section is a simple polygon of
 *   3…MAX_SECTION_VERTICES vertices and its condition, flap and moment point pass their zod schemas.
 * - [O3] `applyOp(applyOp(doc, op), invertOp(doc, op))` gives back `doc` (same values). One
 *   exception, only in edit logs from before design points: a `setFlap` that switches the flap
 *   on with a deflection is undone by switching it off; the point keeps that deflection, which
 *   nothing reads while the flap is off.
 * - [O4] Every op carries an `opId` so a server can ignore a duplicate.
 * - [O5] A form field's op names only the field its user changed (`setVertexCoordinate`,
 *   `setCondition`, `setField`), so two people editing neighbouring fields never overwrite
 *   each other's values with stale copies.
 * - [O6] Ops on a design point name it by id (`pointId`). An op without one — only edit logs
 *   written before design points have them — means the selected point, which in those
 *   documents was the only one.
 *
 * Renaming a sketch is not an op: the title is not part of the document.
 */

export const opIdSchema = textSchema().min(1, 'must not be empty').max(64, 'must be at most 64 characters');
const indexSchema = z.number().int('must be a whole number').min(0, 'must be at least 0');

export const moveVerticesOpSchema = z.object({
  type: z.literal('moveVertices'),
  opId: opIdSchema,
  /** Vertices to move (distinct). */
  indices: z.array(indexSchema).min(1, 'name at least one vertex'),
  /** New positions, one per index, in body axes. */
  to: z.array(pointSchema),
});

export const insertVertexOpSchema = z.object({
  type: z.literal('insertVertex'),
  opId: opIdSchema,
  /** Position the new vertex takes in the list (0…n); the vertices from there on shift by one. */
  index: indexSchema,
  at: pointSchema,
});

export const deleteVertexOpSchema = z.object({
  type: z.literal('deleteVertex'),
  opId: opIdSchema,
  index: indexSchema,
});

/** The two coordinates of a vertex, as the vertex table names them. */
export const VERTEX_AXES = ['x', 'y'] as const;
export type VertexAxis = (typeof VERTEX_AXES)[number];

/** One coordinate of one vertex (the vertex table): the other coordinate is left as it is. */
export const setVertexCoordinateOpSchema = z.object({
  type: z.literal('setVertexCoordinate'),
  opId: opIdSchema,
  index: indexSchema,
  axis: z.enum(VERTEX_AXES),
  value: z.number().finite('must be a finite number'),
});

export const replaceSectionOpSchema = z.object({
  type: z.literal('replaceSection'),
  opId: opIdSchema,
  points: z.array(pointSchema),
  /**
   * The physical chord (m) for loads, set together with the section: an import in millimetres
   * or inches keeps its chord, and one undo puts back both the section and the chord.
   */
  loadsChordM: z.number().gt(0, 'must be a positive length').max(1000, 'must be at most 1000 m').optional(),
});

/** The fields of a design point's condition a form edits one at a time. */
export const CONDITION_FIELDS = ['mach', 'alphaDeg', 'gamma', 'altitudeM', 'flapDeflectionDeg'] as const;
export type ConditionField = (typeof CONDITION_FIELDS)[number];

export const setConditionOpSchema = z.object({
  type: z.literal('setCondition'),
  opId: opIdSchema,
  /** The design point edited; absent only in old edit logs (= the selected point) [O6]. */
  pointId: designPointIdSchema.optional(),
  field: z.enum(CONDITION_FIELDS),
  /** `null` only for altitudeM (no altitude given). */
  value: z.number().nullable(),
});

export const setFlapOpSchema = z.object({
  type: z.literal('setFlap'),
  opId: opIdSchema,
  /**
   * The flap's hinge, or null to switch the flap off. `deflectionDeg`, when given, also sets
   * the deflection of design point `pointId` (edit logs from before design points always give it).
   */
  flap: flapSchema.extend({ deflectionDeg: flapDeflectionDegSchema.optional() }).nullable(),
  pointId: designPointIdSchema.optional(),
});

export const addDesignPointOpSchema = z.object({
  type: z.literal('addDesignPoint'),
  opId: opIdSchema,
  point: designPointSchema,
  /** Position in the list (0…n; past the end = last); the points from there on move down one. */
  index: indexSchema,
  /** Select the new point too (one undo step for "add and show"). */
  select: z.boolean().optional(),
});

export const removeDesignPointOpSchema = z.object({
  type: z.literal('removeDesignPoint'),
  opId: opIdSchema,
  pointId: designPointIdSchema,
  /**
   * The point selected afterwards when the removed one was selected (undo gives the one that was
   * selected before); absent or gone: the point that takes its place in the list, else the one before.
   */
  select: designPointIdSchema.optional(),
});

export const renameDesignPointOpSchema = z.object({
  type: z.literal('renameDesignPoint'),
  opId: opIdSchema,
  pointId: designPointIdSchema,
  name: designPointNameSchema,
});

export const moveDesignPointOpSchema = z.object({
  type: z.literal('moveDesignPoint'),
  opId: opIdSchema,
  pointId: designPointIdSchema,
  /** Position the point takes in the list (past the end = last). */
  index: indexSchema,
});

export const selectDesignPointOpSchema = z.object({
  type: z.literal('selectDesignPoint'),
  opId: opIdSchema,
  pointId: designPointIdSchema,
});

export const setMomentPointOpSchema = z.object({
  type: z.literal('setMomentPoint'),
  opId: opIdSchema,
  /** `null` = the default quarter chord. */
  point: pointSchema.nullable(),
});

export const setLoadsOpSchema = z.object({
  type: z.literal('setLoads'),
  opId: opIdSchema,
  /** Physical chord and span (m) and the friction regime used for loads. */
  loads: loadsSettingsSchema,
});

/**
 * Single fields of the document's small records, as the editor's forms edit them one at a time
 * [O5]. (A design point's condition fields, the flap deflection included, have their own op,
 * `setCondition`; switching the flap or the own moment point on and off replaces the record with
 * `setFlap` / `setMomentPoint`.) `flap.deflectionDeg` is only read from edit logs written before
 * design points: it sets the selected point's deflection [O6].
 */
export const DOCUMENT_FIELDS = ['flap.hingeXOverC', 'flap.deflectionDeg', 'momentPoint.x', 'momentPoint.y', 'loads.chordM', 'loads.spanM', 'loads.friction', 'loads.transitionReynolds'] as const;
export type DocumentField = (typeof DOCUMENT_FIELDS)[number];

export const setFieldOpSchema = z.object({
  type: z.literal('setField'),
  opId: opIdSchema,
  field: z.enum(DOCUMENT_FIELDS),
  /** A number, or the friction regime's name for `loads.friction`; checked by the record's schema. */
  value: z.union([z.number(), textSchema().max(32)]),
});

/** Human names of the document fields, for messages. */
export const DOCUMENT_FIELD_LABEL: Record<DocumentField, string> = {
  'flap.hingeXOverC': 'Hinge position',
  'flap.deflectionDeg': 'Flap deflection',
  'momentPoint.x': 'Moment point x',
  'momentPoint.y': 'Moment point y',
  'loads.chordM': 'Chord',
  'loads.spanM': 'Span',
  'loads.friction': 'Friction',
  'loads.transitionReynolds': 'Transition Reynolds number',
};

export const sketchOpSchema = z.discriminatedUnion('type', [
  moveVerticesOpSchema,
  setVertexCoordinateOpSchema,
  insertVertexOpSchema,
  deleteVertexOpSchema,
  replaceSectionOpSchema,
  setConditionOpSchema,
  setFlapOpSchema,
  setMomentPointOpSchema,
  setLoadsOpSchema,
  setFieldOpSchema,
  addDesignPointOpSchema,
  removeDesignPointOpSchema,
  renameDesignPointOpSchema,
  moveDesignPointOpSchema,
  selectDesignPointOpSchema,
]);
export type SketchOp = z.infer<typeof sketchOpSchema>;
export type SketchOpType = SketchOp['type'];

/** An op without its id, as tools and forms build it; `withOpId` completes it. */
export type SketchOpDraft = SketchOp extends infer T ? (T extends SketchOp ? Omit<T, 'opId'> : never) : never;

export type ApplyOpResult = { ok: true; doc: SketchDocument } | { ok: false; reason: string };

/** Gives a draft a fresh `op_…` id. */
export function withOpId(draft: SketchOpDraft, opId: string = newId('op')): SketchOp {
  return { ...draft, opId } as SketchOp;
}

/**
 * Applies one op to a document and validates the result [O1][O2]. A rejected op leaves
 * nothing changed and says why in one sentence a user can act on.
 */
export function applyOp(doc: SketchDocument, op: SketchOp, options: { trusted?: boolean } = {}): ApplyOpResult {
  // `trusted`: the op was already validated against this very document (the server confirmed
  // it), so the simple-polygon check is skipped. Index checks still run.
  const check = !options.trusted;
  const parsed = check ? sketchOpSchema.safeParse(op) : { success: true as const };
  if (!parsed.success) {
    const issue = firstItem(parsed.error.issues);
    return { ok: false, reason: `The edit is malformed: ${issue.path.join('.') || 'op'} ${issue.message}.` };
  }
  const points = doc.section.points;
  const n = points.length;
  switch (op.type) {
    case 'moveVertices': {
      if (op.indices.length !== op.to.length) {
        return { ok: false, reason: `The edit names ${op.indices.length} vertices but gives ${op.to.length} positions.` };
      }
      if (new Set(op.indices).size !== op.indices.length) {
        return { ok: false, reason: 'The edit names the same vertex twice.' };
      }
      const outOfRange = op.indices.find((i) => i >= n);
      if (outOfRange !== undefined) return { ok: false, reason: `There is no vertex ${outOfRange}; the section has ${n}.` };
      const next = points.map((p) => [p[0], p[1]] as Point);
      op.indices.forEach((i, k) => {
        const [x, y] = itemAt(op.to, k); // same length as op.indices, checked above
        next[i] = [x, y];
      });
      const verb = op.indices.length === 1 ? `Moving vertex ${op.indices[0]} there` : `Moving those ${op.indices.length} vertices there`;
      return withSection(doc, next, verb, check, op.indices.flatMap((i) => [i - 1, i]), op.indices);
    }
    case 'setVertexCoordinate': {
      if (op.index >= n) return { ok: false, reason: `There is no vertex ${op.index}; the section has ${n}.` };
      const next = points.map((p) => [p[0], p[1]] as Point);
      const [x, y] = itemAt(points, op.index);
      next[op.index] = op.axis === 'x' ? [op.value, y] : [x, op.value];
      return withSection(doc, next, `Setting vertex ${op.index}’s ${op.axis} to ${op.value}`, check, [op.index - 1, op.index], [op.index]);
    }
    case 'insertVertex': {
      if (op.index > n) return { ok: false, reason: `A vertex can go at positions 0 to ${n}; got ${op.index}.` };
      if (n + 1 > MAX_SECTION_VERTICES) return { ok: false, reason: `A section has at most ${MAX_SECTION_VERTICES} vertices.` };
      const next = points.map((p) => [p[0], p[1]] as Point);
      next.splice(op.index, 0, [op.at[0], op.at[1]]);
      return withSection(doc, next, 'A vertex there', check, [op.index - 1, op.index], [op.index]);
    }
    case 'deleteVertex': {
      if (op.index >= n) return { ok: false, reason: `There is no vertex ${op.index}; the section has ${n}.` };
      if (n <= 3) return { ok: false, reason: 'A section needs at least 3 vertices; this one has 3.' };
      const next = points.filter((_, i) => i !== op.index).map((p) => [p[0], p[1]] as Point);
      return withSection(doc, next, `Deleting vertex ${op.index}`, check, [op.index - 1], []);
    }
    case 'replaceSection': {
      if (op.points.length < 3) return { ok: false, reason: `A section needs at least 3 vertices; got ${op.points.length}.` };
      if (op.points.length > MAX_SECTION_VERTICES) {
        return { ok: false, reason: `A section has at most ${MAX_SECTION_VERTICES} vertices; got ${op.points.length}.` };
      }
      const replaced = withSection(doc, op.points.map((p) => [p[0], p[1]] as Point), 'That section', check);
      if (!replaced.ok || op.loadsChordM === undefined) return replaced;
      return { ok: true, doc: { ...replaced.doc, loads: { ...replaced.doc.loads, chordM: op.loadsChordM } } };
    }
    case 'setCondition': {
      const point = pointOf(doc, op.pointId);
      if (!point) return noPoint();
      if (op.value === null && op.field !== 'altitudeM') return { ok: false, reason: `${FIELD_LABEL[op.field]} needs a value.` };
      if (op.field === 'flapDeflectionDeg') {
        const checked = flapDeflectionDegSchema.safeParse(op.value);
        if (!checked.success) return { ok: false, reason: `${FIELD_LABEL.flapDeflectionDeg} ${firstItem(checked.error.issues).message}.` };
        return { ok: true, doc: withPoint(doc, { ...point, flapDeflectionDeg: checked.data }) };
      }
      const candidate = { ...point.condition, [op.field]: op.value };
      const checked = conditionSchema.safeParse(candidate);
      if (!checked.success) {
        const issue = firstItem(checked.error.issues);
        const field = (issue.path[0] as ConditionField | undefined) ?? op.field;
        return { ok: false, reason: `${FIELD_LABEL[field] ?? field} ${issue.message}.` };
      }
      const condition: Condition = checked.data;
      return { ok: true, doc: withPoint(doc, { ...point, condition }) };
    }
    case 'setFlap': {
      if (!op.flap) return { ok: true, doc: { ...doc, flap: null } };
      const next: SketchDocument = { ...doc, flap: { hingeXOverC: op.flap.hingeXOverC } };
      if (op.flap.deflectionDeg === undefined) return { ok: true, doc: next };
      const point = pointOf(doc, op.pointId);
      if (!point) return noPoint();
      return { ok: true, doc: withPoint(next, { ...point, flapDeflectionDeg: op.flap.deflectionDeg }) };
    }
    case 'addDesignPoint': {
      if (doc.designPoints.length >= MAX_DESIGN_POINTS) return { ok: false, reason: `A sketch holds at most ${MAX_DESIGN_POINTS} design points.` };
      if (findDesignPoint(doc, op.point.id)) return { ok: false, reason: 'That design point is already in the sketch.' };
      const taken = doc.designPoints.find((p) => sameDesignPointName(p.name, op.point.name));
      if (taken) return { ok: false, reason: `There is already a design point named “${taken.name}”.` };
      const designPoints = doc.designPoints.map((p) => p);
      designPoints.splice(Math.min(op.index, designPoints.length), 0, copyPoint(op.point));
      return checkedPoints(doc, designPoints, op.select ? op.point.id : doc.selectedPointId);
    }
    case 'removeDesignPoint': {
      const at = doc.designPoints.findIndex((p) => p.id === op.pointId);
      if (at < 0) return noPoint();
      if (doc.designPoints.length === 1) return { ok: false, reason: 'A sketch keeps at least one design point.' };
      const designPoints = doc.designPoints.filter((p) => p.id !== op.pointId);
      let selected = doc.selectedPointId;
      if (selected === op.pointId) {
        const wanted = op.select && op.select !== op.pointId ? designPoints.find((p) => p.id === op.select) : undefined;
        selected = (wanted ?? itemAt(designPoints, Math.min(at, designPoints.length - 1))).id;
      }
      return checkedPoints(doc, designPoints, selected);
    }
    case 'renameDesignPoint': {
      const point = pointOf(doc, op.pointId);
      if (!point) return noPoint();
      const name = op.name.trim();
      const taken = doc.designPoints.find((p) => p.id !== point.id && sameDesignPointName(p.name, name));
      if (taken) return { ok: false, reason: `There is already a design point named “${taken.name}”.` };
      return { ok: true, doc: withPoint(doc, { ...point, name }) };
    }
    case 'moveDesignPoint': {
      const at = doc.designPoints.findIndex((p) => p.id === op.pointId);
      if (at < 0) return noPoint();
      const designPoints = doc.designPoints.filter((p) => p.id !== op.pointId);
      designPoints.splice(Math.min(op.index, designPoints.length), 0, itemAt(doc.designPoints, at));
      return { ok: true, doc: { ...doc, designPoints } };
    }
    case 'selectDesignPoint': {
      if (!pointOf(doc, op.pointId)) return noPoint();
      return { ok: true, doc: { ...doc, selectedPointId: op.pointId } };
    }
    case 'setMomentPoint':
      return { ok: true, doc: { ...doc, momentPoint: op.point ? [op.point[0], op.point[1]] : null } };
    case 'setLoads': {
      const checked = loadsSettingsSchema.safeParse(op.loads);
      if (!checked.success) {
        const issue = firstItem(checked.error.issues);
        return { ok: false, reason: `${String(issue.path[0] ?? 'Loads')} ${issue.message}.` };
      }
      return { ok: true, doc: { ...doc, loads: checked.data } };
    }
    case 'setField':
      return applySetField(doc, op);
  }
}

function applySetField(doc: SketchDocument, op: z.infer<typeof setFieldOpSchema>): ApplyOpResult {
  const label = DOCUMENT_FIELD_LABEL[op.field];
  const [record, key] = op.field.split('.') as ['flap' | 'momentPoint' | 'loads', string];
  const refuse = (message: string): ApplyOpResult => ({ ok: false, reason: `${label} ${message}.` });
  if (record === 'flap') {
    if (!doc.flap) return { ok: false, reason: `The flap is switched off (perhaps by someone else meanwhile); switch it on to set its ${key === 'hingeXOverC' ? 'hinge' : 'deflection'}.` };
    if (key === 'deflectionDeg') {
      const deflection = flapDeflectionDegSchema.safeParse(op.value);
      if (!deflection.success) return refuse(firstItem(deflection.error.issues).message);
      return { ok: true, doc: withPoint(doc, { ...selectedPoint(doc), flapDeflectionDeg: deflection.data }) };
    }
    const checked = flapSchema.safeParse({ ...doc.flap, [key]: op.value });
    if (!checked.success) return refuse(firstItem(checked.error.issues).message);
    return { ok: true, doc: { ...doc, flap: checked.data } };
  }
  if (record === 'momentPoint') {
    if (!doc.momentPoint) return { ok: false, reason: 'The sketch uses the quarter-chord moment point (perhaps switched back by someone else meanwhile); choose an own moment point to set it.' };
    if (typeof op.value !== 'number' || !Number.isFinite(op.value)) return refuse('must be a number');
    const point: Point = key === 'x' ? [op.value, doc.momentPoint[1]] : [doc.momentPoint[0], op.value];
    return { ok: true, doc: { ...doc, momentPoint: point } };
  }
  const checked = loadsSettingsSchema.safeParse({ ...doc.loads, [key]: op.value });
  if (!checked.success) return refuse(firstItem(checked.error.issues).message);
  return { ok: true, doc: { ...doc, loads: checked.data } };
}

/** The current value of a document field (null when its record is switched off). */
export function documentFieldValue(doc: SketchDocument, field: DocumentField): number | string | null {
  switch (field) {
    case 'flap.hingeXOverC':
      return doc.flap?.hingeXOverC ?? null;
    case 'flap.deflectionDeg':
      return doc.flap ? selectedPoint(doc).flapDeflectionDeg : null;
    case 'momentPoint.x':
      return doc.momentPoint?.[0] ?? null;
    case 'momentPoint.y':
      return doc.momentPoint?.[1] ?? null;
    case 'loads.chordM':
      return doc.loads.chordM;
    case 'loads.spanM':
      return doc.loads.spanM;
    case 'loads.friction':
      return doc.loads.friction;
    case 'loads.transitionReynolds':
      return doc.loads.transitionReynolds ?? null;
  }
}

/**
 * The op that undoes `op` when applied to the document `op` produced [O3]. `docBefore` is the
 * document `op` was applied to. The inverse gets its own fresh op id.
 */
export function invertOp(docBefore: SketchDocument, op: SketchOp, opId: string = newId('op')): SketchOp {
  const points = docBefore.section.points;
  switch (op.type) {
    case 'moveVertices':
      return { type: 'moveVertices', opId, indices: [...op.indices], to: op.indices.map((i) => [...itemAt(points, i)] as Point) };
    case 'insertVertex':
      return { type: 'deleteVertex', opId, index: op.index };
    case 'deleteVertex':
      return { type: 'insertVertex', opId, index: op.index, at: [...itemAt(points, op.index)] };
    case 'replaceSection':
      return {
        type: 'replaceSection',
        opId,
        points: points.map((p) => [p[0], p[1]] as Point),
        ...(op.loadsChordM === undefined ? {} : { loadsChordM: docBefore.loads.chordM }),
      };
    case 'setCondition': {
      const point = pointOf(docBefore, op.pointId)!;
      return { type: 'setCondition', opId, pointId: point.id, field: op.field, value: conditionFieldValue(point, op.field) };
    }
    case 'setFlap': {
      const flap = docBefore.flap;
      if (op.flap?.deflectionDeg === undefined) return { type: 'setFlap', opId, flap: flap ? { hingeXOverC: flap.hingeXOverC } : null };
      const point = pointOf(docBefore, op.pointId)!;
      // Switching the flap on with a deflection: undo switches it off and puts the deflection back.
      if (!flap) return { type: 'setFlap', opId, flap: null };
      return { type: 'setFlap', opId, pointId: point.id, flap: { hingeXOverC: flap.hingeXOverC, deflectionDeg: point.flapDeflectionDeg } };
    }
    case 'addDesignPoint':
      return { type: 'removeDesignPoint', opId, pointId: op.point.id, select: docBefore.selectedPointId };
    case 'removeDesignPoint': {
      const index = docBefore.designPoints.findIndex((p) => p.id === op.pointId);
      return { type: 'addDesignPoint', opId, point: copyPoint(itemAt(docBefore.designPoints, index)), index, select: docBefore.selectedPointId === op.pointId };
    }
    case 'renameDesignPoint':
      return { type: 'renameDesignPoint', opId, pointId: op.pointId, name: findDesignPoint(docBefore, op.pointId)!.name };
    case 'moveDesignPoint':
      return { type: 'moveDesignPoint', opId, pointId: op.pointId, index: docBefore.designPoints.findIndex((p) => p.id === op.pointId) };
    case 'selectDesignPoint':
      return { type: 'selectDesignPoint', opId, pointId: docBefore.selectedPointId };
    case 'setMomentPoint':
      return { type: 'setMomentPoint', opId, point: docBefore.momentPoint ? [docBefore.momentPoint[0], docBefore.momentPoint[1]] : null };
    case 'setLoads':
      return { type: 'setLoads', opId, loads: { ...docBefore.loads } };
    case 'setVertexCoordinate':
      return { type: 'setVertexCoordinate', opId, index: op.index, axis: op.axis, value: itemAt(points, op.index)[op.axis === 'x' ? 0 : 1] };
    case 'setField': {
      const before = documentFieldValue(docBefore, op.field);
      if (before === null) {
        if (op.field.startsWith('flap.')) return { type: 'setFlap', opId, flap: null };
        if (op.field.startsWith('momentPoint.')) return { type: 'setMomentPoint', opId, point: null };
        return { type: 'setLoads', opId, loads: { ...docBefore.loads } };
      }
      if (op.field === 'flap.deflectionDeg') return { type: 'setCondition', opId, pointId: docBefore.selectedPointId, field: 'flapDeflectionDeg', value: before as number };
      return { type: 'setField', opId, field: op.field, value: before };
    }
  }
}

/**
 * Where the vertex that sat at `index` before `op` sits after it, or null when `op` deleted it.
 * Used to keep a selection pointing at the same vertices across inserts and deletes.
 */
export function remapVertexIndex(index: number, op: SketchOp): number | null {
  switch (op.type) {
    case 'insertVertex':
      return index >= op.index ? index + 1 : index;
    case 'deleteVertex':
      return index === op.index ? null : index > op.index ? index - 1 : index;
    case 'replaceSection':
      return index < op.points.length ? index : null;
    default:
      return index;
  }
}

/** Human names of the condition fields, for messages. */
export const FIELD_LABEL: Record<ConditionField, string> = {
  mach: 'Mach number',
  alphaDeg: 'Incidence α',
  gamma: 'γ',
  altitudeM: 'Altitude',
  flapDeflectionDeg: 'Flap deflection',
};

/** A design point's value of a condition field. */
export function conditionFieldValue(point: DesignPoint, field: ConditionField): number | null {
  return field === 'flapDeflectionDeg' ? point.flapDeflectionDeg : point.condition[field];
}

/** The point an op names; no id (old edit logs) = the selected point [O6]. */
function pointOf(doc: SketchDocument, pointId: string | undefined): DesignPoint | undefined {
  return findDesignPoint(doc, pointId ?? doc.selectedPointId);
}

function noPoint(): ApplyOpResult {
  return { ok: false, reason: 'That design point is not in the sketch (perhaps someone removed it meanwhile).' };
}

function copyPoint(p: DesignPoint): DesignPoint {
  return { id: p.id, name: p.name, condition: { ...p.condition }, flapDeflectionDeg: p.flapDeflectionDeg };
}

function withPoint(doc: SketchDocument, point: DesignPoint): SketchDocument {
  return { ...doc, designPoints: doc.designPoints.map((p) => (p.id === point.id ? point : p)) };
}

function checkedPoints(doc: SketchDocument, designPoints: DesignPoint[], selectedPointId: string): ApplyOpResult {
  const problem = designPointsProblem(designPoints, selectedPointId);
  if (problem) return { ok: false, reason: `The design points would not be valid: ${problem.path.join('.')} ${problem.message}.` };
  return { ok: true, doc: { ...doc, designPoints, selectedPointId } };
}

/**
 * Checks that `points` form a valid section and explains the first problem in terms of the
 * facets a user sees (facet i runs from vertex i to vertex i + 1). Null when valid.
 */
export function explainSectionProblem(points: readonly Point[], changedEdges?: readonly number[], changedVertices?: { vertices: readonly number[]; previous: readonly Point[] }): string | null {
  const n = points.length;
  if (n < 3) return `a section needs at least 3 vertices; it would have ${n}`;
  // Likewise only a moved or inserted vertex can sit on another, unless the tolerance grew
  // with the bounding box (then pairs that were just apart may count as one): O(k·n) instead
  // of a sort of every vertex (~0.05 ms instead of ~2 ms at 2000 vertices).
  const nearOnly = changedVertices && changedVertices.vertices.length * 4 < n && repeatTolerance(points) <= repeatTolerance(changedVertices.previous);
  const repeated = nearOnly ? findRepeatedPointNear(points, changedVertices.vertices) : findRepeatedPoint(points);
  if (repeated) return `vertex ${repeated[1]} would sit exactly on vertex ${repeated[0]}`;
  // Only the changed edges can cross anything when the section was simple before (O(k·n)
  // instead of a sweep of every edge). Many changed edges: the full sweep costs the same.
  const crossing = changedEdges && changedEdges.length * 4 < n ? findSelfIntersectionNear(points, changedEdges) : findSelfIntersection(points);
  if (crossing) return `facet ${crossing.edgeB} (vertex ${crossing.edgeB} → ${(crossing.edgeB + 1) % n}) would cross or touch facet ${crossing.edgeA} (vertex ${crossing.edgeA} → ${(crossing.edgeA + 1) % n})`;
  if (signedArea(points) === 0) return 'the vertices would all lie on one line';
  return null;
}

/** The first coordinate beyond ±MAX_SECTION_COORDINATE among `vertices` (default: all), said; null when none. */
function farCoordinate(points: readonly Point[], vertices?: readonly number[]): string | null {
  const indices = vertices ?? points.map((_, i) => i);
  for (const i of indices) {
    const p = points[i];
    if (!p) continue;
    const axis = Math.abs(p[0]) > MAX_SECTION_COORDINATE ? 'x' : Math.abs(p[1]) > MAX_SECTION_COORDINATE ? 'y' : null;
    if (axis) return `vertex ${i}’s ${axis} would be beyond ±${MAX_SECTION_COORDINATE.toExponential().replace('e+', 'e')}, the range a section’s coordinates may take`;
  }
  return null;
}

/**
 * `changedEdges`: the edges of `points` the op changed; given, only they are tested for
 * crossings, which is exact because the document an op applies to is valid [O2].
 */
function withSection(doc: SketchDocument, points: Point[], what: string, check = true, changedEdges?: readonly number[], changedVertices?: readonly number[]): ApplyOpResult {
  const far = check ? farCoordinate(points, changedVertices) : null;
  if (far) return { ok: false, reason: `${what} is not allowed: ${far}.` };
  const problem = check ? explainSectionProblem(points, changedEdges, changedVertices && { vertices: changedVertices, previous: doc.section.points }) : null;
  if (problem) return { ok: false, reason: `${what} is not allowed: ${problem}. The section must stay a simple polygon.` };
  return { ok: true, doc: { ...doc, section: { ...doc.section, points } } };
}
