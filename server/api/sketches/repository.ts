import { desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Db } from '../../db/client.ts';
import { reviewOutcomes, sketches, users } from '../../db/schema.ts';
import type { AnalysisStatus } from '../../../shared/model/analysis.ts';
import type { SketchDocument } from '../../../shared/model/sketch.ts';
import { columnsToSummary, sketchSummaryColumns } from '../../db/sketchSummary.ts';

const editor = alias(users, 'editor');

const columns = {
  id: sketches.id,
  teamId: sketches.teamId,
  title: sketches.title,
  revision: sketches.revision,
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

/**
 * The team's sketches for the home table, newest first: each row's summary from its columns,
 * never its document — except a row whose summary does not belong to its revision (stored
 * before migration 0011 and not filled yet): `summary` is null and its document comes along,
 * so the service summarises it.
 */
export async function listSketches(db: Db, teamId: string) {
  const rows = await db
    .select({
      ...columns,
      vertexCount: sketches.vertexCount,
      thicknessRatio: sketches.thicknessRatio,
      selectedMach: sketches.selectedMach,
      selectedAlphaDeg: sketches.selectedAlphaDeg,
      designPointCount: sketches.designPointCount,
      selectedPointName: sketches.selectedPointName,
      summaryRevision: sketches.summaryRevision,
      staleDocument: sql<unknown>`case when ${sketches.summaryRevision} is distinct from ${sketches.revision} then ${sketches.document} end`,
    })
    .from(sketches)
    .leftJoin(editor, eq(editor.id, sketches.updatedBy))
    .leftJoin(reviewOutcomes, eq(reviewOutcomes.id, sketches.approvalId))
    .where(eq(sketches.teamId, teamId))
    .orderBy(desc(sketches.updatedAt));
  return rows.map(({ vertexCount, thicknessRatio, selectedMach, selectedAlphaDeg, designPointCount, selectedPointName, summaryRevision, staleDocument, ...row }) => {
    const summary = columnsToSummary({ vertexCount, thicknessRatio, selectedMach, selectedAlphaDeg, designPointCount, selectedPointName, summaryRevision, revision: row.revision });
    return { ...row, summary, document: summary ? null : staleDocument };
  });
}

export async function findSketch(db: Db, id: string) {
  const rows = await db
    .select({ ...columns, document: sketches.document, lastResult: sketches.lastResult, resultRevision: sketches.resultRevision })
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
    ...sketchSummaryColumns(row.document, 0),
  });
}

export async function deleteSketch(db: Db, id: string) {
  await db.delete(sketches).where(eq(sketches.id, id));
}
