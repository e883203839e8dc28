import { and, asc, eq, gt, sql } from 'drizzle-orm';
import type { Db } from '../db/client.ts';
import { isDatabaseUnavailable, sqlState } from '../db/errors.ts';
import { errorForLog } from '../log.ts';
import { sketchEdits } from '../db/schema.ts';
import { newId } from '../../shared/model/ids.ts';
import { roleAtLeast, type Role } from '../../shared/model/roles.ts';
import { normalizeDocument, type SketchDocument } from '../../shared/model/sketch.ts';
import { applyEdit, transformPast, type SketchState } from '../../shared/protocol/transform.ts';
import type { AppliedEdit, EditOp } from '../../shared/protocol/messages.ts';
import { solveDocument } from '../api/sketches/solveDocument.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';

export type EditOutcome =
  | { status: 'applied' | 'rebased'; revision: number; op: EditOp; duplicate: boolean }
  | { status: 'rejected'; reason: string; duplicate: boolean };

export interface EditInput {
  sketchId: string;
  userId: string;
  baseRevision: number;
  op: EditOp;
  /** Whole-document saves: refuse instead of rebasing when the base is stale. */
  requireBase?: boolean;
}

/**
 * Applies a batch of edits to one sketch — the single place where revisions are assigned [R2].
 * One transaction: lock the sketch row (edits reaching several server instances queue up here,
 * in one order), read earlier outcomes of these op ids [R3], the callers' roles and the logged
 * edits a stale edit must be rebased past [R5]; then apply the edits in order in memory, solve
 * the final document once, write the document and all log rows, commit. Under load, edits that
 * arrive while a batch is being written form the next batch (group commit), so a busy sketch
 * costs a handful of statements per batch rather than per edit.
 */
export async function applyEditBatch(db: Db, sketchId: string, items: EditInput[]): Promise<EditOutcome[]> {
  return db.transaction(async (tx) => {
    const opIds = [...new Set(items.map((i) => i.op.opId))];
    const userIds = [...new Set(items.map((i) => i.userId))];
    const list = (values: string[]) => sql.join(values.map((v) => sql`${v}`), sql`, `);
    // One round trip: lock the sketch row, read the callers' roles and any earlier outcomes of
    // these op ids (a batch costs statements, and under load statements cost time).
    const locked = await tx.execute<{
      team_id: string;
      title: string;
      document: SketchDocument;
      revision: number;
      roles: Record<string, Role> | null;
      seen: { op_id: string; status: string; revision: number | null; op: EditOp; reason: string | null }[] | null;
    }>(sql`
      select s.team_id, s.title, s.document, s.revision,
             (select json_object_agg(m.user_id, m.role) from memberships m
               where m.team_id = s.team_id and m.user_id in (${list(userIds)})) as roles,
             (select json_agg(json_build_object('op_id', e.op_id, 'status', e.status, 'revision', e.revision, 'op', e.op, 'reason', e.reason))
                from sketch_edits e where e.sketch_id = s.id and e.op_id in (${list(opIds)})) as seen
        from sketches s
       where s.id = ${sketchId}
         for update of s`);
    const row = locked.rows[0];
    if (!row) return items.map(() => ({ status: 'rejected' as const, reason: 'This sketch no longer exists.', duplicate: false }));

    const seen = new Map<string, EditOutcome>();
    for (const e of row.seen ?? []) {
      seen.set(
        e.op_id,
        e.status === 'rejected'
          ? { status: 'rejected', reason: e.reason ?? 'Rejected earlier.', duplicate: true }
          : { status: e.status as 'applied' | 'rebased', revision: e.revision!, op: e.op, duplicate: true },
      );
    }
    const roles = new Map<string, Role>(Object.entries(row.roles ?? {}));
    const staleBases = items.filter((i) => i.baseRevision < row.revision).map((i) => i.baseRevision);
    const logged = new Map<number, EditOp>();
    if (staleBases.length) {
      for (const e of await tx
        .select({ revision: sketchEdits.revision, op: sketchEdits.op })
        .from(sketchEdits)
        .where(and(eq(sketchEdits.sketchId, sketchId), gt(sketchEdits.revision, Math.min(...staleBases))))
        .orderBy(asc(sketchEdits.revision))) {
        logged.set(e.revision!, e.op as EditOp);
      }
    }

    const stored = normalizeDocument(row.document);
    let state: SketchState = { title: row.title, document: stored };
    let revision = row.revision;
    let lastEditor: string | null = null;
    const rows: (typeof sketchEdits.$inferInsert)[] = [];
    const outcomes: EditOutcome[] = [];
    const reject = (item: EditInput, reason: string): EditOutcome => {
      const outcome: EditOutcome = { status: 'rejected', reason, duplicate: false };
      rows.push({ id: newId('op'), sketchId, opId: item.op.opId, revision: null, userId: item.userId, op: item.op, status: 'rejected', reason });
      seen.set(item.op.opId, { ...outcome, duplicate: true });
      return outcome;
    };

    for (const item of items) {
      const earlier = seen.get(item.op.opId);
      if (earlier) {
        outcomes.push({ ...earlier, duplicate: true });
        continue;
      }
      const role = roles.get(item.userId) ?? null;
      if (!roleAtLeast(role, 'editor')) {
        outcomes.push(reject(item, role ? `Your role in this team is ${role}; editing needs the editor role.` : 'You are not a member of this sketch’s team.'));
        continue;
      }
      if (item.baseRevision > revision) {
        outcomes.push(reject(item, `Your edit claims revision ${item.baseRevision}, but the sketch is at ${revision}; reload it.`));
        continue;
      }
      let op = item.op;
      if (item.baseRevision < revision) {
        if (item.requireBase) {
          outcomes.push(reject(item, `The sketch changed since revision ${item.baseRevision} (now at ${revision}); reload it and apply your change again.`));
          continue;
        }
        const since: EditOp[] = [];
        for (let r = item.baseRevision + 1; r <= revision; r++) {
          const e = logged.get(r);
          if (!e) break;
          since.push(e);
        }
        if (since.length !== revision - item.baseRevision) {
          outcomes.push(reject(item, `Your edit was made on revision ${item.baseRevision}, too far behind to rebase; reload the sketch.`));
          continue;
        }
        const rebased = transformPast(op, since);
        if (!rebased.ok) {
          outcomes.push(reject(item, rebased.reason));
          continue;
        }
        op = rebased.op;
      }
      const next = applyEdit(state, op);
      if (!next.ok) {
        outcomes.push(reject(item, next.reason));
        continue;
      }
      state = next.state;
      revision += 1;
      lastEditor = item.userId;
      logged.set(revision, op);
      const status = item.baseRevision < revision - 1 ? 'rebased' : 'applied';
      rows.push({ id: newId('op'), sketchId, opId: item.op.opId, revision, userId: item.userId, op, status });
      const outcome: EditOutcome = { status, revision, op, duplicate: false };
      seen.set(item.op.opId, { ...outcome, duplicate: true });
      outcomes.push(outcome);
    }

    // One statement writes the document (when edits applied) and every log row.
    const logRows = sql`select r.id, ${sketchId}::text, r.op_id, r.revision, r.user_id, r.op, r.status, r.reason
        from jsonb_to_recordset(${JSON.stringify(rows.map((r) => ({ id: r.id, op_id: r.opId, revision: r.revision, user_id: r.userId, op: r.op, status: r.status, reason: r.reason ?? null })))}::jsonb)
          as r(id text, op_id text, revision int, user_id text, op jsonb, status text, reason text)`;
    if (revision !== row.revision) {
      const solved = state.document !== stored ? solveDocument(state.document) : null;
      const solveSet = solved ? sql`, last_solve_status = ${solved.status}, last_result = ${JSON.stringify(solved.result)}::jsonb` : sql``;
      await tx.execute(sql`
        with updated as (
          update sketches
             set title = ${state.title}, document = ${JSON.stringify(state.document)}::jsonb, revision = ${revision},
                 updated_by = ${lastEditor}, updated_at = now()${solveSet}
           where id = ${sketchId}
          returning 1
        )
        insert into sketch_edits (id, sketch_id, op_id, revision, user_id, op, status, reason)
        ${logRows}, updated`);
    } else if (rows.length) {
      await tx.execute(sql`insert into sketch_edits (id, sketch_id, op_id, revision, user_id, op, status, reason) ${logRows}`);
    }
    return outcomes;
  });
}

