import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { authorizeSketch, getSketch } from '../sketches/service.ts';
import { findSketch } from '../sketches/repository.ts';
import { solveDocument } from '../sketches/solveDocument.ts';
import { recordSketchEvent } from '../activity/repository.ts';
import { newId } from '../../../shared/model/ids.ts';
import { explainSectionProblem } from '../../../shared/model/ops.ts';
import { normalizeDocument } from '../../../shared/model/sketch.ts';
import type { ImportSection, SnapshotDetail, SnapshotSummary } from '../../../shared/model/review.ts';
import type { ImportResult, Sketch } from '../../../shared/model/sketchApi.ts';
import type { EditInput, EditOutcome } from '../../realtime/editLog.ts';
import * as repo from './repository.ts';
import { readStoredAnalysis } from '../../../shared/flight/storedAnalysis.ts';

type Row = NonNullable<Awaited<ReturnType<typeof repo.findSnapshot>>>;
const toSummary = (r: Omit<Row, 'title' | 'document' | 'result'>): SnapshotSummary => ({ ...r, createdAt: r.createdAt.toISOString() });

/** Captures the sketch as it is now (title, document, stored result, revision). */
async function capture(ctx: AppContext, userId: string, sketchId: string, name: string, note: string, kind: 'manual' | 'before_restore' | 'before_import'): Promise<string> {
  const current = await findSketch(ctx.db, sketchId);
  if (!current) throw new HttpError(404, 'not_found', 'No such sketch.');
  const document = normalizeDocument(current.document);
  const id = await repo.insertSnapshot(ctx.db, {
    sketchId,
    name,
    note,
    kind,
    revision: current.revision,
    title: current.title,
    document,
    // The stored result only when it belongs to this revision (the solve after an edit may still run).
    result: current.resultRevision === current.revision ? (current.lastResult ?? null) : solveDocument(document).result,
    createdBy: userId,
  });
  await recordSketchEvent(ctx.db, { sketchId, actorId: userId, kind: 'snapshot.created', detail: { snapshotId: id, name, kind, revision: current.revision } });
  ctx.events.emit('sketchNotice', sketchId, 'snapshots');
  return id;
}

/**
 * Submits the edit an automatic snapshot was kept for; when the edit is refused or fails, the
 * snapshot is taken back, so a failed restore or import writes nothing.
 */
async function submitOrWithdraw(ctx: AppContext, snapshotId: string, input: EditInput): Promise<EditOutcome> {
  let outcome: EditOutcome;
  try {
    outcome = await ctx.edits.submit(input);
  } catch (err) {
    await repo.withdrawSnapshot(ctx.db, snapshotId, input.sketchId).catch(() => {});
    throw err;
  }
  if (outcome.status === 'rejected') await repo.withdrawSnapshot(ctx.db, snapshotId, input.sketchId);
  ctx.events.emit('sketchNotice', input.sketchId, 'snapshots');
  return outcome;
}

export async function createSnapshot(ctx: AppContext, userId: string, sketchId: string, input: { name: string; note: string }): Promise<SnapshotDetail> {
  await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'save snapshots');
  const id = await capture(ctx, userId, sketchId, input.name, input.note, 'manual');
  return getSnapshot(ctx, userId, id);
}

export async function listSnapshots(ctx: AppContext, userId: string, sketchId: string, page: { limit: number; offset: number }) {
  await authorizeSketch(ctx.db, userId, sketchId, 'viewer', 'see snapshots');
  const { rows, total } = await repo.listSnapshots(ctx.db, sketchId, page.limit, page.offset);
  return { items: rows.map(toSummary), total, ...page };
}

export async function getSnapshot(ctx: AppContext, userId: string, snapshotId: string): Promise<SnapshotDetail> {
  const row = await repo.findSnapshot(ctx.db, snapshotId);
  if (!row) throw new HttpError(404, 'not_found', 'No such snapshot.');
  await authorizeSketch(ctx.db, userId, row.sketchId, 'viewer', 'see snapshots');
  const { title, document, result, ...rest } = row;
  return { ...toSummary(rest), title, document: normalizeDocument(document), result: readStoredAnalysis(result) };
}

