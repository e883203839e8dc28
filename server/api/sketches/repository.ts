import { and, desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Db } from '../../db/client.ts';
import { sketches, users } from '../../db/schema.ts';
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
  createdAt: sketches.createdAt,
  updatedAt: sketches.updatedAt,
  updatedByName: editor.name,
};

export async function listSketches(db: Db, teamId: string) {
  return db
    .select(columns)
    .from(sketches)
    .leftJoin(editor, eq(editor.id, sketches.updatedBy))
    .where(eq(sketches.teamId, teamId))
    .orderBy(desc(sketches.updatedAt));
}

export async function findSketch(db: Db, id: string) {
  const rows = await db
    .select({ ...columns, lastResult: sketches.lastResult })
    .from(sketches)
    .leftJoin(editor, eq(editor.id, sketches.updatedBy))
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
  row: { id: string; teamId: string; title: string; document: SketchDocument; userId: string; lastSolveStatus: string | null; lastResult: unknown },
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
  });
}

export async function renameSketch(db: Db, id: string, title: string, userId: string) {
  await db.update(sketches).set({ title, updatedBy: userId, updatedAt: sql`now()` }).where(eq(sketches.id, id));
}

/**
 * Replaces the document if the stored revision is still `baseRevision`; returns the new revision,
 * or null when someone else saved first.
 */
export async function replaceDocument(
  db: Db,
  id: string,
  input: { document: SketchDocument; baseRevision: number; userId: string; lastSolveStatus: string | null; lastResult: unknown },
): Promise<number | null> {
  const rows = await db
    .update(sketches)
    .set({
      document: input.document,
      revision: sql`${sketches.revision} + 1`,
      updatedBy: input.userId,
      updatedAt: sql`now()`,
      lastSolveStatus: input.lastSolveStatus,
      lastResult: input.lastResult,
    })
    .where(and(eq(sketches.id, id), eq(sketches.revision, input.baseRevision)))
    .returning({ revision: sketches.revision });
  return rows[0]?.revision ?? null;
}

export async function deleteSketch(db: Db, id: string) {
  await db.delete(sketches).where(eq(sketches.id, id));
}
