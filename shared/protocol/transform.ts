import { applyOp, explainSectionProblem } from '../model/ops.ts';
import { DESIGN_POINT_NAME_MAX, sameDesignPointName, sketchDocumentSchema, type SketchDocument } from '../model/sketch.ts';
import type { EditOp } from './messages.ts';
import { firstItem, itemAt } from '../util/invariant.ts';

/**
 * Operational transform for edits made on an older revision [R5]: `transformOp(op, applied)`
 * rewrites `op` (made without seeing `applied`) so that it means the same thing after
 * `applied`, or says why it no longer can. Vertex ops are index-based, so inserts and deletes
 * shift indices; a move of a vertex someone deleted drops that vertex; anything index-based
 * after a whole-section replacement is refused. Field edits need no change (last one wins).
 * Server and client use the same function, so both rebase identically.
 * `opFirst` breaks the one tie (two inserts at the same slot) when `op` was ordered first.
 */
export type TransformResult = { ok: true; op: EditOp } | { ok: false; reason: string };

function shiftForInsert(index: number, at: number): number {
  return index >= at ? index + 1 : index;
}

export function transformOp(op: EditOp, applied: EditOp, opFirst = false): TransformResult {
  if (op.type === 'rename' || applied.type === 'rename') return { ok: true, op };
  const points = transformPointOp(op, applied, opFirst);
  if (points) return points;
  const indexBased = op.type === 'moveVertices' || op.type === 'setVertexCoordinate' || op.type === 'insertVertex' || op.type === 'deleteVertex';
  if (!indexBased) return { ok: true, op };
  if (applied.type === 'replaceSection' || applied.type === 'replaceDocument') {
    return { ok: false, reason: 'Someone replaced the whole section meanwhile; your vertex edit no longer applies to it.' };
  }
  if (applied.type === 'insertVertex') {
    const at = applied.index;
    switch (op.type) {
      case 'moveVertices':
        return { ok: true, op: { ...op, indices: op.indices.map((i) => shiftForInsert(i, at)) } };
      case 'setVertexCoordinate':
        return { ok: true, op: { ...op, index: shiftForInsert(op.index, at) } };
      case 'insertVertex':
        // Same slot: whichever the server applied first keeps it; the other goes after it.
        // `opFirst` says `op` is the one the server ordered first (a client rebasing its
        // pending ops past its own in-flight op sees it that way round).
        return { ok: true, op: { ...op, index: (opFirst ? op.index > at : op.index >= at) ? op.index + 1 : op.index } };
      case 'deleteVertex':
        return { ok: true, op: { ...op, index: shiftForInsert(op.index, at) } };
    }
  }
  if (applied.type === 'deleteVertex') {
    const gone = applied.index;
    switch (op.type) {
      case 'moveVertices': {
        const keep = op.indices.map((i, k) => ({ i, to: itemAt(op.to, k) })).filter((e) => e.i !== gone);
        if (keep.length === 0) return { ok: false, reason: `Someone deleted vertex ${gone} meanwhile; there is nothing left to move.` };
        return { ok: true, op: { ...op, indices: keep.map((e) => (e.i > gone ? e.i - 1 : e.i)), to: keep.map((e) => e.to) } };
      }
      case 'setVertexCoordinate':
        if (op.index === gone) return { ok: false, reason: `Someone deleted vertex ${gone} meanwhile; your ${op.axis} for it no longer applies.` };
        return { ok: true, op: { ...op, index: op.index > gone ? op.index - 1 : op.index } };
      case 'insertVertex':
        return { ok: true, op: { ...op, index: op.index > gone ? op.index - 1 : op.index } };
      case 'deleteVertex':
        if (op.index === gone) return { ok: false, reason: `Someone already deleted vertex ${gone}.` };
        return { ok: true, op: { ...op, index: op.index > gone ? op.index - 1 : op.index } };
    }
  }
  return { ok: true, op };
}

/** The design point an edit names, if any (ops without an id mean the selected point [O6]). */
function namedPoint(op: EditOp): string | undefined {
  switch (op.type) {
    case 'setCondition':
    case 'removeDesignPoint':
    case 'renameDesignPoint':
    case 'moveDesignPoint':
    case 'selectDesignPoint':
      return op.pointId;
    case 'setFlap':
      return op.flap?.deflectionDeg === undefined ? undefined : op.pointId;
    default:
      return undefined;
  }
}

