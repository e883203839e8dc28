import { desc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { studies, users } from '../../db/schema.ts';
import { studyDetailSchema, studySummarySchema, type StudyDefinition, type StudyDetail, type StudyResults, type StudySummary } from '../../../shared/model/study.ts';

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
  row: { id: string; sketchId: string; name: string; definition: StudyDefinition; results: StudyResults; revision: number; points: number; counts: StudyResults['counts']; elapsedMs: number; createdBy: string },
): Promise<void> {
  await db.insert(studies).values(row);
}

type SummaryRow = { [K in keyof typeof summaryColumns]: unknown } & { createdAt: Date };

/** A stored row through the API schema: JSON columns are checked, not cast ([M1]). */
const toSummary = (r: SummaryRow): StudySummary => studySummarySchema.parse({ ...r, counts: r.counts ?? {}, createdAt: r.createdAt.toISOString() });

export async function listStudies(db: Db, sketchId: string, limit: number, offset: number): Promise<{ rows: StudySummary[]; total: number }> {
  const rows = await db
    .select(summaryColumns)
    .from(studies)
    .leftJoin(users, eq(users.id, studies.createdBy))
    .where(eq(studies.sketchId, sketchId))
    .orderBy(desc(studies.createdAt), desc(studies.id))
    .limit(limit)
    .offset(offset);
  const total = await db.$count(studies, eq(studies.sketchId, sketchId));
  return { rows: rows.map(toSummary), total };
}

/** Just the sketch of a study (for the role check before the rows are read). */
export async function findStudySketch(db: Db, id: string): Promise<string | null> {
  const row = await db.query.studies.findFirst({ where: eq(studies.id, id), columns: { sketchId: true } });
  return row?.sketchId ?? null;
}

export async function findStudy(db: Db, id: string): Promise<StudyDetail | null> {
  const rows = await db
    .select({ ...summaryColumns, results: studies.results, elapsedMs: studies.elapsedMs })
    .from(studies)
    .leftJoin(users, eq(users.id, studies.createdBy))
    .where(eq(studies.id, id));
  const r = rows[0];
  return r ? studyDetailSchema.parse({ ...r, counts: r.counts ?? {}, createdAt: r.createdAt.toISOString() }) : null;
}

export async function deleteStudy(db: Db, id: string): Promise<void> {
  await db.delete(studies).where(eq(studies.id, id));
}
