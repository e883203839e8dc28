import { and, asc, eq, gt, inArray, lte, sql } from 'drizzle-orm';
import type { Db, Tx } from '../db/client.ts';
import { sketchEdits, sketches, users, walkthroughs } from '../db/schema.ts';
import type { Role } from '../../shared/model/roles.ts';
import type { AnalysisStatus } from '../../shared/model/analysis.ts';
import type { AppliedEdit, EditOp, EditStatus, WalkthroughState } from '../../shared/protocol/messages.ts';
import { findRole } from '../api/auth/repository.ts';
import { sketchSummaryColumns } from '../db/sketchSummary.ts';
import type { SketchDocument } from '../../shared/model/sketch.ts';

/** What one open socket claims: its session, its user and (optionally) a sketch it is in. */
export interface AccessCheck {
  sessionId: string;
  userId: string;
  sketchId: string | null;
}

/** What the database says about that claim right now. */
export interface AccessResult {
  /** The session still exists, has not expired and still belongs to that user. */
  sessionLive: boolean;
  /** The sketch's team (null when the sketch no longer exists or none was asked about). */
  teamId: string | null;
  /** The user's role in that team (null: not a member). */
  role: Role | null;
}

/**
 * Checks many sockets' claims in one statement: is each session still signed in as its user,
 * and what role does that user hold in the team of the sketch. The realtime layer asks this at
 * join, on messages, when it hears that access changed and in its periodic sweep.
 */
export async function checkAccess(db: Db, checks: readonly AccessCheck[]): Promise<AccessResult[]> {
  if (checks.length === 0) return [];
  const input = JSON.stringify(checks.map((c, i) => ({ i, sid: c.sessionId, user_id: c.userId, sketch_id: c.sketchId })));
  const { rows } = await db.execute<{ i: number; live: boolean; team_id: string | null; role: Role | null }>(sql`
    select c.i,
           exists (select 1 from session s
                    where s.sid = c.sid and s.expire >= now() and s.sess->'passport'->>'user' = c.user_id) as live,
           sk.team_id, m.role
      from jsonb_to_recordset(${input}::jsonb) as c(i int, sid text, user_id text, sketch_id text)
      left join sketches sk on sk.id = c.sketch_id
      left join memberships m on m.team_id = sk.team_id and m.user_id = c.user_id`);
  const out: AccessResult[] = checks.map(() => ({ sessionLive: false, teamId: null, role: null }));
  for (const r of rows) out[r.i] = { sessionLive: r.live, teamId: r.team_id, role: r.role };
  return out;
}

/** One socket's claim on a team's sketch list (the home table's live watch). */
export interface TeamAccessCheck {
  sessionId: string;
  userId: string;
  teamId: string;
}
export interface TeamAccessResult {
  sessionLive: boolean;
  teamExists: boolean;
  role: Role | null;
}

/** Like checkAccess, for teams: is each session still signed in as its user, and their role in the team. */
export async function checkTeamAccess(db: Db, checks: readonly TeamAccessCheck[]): Promise<TeamAccessResult[]> {
  if (checks.length === 0) return [];
  const input = JSON.stringify(checks.map((c, i) => ({ i, sid: c.sessionId, user_id: c.userId, team_id: c.teamId })));
  const { rows } = await db.execute<{ i: number; live: boolean; team_exists: boolean; role: Role | null }>(sql`
    select c.i,
           exists (select 1 from session s
                    where s.sid = c.sid and s.expire >= now() and s.sess->'passport'->>'user' = c.user_id) as live,
           t.id is not null as team_exists, m.role
      from jsonb_to_recordset(${input}::jsonb) as c(i int, sid text, user_id text, team_id text)
      left join teams t on t.id = c.team_id
      left join memberships m on m.team_id = t.id and m.user_id = c.user_id`);
  const out: TeamAccessResult[] = checks.map(() => ({ sessionLive: false, teamExists: false, role: null }));
  for (const r of rows) out[r.i] = { sessionLive: r.live, teamExists: r.team_exists, role: r.role };
  return out;
}

/** The team that owns `sketchId` (null: no such sketch). */
export async function findSketchTeam(db: Db, sketchId: string): Promise<string | null> {
  const row = await db.query.sketches.findFirst({ where: eq(sketches.id, sketchId), columns: { teamId: true } });
  return row?.teamId ?? null;
}

/** The parts of a sketch a socket needs when it joins or resyncs. */
export async function findSketchState(db: Db, sketchId: string) {
  const row = await db.query.sketches.findFirst({ where: eq(sketches.id, sketchId), columns: { teamId: true, title: true, document: true, revision: true, resultRevision: true } });
  return row ?? null;
}

