import type { Db } from '../../db/client.ts';
import { HttpError } from '../../http/errors.ts';
import { assertTeamRole } from '../../auth/guards.ts';
import { newId } from '../../../shared/model/ids.ts';
import { defaultSketchDocument, normalizeDocument, type SketchDocument } from '../../../shared/model/sketch.ts';
import type { Role } from '../../../shared/model/roles.ts';
import { reviewState } from '../../../shared/model/review.ts';
import type { Sketch, SketchSummary } from '../../../shared/model/sketchApi.ts';
import { summarizeDocument } from '../../../shared/flight/sketchSummary.ts';
import { solveDocument } from './solveDocument.ts';
import * as repo from './repository.ts';
import type { AppContext } from '../../context.ts';
import { readStoredAnalysis } from '../../../shared/flight/storedAnalysis.ts';

/** What a non-member hears about a sketch: the same whether it exists or not (as the realtime channel says). */
const NO_SUCH_SKETCH = 'No such sketch, or you are not a member of its team.';

/** Role check for a sketch: looks up its team first (404 when it does not exist or the caller is not a member). */
export async function authorizeSketch(db: Db, userId: string, sketchId: string, needed: Role, what: string): Promise<{ teamId: string; role: Role }> {
  const teamId = await repo.findSketchTeam(db, sketchId);
  if (!teamId) throw new HttpError(404, 'not_found', NO_SUCH_SKETCH);
  const role = await assertTeamRole(db, userId, teamId, needed, what, NO_SUCH_SKETCH);
  return { teamId, role };
}


type SketchRow = NonNullable<Awaited<ReturnType<typeof repo.findSketch>>>;
type ReviewColumns = Pick<SketchRow, 'revision' | 'reviewStatus' | 'approvalRevision' | 'approvalByName' | 'approvalNote' | 'approvalAt'>;

/** The review part of a sketch's answer: status, the approval in force [A1] and what people read [A2]. */
export function reviewOf(row: ReviewColumns): Pick<Sketch, 'reviewStatus' | 'approval' | 'reviewState'> {
  const approval =
    row.reviewStatus === 'approved' && row.approvalRevision !== null && row.approvalAt !== null
      ? { revision: row.approvalRevision, byName: row.approvalByName, at: row.approvalAt.toISOString(), note: row.approvalNote ?? '', changedSince: row.revision > row.approvalRevision }
      : null;
  return { reviewStatus: row.reviewStatus, approval, reviewState: reviewState(row.reviewStatus, approval, row.revision) };
}

function toSketch(row: SketchRow): Sketch {
  return {
    id: row.id,
    teamId: row.teamId,
    title: row.title,
    revision: row.revision,
    document: normalizeDocument(row.document),
    lastSolveStatus: row.lastSolveStatus,
    lastResult: readStoredAnalysis(row.lastResult),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
    updatedByName: row.updatedByName,
    ...reviewOf(row),
  };
}

/**
 * The team's sketches table. Every open home page of the team fetches it again after each
 * `teamSketches` notice, so it reads the summary columns and no document (a row stored before
 * the columns, not filled yet, is summarised from its document here).
 */
export async function listTeamSketches(db: Db, userId: string, teamId: string): Promise<SketchSummary[]> {
  await assertTeamRole(db, userId, teamId, 'viewer', 'see this team’s sketches');
  const rows = await repo.listSketches(db, teamId);
  return rows.map((r) => ({
    id: r.id,
    teamId: r.teamId,
    title: r.title,
    revision: r.revision,
    ...(r.summary ?? summarizeDocument(normalizeDocument(r.document))),
    lastSolveStatus: r.lastSolveStatus,
    updatedAt: r.updatedAt.toISOString(),
    updatedByName: r.updatedByName,
    ...reviewOf(r),
  }));
}

export async function getSketch(db: Db, userId: string, sketchId: string): Promise<Sketch> {
  await authorizeSketch(db, userId, sketchId, 'viewer', 'open this sketch');
  const row = await repo.findSketch(db, sketchId);
  if (!row) throw new HttpError(404, 'not_found', 'No such sketch.');
  return toSketch(row);
}

export async function createSketch(ctx: AppContext, userId: string, teamId: string, input: { title: string; document?: SketchDocument }): Promise<Sketch> {
  const { db } = ctx;
  await assertTeamRole(db, userId, teamId, 'editor', 'create sketches');
  const document = input.document ?? defaultSketchDocument();
  const solved = solveDocument(document);
  const id = newId('sketch');
  await repo.insertSketch(db, { id, teamId, title: input.title, document, userId, lastSolveStatus: solved.status, lastResult: solved.result });
  ctx.events.emit('teamSketchesChanged', teamId);
  return getSketch(db, userId, id);
}

export async function duplicateSketch(ctx: AppContext, userId: string, sketchId: string): Promise<Sketch> {
  const { teamId } = await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'duplicate sketches');
  const source = await repo.findSketch(ctx.db, sketchId);
  if (!source) throw new HttpError(404, 'not_found', 'No such sketch.');
  return createSketch(ctx, userId, teamId, { title: `${source.title} (copy)`.slice(0, 200), document: normalizeDocument(source.document) });
}

/**
 * Renames through the edit log (a rename is an ordered edit like any other), so people with the
 * sketch open see it at once.
 */
export async function renameSketch(ctx: AppContext, userId: string, sketchId: string, title: string): Promise<Sketch> {
  await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'rename sketches');
  const current = await repo.findSketch(ctx.db, sketchId);
  if (!current) throw new HttpError(404, 'not_found', 'No such sketch.');
  const op = { type: 'rename' as const, opId: newId('op'), title };
  const outcome = await ctx.edits.submit({ sketchId, userId, baseRevision: current.revision, op });
  if (outcome.status === 'rejected') throw new HttpError(409, 'edit_rejected', outcome.reason);
  ctx.events.emit('sketchEdited', sketchId, { revision: outcome.revision, op: outcome.op, userId });
  return getSketch(ctx.db, userId, sketchId);
}

/**
 * Saves a whole document (autosave, scripts). It must be based on the current revision (409
 * otherwise: nobody overwrites edits they have not seen); it goes through the edit log, the
 * server solves it again and stores its own result, and open editors receive it.
 */
export async function saveDocument(ctx: AppContext, userId: string, sketchId: string, input: { document: SketchDocument; baseRevision: number }): Promise<Sketch> {
  await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'edit sketches');
  const op = { type: 'replaceDocument' as const, opId: newId('op'), document: input.document };
  const outcome = await ctx.edits.submit({ sketchId, userId, baseRevision: input.baseRevision, op, requireBase: true });
  if (outcome.status === 'rejected') {
    const current = await repo.findSketch(ctx.db, sketchId);
    const stale = current && current.revision !== input.baseRevision;
    throw new HttpError(stale ? 409 : 400, stale ? 'revision_conflict' : 'invalid_document', outcome.reason, { revision: current?.revision ?? null });
  }
  ctx.events.emit('sketchEdited', sketchId, { revision: outcome.revision, op: outcome.op, userId });
  return getSketch(ctx.db, userId, sketchId);
}

export async function deleteSketch(ctx: AppContext, userId: string, sketchId: string): Promise<void> {
  const { teamId } = await authorizeSketch(ctx.db, userId, sketchId, 'owner', 'delete sketches');
  await repo.deleteSketch(ctx.db, sketchId);
  ctx.events.emit('accessChanged', { sketchId });
  ctx.events.emit('teamSketchesChanged', teamId);
}
