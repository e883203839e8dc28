import { and, asc, eq, gt, sql } from 'drizzle-orm';
import type { Db } from '../db/client.ts';
import { sketchEdits, sketches } from '../db/schema.ts';
import { newId } from '../../shared/model/ids.ts';
import { roleAtLeast, type Role } from '../../shared/model/roles.ts';
import type { SketchDocument } from '../../shared/model/sketch.ts';
import { applyEdit, transformPast } from '../../shared/protocol/transform.ts';
import type { AppliedEdit, EditOp } from '../../shared/protocol/messages.ts';
import { solveDocument } from '../api/sketches/solveDocument.ts';

export type EditOutcome =
  | { status: 'applied' | 'rebased'; revision: number; op: EditOp; duplicate: boolean }
  | { status: 'rejected'; reason: string; duplicate: boolean };

/**
 * Applies one edit to a sketch, the single place where revisions are assigned [R2]. In one
 * transaction: lock the sketch row (so edits arriving at several server instances queue up
 * here, in order), answer a repeated op id with its first outcome [R3], check the editor role,
 * rebase an edit made on an older revision past the logged edits since [R5], apply and
 * validate it, solve the new document, write document + log row, commit.
 */
export async function applyEditToSketch(
  db: Db,
  input: { sketchId: string; userId: string; baseRevision: number; op: EditOp; requireBase?: boolean },
): Promise<EditOutcome> {
  return db.transaction(async (tx) => {
    // One round trip: lock the sketch row, read the caller's role and any earlier outcome of this op id.
    const locked = await tx.execute<{
      team_id: string;
      title: string;
      document: SketchDocument;
      revision: number;
      role: Role | null;
      seen_status: string | null;
      seen_revision: number | null;
      seen_op: EditOp | null;
      seen_reason: string | null;
    }>(sql`
      select s.team_id, s.title, s.document, s.revision, m.role,
             e.status as seen_status, e.revision as seen_revision, e.op as seen_op, e.reason as seen_reason
        from sketches s
        left join memberships m on m.team_id = s.team_id and m.user_id = ${input.userId}
        left join sketch_edits e on e.sketch_id = s.id and e.op_id = ${input.op.opId}
       where s.id = ${input.sketchId}
         for update of s`);
    const row = locked.rows[0];
    if (!row) return { status: 'rejected', reason: 'This sketch no longer exists.', duplicate: false };

    if (row.seen_status) {
      return row.seen_status === 'rejected'
        ? { status: 'rejected', reason: row.seen_reason ?? 'Rejected earlier.', duplicate: true }
        : { status: row.seen_status as 'applied' | 'rebased', revision: row.seen_revision!, op: row.seen_op!, duplicate: true };
    }

    const reject = async (reason: string): Promise<EditOutcome> => {
      await tx.insert(sketchEdits).values({ id: newId('op'), sketchId: input.sketchId, opId: input.op.opId, revision: null, userId: input.userId, op: input.op, status: 'rejected', reason });
      return { status: 'rejected', reason, duplicate: false };
    };

    const role = row.role;
    if (!roleAtLeast(role, 'editor')) {
      return reject(role ? `Your role in this team is ${role}; editing needs the editor role.` : 'You are not a member of this sketch’s team.');
    }
    if (input.baseRevision > row.revision) return reject(`Your edit claims revision ${input.baseRevision}, but the sketch is at ${row.revision}; reload it.`);

    let op = input.op;
    if (input.baseRevision < row.revision) {
      if (input.requireBase) return reject(`The sketch changed since revision ${input.baseRevision} (now at ${row.revision}); reload it and apply your change again.`);
      const since = await tx
        .select({ revision: sketchEdits.revision, op: sketchEdits.op })
        .from(sketchEdits)
        .where(and(eq(sketchEdits.sketchId, input.sketchId), gt(sketchEdits.revision, input.baseRevision)))
        .orderBy(asc(sketchEdits.revision));
      if (since.length !== row.revision - input.baseRevision) {
        return reject(`Your edit was made on revision ${input.baseRevision}, too far behind to rebase; reload the sketch.`);
      }
      const rebased = transformPast(op, since.map((s) => s.op as EditOp));
      if (!rebased.ok) return reject(rebased.reason);
      op = rebased.op;
    }

    const next = applyEdit({ title: row.title, document: row.document }, op);
    if (!next.ok) return reject(next.reason);
    const revision = row.revision + 1;
    const solved = op.type === 'rename' ? null : solveDocument(next.state.document);
    await tx
      .update(sketches)
      .set({
        title: next.state.title,
        document: next.state.document,
        revision,
        updatedBy: input.userId,
        updatedAt: sql`now()`,
        ...(solved ? { lastSolveStatus: solved.status, lastResult: solved.result } : {}),
      })
      .where(eq(sketches.id, input.sketchId));
    const status = input.baseRevision < row.revision ? 'rebased' : 'applied';
    await tx.insert(sketchEdits).values({ id: newId('op'), sketchId: input.sketchId, opId: input.op.opId, revision, userId: input.userId, op, status });
    return { status, revision, op, duplicate: false };
  });
}

/**
 * The applied edits after `afterRevision`, or null when the log cannot bridge the gap (too many,
 * or revisions missing) and the whole state must be sent instead.
 */
export async function editsSince(db: Db, sketchId: string, afterRevision: number, currentRevision: number, max: number): Promise<AppliedEdit[] | null> {
  if (currentRevision - afterRevision > max) return null;
  if (afterRevision >= currentRevision) return [];
  const rows = await db
    .select({ revision: sketchEdits.revision, op: sketchEdits.op, userId: sketchEdits.userId })
    .from(sketchEdits)
    .where(and(eq(sketchEdits.sketchId, sketchId), gt(sketchEdits.revision, afterRevision), sql`${sketchEdits.revision} <= ${currentRevision}`))
    .orderBy(asc(sketchEdits.revision));
  if (rows.length !== currentRevision - afterRevision) return null;
  return rows.map((r) => ({ revision: r.revision!, op: r.op as EditOp, userId: r.userId }));
}