/** `userId`'s role in the team that owns `sketchId` (null: no such sketch, or not a member). */
export async function roleInSketchTeam(db: Db, userId: string, sketchId: string): Promise<Role | null> {
  const row = await db.query.sketches.findFirst({ where: eq(sketches.id, sketchId), columns: { teamId: true } });
  return row ? findRole(db, userId, row.teamId) : null;
}

// ── The edit log ────────────────────────────────────────────────────────────────────────────

/**
 * How long an edit batch waits for a sketch's row lock before giving up (and being retried by
 * the edit queue). Longer than IDLE_IN_TRANSACTION_TIMEOUT_MS, so a waiter normally gets the
 * lock the moment PostgreSQL ends a frozen holder's session.
 */
export const EDIT_LOCK_TIMEOUT_MS = 7_000;

/** An earlier outcome of an op id (a re-sent op is answered with it [R3]). */
export interface SeenEdit {
  op_id: string;
  status: EditStatus;
  revision: number | null;
  op: EditOp;
  reason: string | null;
}

/** What a locked sketch row says when an edit batch starts. */
export interface LockedSketch {
  title: string;
  /** Null when the row is still at `cachedRevision` (the caller already holds that document). */
  document: unknown;
  revision: number;
  /** The callers' roles in the sketch's team. */
  roles: Record<string, Role>;
  seen: SeenEdit[];
}

/** One row of the edit log as the batch writes it. */
export interface EditLogRow {
  id: string;
  opId: string;
  revision: number | null;
  userId: string;
  op: EditOp;
  status: EditStatus;
  reason: string | null;
}

/** What a batch writes: the new document state (when edits applied) and every log row. */
export interface BatchWrite {
  sketch: { title: string; document: SketchDocument; revision: number; updatedBy: string | null } | null;
  rows: EditLogRow[];
}

/**
 * Runs one edit batch atomically: lock the sketch row (edits reaching several server instances
 * queue here, in one order [R2]) waiting at most EDIT_LOCK_TIMEOUT_MS, read the callers' roles
 * and earlier outcomes of these op ids [R3] in the same round trip, let `plan` decide (it may
 * read the log since a stale base [R5]), write what it decided, commit. The document column is
 * read only when the row moved past `cachedRevision`. Null when the sketch does not exist.
 * Nothing slow happens inside: the solve runs after the commit.
 */
export async function editSketchAtomically<T>(
  db: Db,
  sketchId: string,
  ask: { opIds: string[]; userIds: string[]; cachedRevision: number | null },
  plan: (locked: LockedSketch, loggedAfter: (revision: number) => Promise<Map<number, EditOp>>) => Promise<{ write: BatchWrite; result: T }>,
): Promise<T | null> {
  return db.transaction(async (tx) => {
    const list = (values: string[]) => sql.join(values.map((v) => sql`${v}`), sql`, `);
    await tx.execute(sql`select set_config('lock_timeout', ${`${EDIT_LOCK_TIMEOUT_MS}ms`}, true)`);
    const locked = await tx.execute<{ title: string; document: unknown; revision: number; roles: Record<string, Role> | null; seen: SeenEdit[] | null }>(sql`
      select s.title, s.revision,
             case when s.revision = ${ask.cachedRevision ?? -1} then null else s.document end as document,
             (select json_object_agg(m.user_id, m.role) from memberships m
               where m.team_id = s.team_id and m.user_id in (${list(ask.userIds)})) as roles,
             (select json_agg(json_build_object('op_id', e.op_id, 'status', e.status, 'revision', e.revision, 'op', e.op, 'reason', e.reason))
                from sketch_edits e where e.sketch_id = s.id and e.op_id in (${list(ask.opIds)})) as seen
        from sketches s
       where s.id = ${sketchId}
         for update of s`);
    const row = locked.rows[0];
    if (!row) return null;
    // The log since a stale base, read inside the lock (so it is exactly what precedes us).
    const loggedAfter = async (revision: number) => {
      const logged = new Map<number, EditOp>();
      const rows = await tx
        .select({ revision: sketchEdits.revision, op: sketchEdits.op })
        .from(sketchEdits)
        .where(and(eq(sketchEdits.sketchId, sketchId), gt(sketchEdits.revision, revision)))
        .orderBy(asc(sketchEdits.revision));
      for (const e of rows) if (e.revision !== null) logged.set(e.revision, e.op as EditOp);
      return logged;
    };
    const { write, result } = await plan({ title: row.title, document: row.document, revision: row.revision, roles: row.roles ?? {}, seen: row.seen ?? [] }, loggedAfter);
    await writeBatch(tx, sketchId, write);
    return result;
  });
}

