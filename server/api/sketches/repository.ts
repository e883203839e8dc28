import { desc, eq } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Db } from '../../db/client.ts';
import { reviewOutcomes, sketches, users } from '../../db/schema.ts';
import type { AnalysisStatus } from '../../../shared/model/analysis.ts';
import type { SketchDocument } from '../../../shared/model/sketch.ts';

const editor = alias(users, 'editor');

const columns = {
  id: sketches.id,
  teamId: sketches.teamId,
  title: sketches.title,
  revision: sketches.revision,
  document: sketches.document,
  lastSolveStatus: sketches.lastSolveStatus,
  reviewStatus: sketches.reviewStatus,
  /** The approval in force [A1] (null unless approved). */
  approvalRevision: reviewOutcomes.revision,
  approvalByName: reviewOutcomes.actorName,
  approvalNote: reviewOutcomes.note,
  approvalAt: reviewOutcomes.createdAt,
  createdAt: sketches.createdAt,
  updatedAt: sketches.updatedAt,
  updatedByName: editor.name,
};

export async function listSketches(db: Db, teamId: string) {
  return db
    .select(columns)
    .from(sketches)
    .leftJoin(editor, eq(editor.id, sketches.updatedBy))
    .leftJoin(reviewOutcomes, eq(reviewOutcomes.id, sketches.approvalId))
    .where(eq(sketches.teamId, teamId))
    .orderBy(desc(sketches.updatedAt));
}

export async function findSketch(db: Db, id: string) {
  const rows = await db
    .select({ ...columns, lastResult: sketches.lastResult, resultRevision: sketches.resultRevision })
    .from(sketches)
    .leftJoin(editor, eq(editor.id, sketches.updatedBy))
    .leftJoin(reviewOutcomes, eq(reviewOutcomes.id, sketches.approvalId))
    .where(eq(sketches.id, id));
  return rows[0] ?? null;
}

/** Just the team of a sketch (for the role check before anything else is read). */
export async function findSketchTeam(db: Db, id: string): Promise<string | null> {
  const row = await db.query.sketches.findFirst({ where: eq(sketches.id, id), columns: { teamId: true } });
  return row?.teamId ?? null;
}

export async function insertSketch(
  db: Db,
  row: { id: string; teamId: string; title: string; document: SketchDocument; userId: string; lastSolveStatus: AnalysisStatus | null; lastResult: unknown },
) {
  await db.insert(sketches).values({
    id: row.id,
    teamId: row.teamId,
    title: row.title,
    document: row.document,
    createdBy: row.userId,
    updatedBy: row.userId,
    lastSolveStatus: row.lastSolveStatus,
    lastResult: row.lastResult,
    resultRevision: 0,
  });
}

export async function deleteSketch(db: Db, id: string) {
  await db.delete(sketches).where(eq(sketches.id, id));
}
