import { and, desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { sketchEvents, snapshots, users } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';
import type { SketchDocument } from '../../../shared/model/sketch.ts';

export async function insertSnapshot(
  db: Db,
  row: { sketchId: string; name: string; note: string; kind: 'manual' | 'before_restore' | 'before_import'; revision: number; title: string; document: SketchDocument; result: unknown; createdBy: string },
): Promise<string> {
  const id = newId('snap');
  await db.insert(snapshots).values({ id, ...row });
  return id;
}

/**
 * Takes back an automatic snapshot whose restore or import then failed, with its activity entry,
 * atomically: a refused request leaves nothing behind.
 */
export async function withdrawSnapshot(db: Db, id: string, sketchId: string): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.delete(sketchEvents).where(and(eq(sketchEvents.sketchId, sketchId), eq(sketchEvents.kind, 'snapshot.created'), sql`${sketchEvents.detail}->>'snapshotId' = ${id}`));
    await tx.delete(snapshots).where(eq(snapshots.id, id));
  });
}

const summaryColumns = {
  id: snapshots.id,
  sketchId: snapshots.sketchId,
  name: snapshots.name,
  note: snapshots.note,
  kind: snapshots.kind,
  revision: snapshots.revision,
  createdByName: users.name,
  createdAt: snapshots.createdAt,
};

export async function listSnapshots(db: Db, sketchId: string, limit: number, offset: number) {
  const rows = await db
    .select(summaryColumns)
    .from(snapshots)
    .leftJoin(users, eq(users.id, snapshots.createdBy))
    .where(eq(snapshots.sketchId, sketchId))
    .orderBy(desc(snapshots.createdAt), desc(snapshots.id))
    .limit(limit)
    .offset(offset);
  const total = await db.$count(snapshots, eq(snapshots.sketchId, sketchId));
  return { rows, total };
}

export async function findSnapshot(db: Db, id: string) {
  const rows = await db
    .select({ ...summaryColumns, title: snapshots.title, document: snapshots.document, result: snapshots.result })
    .from(snapshots)
    .leftJoin(users, eq(users.id, snapshots.createdBy))
    .where(eq(snapshots.id, id));
  return rows[0] ?? null;
}