async function writeBatch(tx: Tx, sketchId: string, write: BatchWrite): Promise<void> {
  const logRows = sql`select r.id, ${sketchId}::text, r.op_id, r.revision, r.user_id, r.op, r.status, r.reason
      from jsonb_to_recordset(${JSON.stringify(write.rows.map((r) => ({ id: r.id, op_id: r.opId, revision: r.revision, user_id: r.userId, op: r.op, status: r.status, reason: r.reason })))}::jsonb)
        as r(id text, op_id text, revision int, user_id text, op jsonb, status edit_status, reason text)`;
  if (write.sketch) {
    // One statement writes the document, its summary for the sketches table and every log row.
    const summary = sketchSummaryColumns(write.sketch.document, write.sketch.revision);
    await tx.execute(sql`
      with updated as (
        update sketches
           set title = ${write.sketch.title}, document = ${JSON.stringify(write.sketch.document)}::jsonb, revision = ${write.sketch.revision},
               vertex_count = ${summary.vertexCount}, thickness_ratio = ${summary.thicknessRatio}::double precision,
               selected_mach = ${summary.selectedMach}::double precision, selected_alpha_deg = ${summary.selectedAlphaDeg}::double precision,
               design_point_count = ${summary.designPointCount}, selected_point_name = ${summary.selectedPointName},
               summary_revision = ${summary.summaryRevision},
               updated_by = ${write.sketch.updatedBy}, updated_at = now()
         where id = ${sketchId}
        returning 1
      )
      insert into sketch_edits (id, sketch_id, op_id, revision, user_id, op, status, reason)
      ${logRows}, updated`);
  } else if (write.rows.length) {
    await tx.execute(sql`insert into sketch_edits (id, sketch_id, op_id, revision, user_id, op, status, reason) ${logRows}`);
  }
}

/**
 * Stores the server's solve of revision `revision`, unless a result of a newer revision is
 * already there (solves of one sketch may finish out of order across instances). True when stored.
 */
export async function storeAnalysis(db: Db, sketchId: string, revision: number, status: AnalysisStatus, resultJson: string): Promise<boolean> {
  const { rowCount } = await db.execute(sql`
    update sketches set last_solve_status = ${status}, last_result = ${resultJson}::jsonb, result_revision = ${revision}
     where id = ${sketchId} and coalesce(result_revision, -1) < ${revision}`);
  return (rowCount ?? 0) > 0;
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
    .where(and(eq(sketchEdits.sketchId, sketchId), gt(sketchEdits.revision, afterRevision), lte(sketchEdits.revision, currentRevision)))
    .orderBy(asc(sketchEdits.revision));
  if (rows.length !== currentRevision - afterRevision) return null;
  return rows.map((r) => ({ revision: r.revision!, op: r.op as EditOp, userId: r.userId }));
}

/** The current revision of each of these sketches (deleted ones are absent). */
export async function sketchRevisions(db: Db, sketchIds: readonly string[]): Promise<Map<string, number>> {
  if (sketchIds.length === 0) return new Map();
  const rows = await db.select({ id: sketches.id, revision: sketches.revision }).from(sketches).where(inArray(sketches.id, [...sketchIds]));
  return new Map(rows.map((r) => [r.id, r.revision]));
}

// ── Walkthroughs ─────────────────────────────────────────────────────────────────────────────

/** Who leads the walkthrough of a sketch, or null. */
export async function findWalkthrough(db: Db, sketchId: string): Promise<WalkthroughState> {
  const rows = await db
    .select({ leadUserId: walkthroughs.leadUserId, leadName: users.name, startedAt: walkthroughs.startedAt })
    .from(walkthroughs)
    .innerJoin(users, eq(users.id, walkthroughs.leadUserId))
    .where(eq(walkthroughs.sketchId, sketchId));
  const row = rows[0];
  return row ? { leadUserId: row.leadUserId, leadName: row.leadName, startedAt: row.startedAt.toISOString() } : null;
}

/** Makes `leadUserId` the lead (a new start time), or ends the walkthrough when null. */
export async function saveWalkthroughLead(db: Db, sketchId: string, leadUserId: string | null): Promise<void> {
  if (leadUserId) {
    await db
      .insert(walkthroughs)
      .values({ sketchId, leadUserId })
      .onConflictDoUpdate({ target: walkthroughs.sketchId, set: { leadUserId, startedAt: new Date() } });
  } else {
    await db.delete(walkthroughs).where(eq(walkthroughs.sketchId, sketchId));
  }
}