/**
 * Restores a snapshot as a NEW revision: the current state is first kept in an automatic
 * snapshot, then the snapshot's document goes through the edit log like any edit. Nothing is
 * rewritten or lost; every earlier revision stays in the log.
 */
export async function restoreSnapshot(ctx: AppContext, userId: string, snapshotId: string): Promise<Sketch> {
  const snap = await repo.findSnapshot(ctx.db, snapshotId);
  if (!snap) throw new HttpError(404, 'not_found', 'No such snapshot.');
  const { sketchId } = { sketchId: snap.sketchId };
  await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'restore snapshots');
  const current = await findSketch(ctx.db, sketchId);
  if (!current) throw new HttpError(404, 'not_found', 'No such sketch.');
  const kept = await capture(ctx, userId, sketchId, `Before restoring “${snap.name}”`, `Automatic: the sketch at revision ${current.revision}, kept before restoring revision ${snap.revision}.`, 'before_restore');
  const op = { type: 'replaceDocument' as const, opId: newId('op'), document: normalizeDocument(snap.document) };
  const outcome = await submitOrWithdraw(ctx, kept, { sketchId, userId, baseRevision: current.revision, op });
  if (outcome.status === 'rejected') throw new HttpError(409, 'edit_rejected', outcome.reason);
  ctx.events.emit('sketchEdited', sketchId, { revision: outcome.revision, op: outcome.op, userId });
  await recordSketchEvent(ctx.db, { sketchId, actorId: userId, kind: 'snapshot.restored', detail: { snapshotId, name: snap.name, revision: outcome.revision, fromRevision: snap.revision } });
  ctx.events.emit('sketchNotice', sketchId, 'activity');
  return getSketch(ctx.db, userId, sketchId);
}

/**
 * Replaces the section with imported coordinates: an automatic snapshot first, then one
 * replaceSection edit (carrying the loads chord when the file gave one; the conditions and
 * everything else stay). The answer says what the section was just before, for the importer's
 * undo.
 */
export async function importSection(ctx: AppContext, userId: string, sketchId: string, input: ImportSection): Promise<ImportResult> {
  await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'import sections');
  const current = await findSketch(ctx.db, sketchId);
  if (!current) throw new HttpError(404, 'not_found', 'No such sketch.');
  // Refuse a bad file before anything is written (no snapshot, no edit).
  const problem = explainSectionProblem(input.points);
  if (problem) throw new HttpError(400, 'invalid_section', `The imported section is not allowed: ${problem}. The section must be a simple polygon.`);
  const before = normalizeDocument(current.document);
  const kept = await capture(ctx, userId, sketchId, `Before importing ${input.fileName}`, `Automatic: the sketch at revision ${current.revision}, kept before an import.`, 'before_import');
  const op = {
    type: 'replaceSection' as const,
    opId: newId('op'),
    points: input.points,
    ...(input.loadsChordM === undefined ? {} : { loadsChordM: input.loadsChordM }),
  };
  const outcome = await submitOrWithdraw(ctx, kept, { sketchId, userId, baseRevision: current.revision, op });
  if (outcome.status === 'rejected') throw new HttpError(400, 'invalid_section', outcome.reason);
  ctx.events.emit('sketchEdited', sketchId, { revision: outcome.revision, op: outcome.op, userId });
  await recordSketchEvent(ctx.db, {
    sketchId,
    actorId: userId,
    kind: 'section.imported',
    detail: { fileName: input.fileName, vertexCount: input.points.length, revision: outcome.revision, ...(input.loadsChordM === undefined ? {} : { loadsChordM: input.loadsChordM }) },
  });
  ctx.events.emit('sketchNotice', sketchId, 'activity');
  const sketch = await getSketch(ctx.db, userId, sketchId);
  return {
    ...sketch,
    imported: {
      revision: outcome.revision,
      before: { points: before.section.points, ...(input.loadsChordM === undefined ? {} : { loadsChordM: before.loads.chordM }) },
    },
  };
}
