import { applyOp, explainSectionProblem } from '../model/ops.ts';
import { sketchDocumentSchema, type SketchDocument } from '../model/sketch.ts';
import type { EditOp } from './messages.ts';

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
        const keep = op.indices.map((i, k) => ({ i, to: op.to[k] })).filter((e) => e.i !== gone);
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
    if (options.trusted) return { ok: true, state: { ...state, document: op.document } };
    const parsed = sketchDocumentSchema.safeParse(op.document);
    if (!parsed.success) return { ok: false, reason: `That document is not valid: ${parsed.error.issues[0].path.join('.')} ${parsed.error.issues[0].message}.` };
    const problem = explainSectionProblem(parsed.data.section.points);
    if (problem) return { ok: false, reason: `That section is not allowed: ${problem}. The section must stay a simple polygon.` };
    return { ok: true, state: { ...state, document: parsed.data } };
  }
  const r = applyOp(state.document, op, options);
  return r.ok ? { ok: true, state: { ...state, document: r.doc } } : r;
}
