import { desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { reviewOutcomes, sketches } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';
import type { ReviewOutcome, ReviewStatus, SketchEventKind } from '../../../shared/model/review.ts';
import { recordSketchEvent } from '../activity/repository.ts';

/** What the review rules look at, read under the sketch's row lock. */
export interface ReviewSubject {
  revision: number;
  /** Who made the last edit (the last-editor rule). */
  updatedBy: string | null;
  reviewStatus: ReviewStatus;
}

const EVENT_OF: Record<ReviewOutcome, SketchEventKind> = {
  approved: 'review.approved',
  changes_requested: 'review.changes_requested',
  reset: 'review.reset',
};

/**
 * Records a review outcome atomically: locks the sketch's row (the edit path takes the same
 * lock, so no edit lands between the check and the record), lets `check` refuse on what it
 * reads there, then keeps the outcome in the history, sets the status (and the approval in
 * force: the new row for an approval, none otherwise) and adds it to the activity feed. The
 * outcome names the revision the sketch had under the lock [A1]. Returns that revision, or
 * null when the sketch does not exist (`check` is then not called).
 */
export async function recordOutcome(
  db: Db,
  input: { sketchId: string; outcome: ReviewOutcome; status: ReviewStatus; actorId: string; actorName: string; note: string },
  check: (subject: ReviewSubject) => void,
): Promise<number | null> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ revision: sketches.revision, updatedBy: sketches.updatedBy, reviewStatus: sketches.reviewStatus })
      .from(sketches)
      .where(eq(sketches.id, input.sketchId))
      .for('update');
    if (!row) return null;
    check(row);
    const id = newId('outcome');
    await tx.insert(reviewOutcomes).values({
      id,
      sketchId: input.sketchId,
      outcome: input.outcome,
      revision: row.revision,
      actorId: input.actorId,
      actorName: input.actorName,
      note: input.note,
    });
    await tx
      .update(sketches)
      .set({ reviewStatus: input.status, approvalId: input.outcome === 'approved' ? id : null })
      .where(eq(sketches.id, input.sketchId));
    await recordSketchEvent(tx, {
      sketchId: input.sketchId,
      actorId: input.actorId,
      kind: EVENT_OF[input.outcome],
      detail: { revision: row.revision, from: row.reviewStatus, ...(input.note ? { note: input.note } : {}) },
    });
    return row.revision;
  });
}

/** A review was asked for: the sketch goes "in review" (an approval in force is withdrawn; the history keeps it). */
export async function markInReview(db: Db, sketchId: string, event: { actorId: string; detail: Record<string, unknown> }): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.update(sketches).set({ reviewStatus: 'in_review', approvalId: null }).where(eq(sketches.id, sketchId));
    await recordSketchEvent(tx, { sketchId, actorId: event.actorId, kind: 'review.requested', detail: event.detail });
  });
}

/** The review history, newest first. */
export async function reviewHistoryPage(db: Db, sketchId: string, limit: number, offset: number) {
  const rows = await db
    .select({
      id: reviewOutcomes.id,
      outcome: reviewOutcomes.outcome,
      revision: reviewOutcomes.revision,
      byName: reviewOutcomes.actorName,
      note: reviewOutcomes.note,
      at: reviewOutcomes.createdAt,
    })
    .from(reviewOutcomes)
    .where(eq(reviewOutcomes.sketchId, sketchId))
    .orderBy(desc(reviewOutcomes.createdAt), desc(sql`${reviewOutcomes.id}`))
    .limit(limit)
    .offset(offset);
  const total = await db.$count(reviewOutcomes, eq(reviewOutcomes.sketchId, sketchId));
  return { rows, total };
}