/** One edit on its own (REST saves, restores, imports). */
export async function applyEditToSketch(db: Db, input: EditInput): Promise<EditOutcome> {
  return firstItem(await applyEditBatch(db, input.sketchId, [input])); // one outcome per edit
}

/**
 * Per-sketch queues that feed applyEditBatch: edits arriving while a batch is in its transaction
 * wait and go together in the next one. Order within a sketch is arrival order.
 */
export interface EditQueue {
  submit(input: EditInput): Promise<EditOutcome>;
}

export const MAX_EDIT_BATCH = 200;

export function createEditQueue(db: Db, log: (line: string) => void = () => {}): EditQueue {
  type Waiting = { input: EditInput; resolve: (o: EditOutcome) => void; reject: (e: unknown) => void };
  const queues = new Map<string, { items: Waiting[]; running: boolean }>();
  /** A lost database or a lost race (serialization failure, deadlock): the callers' answer, not the edit's fault. */
  const passing = (err: unknown) => isDatabaseUnavailable(err) || ['40001', '40P01'].includes(sqlState(err) ?? '');

  /** An edit that failed on its own (not for a lost database) is rejected; nothing of it was written. */
  function refuse(b: Waiting, err: unknown): void {
    log(`[realtime] edit ${b.input.op.type} on ${b.input.sketchId} refused by the database: ${errorForLog(err, false)}`);
    b.resolve({ status: 'rejected', reason: 'This edit could not be stored (one of its values was refused); nothing of it was saved.', duplicate: false });
  }

  /** One edit in its own transaction. */
  async function applyAlone(b: Waiting): Promise<void> {
    try {
      b.resolve(itemAt((await applyEditBatch(db, b.input.sketchId, [b.input])), 0));
    } catch (err) {
      if (passing(err)) b.reject(err);
      else refuse(b, err);
    }
  }

  async function drain(sketchId: string): Promise<void> {
    const q = queues.get(sketchId)!;
    q.running = true;
    try {
      while (q.items.length) {
        const batch = q.items.splice(0, MAX_EDIT_BATCH);
        try {
          const outcomes = await applyEditBatch(db, sketchId, batch.map((b) => b.input));
          batch.forEach((b, i) => b.resolve(itemAt(outcomes, i)));
        } catch (err) {
          // [R9] One edit the database refuses must not fail its neighbours: when a batch of
          // several fails for any reason but a lost database or race, each edit is tried on its own.
          if (passing(err)) for (const b of batch) b.reject(err);
          else if (batch.length === 1) refuse(itemAt(batch, 0), err);
          else for (const b of batch) await applyAlone(b);
        }
      }
    } finally {
      q.running = false;
      queues.delete(sketchId);
    }
  }

  return {
    submit(input) {
      return new Promise((resolve, reject) => {
        let q = queues.get(input.sketchId);
        if (!q) {
          q = { items: [], running: false };
          queues.set(input.sketchId, q);
        }
        q.items.push({ input, resolve, reject });
        if (!q.running) void drain(input.sketchId);
      });
    },
  };
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