/** " (2)", " (3)"… after a name, kept within the name's length limit. */
function renamedApart(name: string): string {
  const m = /^(.*) \((\d+)\)$/.exec(name);
  const base = m?.[1] ?? name;
  const n = m?.[2] !== undefined ? Number(m[2]) + 1 : 2;
  const suffix = ` (${n})`;
  return base.slice(0, DESIGN_POINT_NAME_MAX - suffix.length) + suffix;
}

/**
 * Design point edits [R8]: they name points by id, so most need nothing; what changes is
 * - an edit of a point someone removed meanwhile is refused, saying so (a removal naming a
 *   point to select afterwards forgets a point that is gone);
 * - two points added concurrently under one name (two people pressing "Add" at once both get
 *   "Design point 2") are kept apart: the one ordered second becomes "Design point 2 (2)"; the
 *   same for a point added under a name someone just gave another point;
 * - two adds at one position keep server order, like vertex inserts.
 * Null: not a design point matter (the generic rules apply).
 */
function transformPointOp(op: EditOp, applied: EditOp, opFirst: boolean): TransformResult | null {
  if (applied.type === 'removeDesignPoint') {
    if (namedPoint(op) === applied.pointId) {
      const reason = op.type === 'removeDesignPoint' ? 'Someone already removed that design point.' : 'Someone removed that design point meanwhile; your change to it no longer applies.';
      return { ok: false, reason };
    }
    if (op.type === 'removeDesignPoint' && op.select === applied.pointId) {
      const { select: _gone, ...rest } = op;
      void _gone;
      return { ok: true, op: rest };
    }
    return null;
  }
  if (op.type === 'addDesignPoint') {
    const clash =
      (applied.type === 'addDesignPoint' && sameDesignPointName(applied.point.name, op.point.name)) ||
      (applied.type === 'renameDesignPoint' && sameDesignPointName(applied.name, op.point.name));
    let next = op;
    if (clash && !opFirst) next = { ...next, point: { ...next.point, name: renamedApart(op.point.name) } };
    if (applied.type === 'addDesignPoint') {
      const at = applied.index;
      if (opFirst ? op.index > at : op.index >= at) next = { ...next, index: op.index + 1 };
    }
    return { ok: true, op: next };
  }
  return null;
}

/** Transforms `op` past every edit in `applied`, in order. */
export function transformPast(op: EditOp, applied: readonly EditOp[]): TransformResult {
  let current: EditOp = op;
  for (const a of applied) {
    const r = transformOp(current, a);
    if (!r.ok) return r;
    current = r.op;
  }
  return { ok: true, op: current };
}

/** The editable state of a sketch: its title and its document. */
export interface SketchState {
  title: string;
  document: SketchDocument;
}

/** Applies any edit (document op or rename) to the state; validation as in applyOp [O2]. */
export function applyEdit(state: SketchState, op: EditOp, options: { trusted?: boolean } = {}): { ok: true; state: SketchState } | { ok: false; reason: string } {
  if (op.type === 'rename') {
    const title = op.title.trim();
    if (!title) return { ok: false, reason: 'A title must not be empty.' };
    return { ok: true, state: { ...state, title } };
  }
  if (op.type === 'replaceDocument') {
    // Trusted: the server checked it; an edit log written before design points may still hold
    // a version 1 document, which is upgraded (cheaply) rather than re-validated.
    if (options.trusted) return { ok: true, state: { ...state, document: (op.document as { version: number }).version === 1 ? sketchDocumentSchema.parse(op.document) : op.document } };
    const parsed = sketchDocumentSchema.safeParse(op.document);
    if (!parsed.success) return { ok: false, reason: `That document is not valid: ${firstItem(parsed.error.issues).path.join('.')} ${firstItem(parsed.error.issues).message}.` };
    const problem = explainSectionProblem(parsed.data.section.points);
    if (problem) return { ok: false, reason: `That section is not allowed: ${problem}. The section must stay a simple polygon.` };
    return { ok: true, state: { ...state, document: parsed.data } };
  }
  const r = applyOp(state.document, op, options);
  return r.ok ? { ok: true, state: { ...state, document: r.doc } } : r;
}
