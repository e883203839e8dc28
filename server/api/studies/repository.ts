import { count, desc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { studies, users } from '../../db/schema.ts';
import type { StudyDefinition, StudyResults } from '../../../shared/model/study.ts';

const summaryColumns = {
  id: studies.id,
  sketchId: studies.sketchId,
  name: studies.name,
  definition: studies.definition,
  revision: studies.revision,
  points: studies.points,
  counts: studies.counts,
  createdByName: users.name,
  createdAt: studies.createdAt,
};

export async function insertStudy(
  db: Db,
  row: { id: string; sketchId: string; name: string; definition: StudyDefinition; results: StudyResults; revision: number; points: number; counts: Record<string, number>; elapsedMs: number; createdBy: string },
): Promise<void> {
  await db.insert(studies).values(row);
}

export async function listStudies(db: Db, sketchId: string, limit: number, offset: number) {
  const rows = await db
    .select(summaryColumns)
    .from(studies)
    .leftJoin(users, eq(users.id, studies.createdBy))
    .where(eq(studies.sketchId, sketchId))
    .orderBy(desc(studies.createdAt), desc(studies.id))
    .limit(limit)
    .offset(offset);
  const [{ total }] = await db.select({ total: count() }).from(studies).where(eq(studies.sketchId, sketchId));
  return { rows, total };
}

/** Just the sketch of a study (for the role check before the rows are read). */
export async function findStudySketch(db: Db, id: string): Promise<string | null> {
  const row = await db.query.studies.findFirst({ where: eq(studies.id, id), columns: { sketchId: true } });
  return row?.sketchId ?? null;
}

export async function findStudy(db: Db, id: string) {
  const rows = await db
    .select({ ...summaryColumns, results: studies.results, elapsedMs: studies.elapsedMs })
    .from(studies)
    .leftJoin(users, eq(users.id, studies.createdBy))
    .where(eq(studies.id, id));
  return rows[0] ?? null;
}

export async function deleteStudy(db: Db, id: string): Promise<void> {
  await db.delete(studies).where(eq(studies.id, id));
}
