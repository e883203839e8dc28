import { eq, sql } from 'drizzle-orm';
import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { sketches } from '../../db/schema.ts';
import { authorizeSketch, getSketch } from '../sketches/service.ts';
import { findSketch } from '../sketches/repository.ts';
import { recordSketchEvent } from '../activity/repository.ts';
import { membersAmong } from '../pins/repository.ts';
import { findRole } from '../auth/repository.ts';
import { noticeMail } from '../../mail/templates.ts';
import { roleAtLeast } from '../../../shared/model/roles.ts';
import type { ReviewStatus } from '../../../shared/model/review.ts';

/**
 * Review status (draft → in review → approved) is set by editors and owners; approval must come
 * from someone other than the person who last edited the sketch (a second pair of eyes).
 */
export async function setReviewStatus(ctx: AppContext, user: { id: string; name: string }, sketchId: string, status: ReviewStatus) {
  await authorizeSketch(ctx.db, user.id, sketchId, 'editor', 'change the review status');
  const row = await ctx.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId), columns: { updatedBy: true, reviewStatus: true } });
  if (!row) throw new HttpError(404, 'not_found', 'No such sketch.');
  if (status === 'approved' && row.updatedBy === user.id) {
    throw new HttpError(403, 'self_approval', 'You made the last edit to this sketch; someone else must approve it.');
  }
  if (row.reviewStatus !== status) {
    await ctx.db.update(sketches).set({ reviewStatus: status }).where(eq(sketches.id, sketchId));
    await recordSketchEvent(ctx.db, { sketchId, actorId: user.id, kind: 'status.changed', detail: { from: row.reviewStatus, to: status } });
    ctx.events.emit('sketchNotice', sketchId, 'status');
  }
  return getSketch(ctx.db, user.id, sketchId);
}

/** Asks team members to review: each gets an e-mail with a link; the sketch goes "in review". */
export async function requestReview(ctx: AppContext, user: { id: string; name: string }, sketchId: string, input: { reviewerIds: string[]; message: string }) {
  const { teamId } = await authorizeSketch(ctx.db, user.id, sketchId, 'editor', 'request reviews');
  // In the order they were picked (names read in that order in mails and the feed).
  const people = (await membersAmong(ctx.db, teamId, input.reviewerIds)).sort((a, b) => input.reviewerIds.indexOf(a.id) - input.reviewerIds.indexOf(b.id));
  if (people.length !== new Set(input.reviewerIds).size) throw new HttpError(400, 'invalid_input', 'Invalid body: reviewerIds: every reviewer must be a member of this team.');
  for (const p of people) {
    if (!roleAtLeast(await findRole(ctx.db, p.id, teamId), 'reviewer')) {
      throw new HttpError(400, 'invalid_input', `Invalid body: reviewerIds: ${p.name} is a viewer; reviewing needs the reviewer role or higher.`);
    }
  }
  const sketch = await findSketch(ctx.db, sketchId);
  const url = `${ctx.publicUrl()}/sketches/${sketchId}`;
  for (const p of people) {
    const mail = noticeMail({
      subject: `${user.name} asks you to review “${sketch?.title ?? 'a sketch'}”`,
      heading: 'A review request',
      paragraphs: [`${user.name} asks you to review the sketch “${sketch?.title ?? ''}” (revision ${sketch?.revision ?? '?'}).`, ...(input.message ? [`“${input.message}”`] : [])],
      action: { label: 'Open the sketch', url },
    });
    await ctx.mailer.send(p.email, mail).catch((err) => ctx.log(`[mail] review request to ${p.email} failed: ${(err as Error).message}`));
  }
  await ctx.db.update(sketches).set({ reviewStatus: 'in_review', updatedAt: sql`updated_at` }).where(eq(sketches.id, sketchId));
  await recordSketchEvent(ctx.db, { sketchId, actorId: user.id, kind: 'review.requested', detail: { reviewerIds: people.map((p) => p.id), reviewerNames: people.map((p) => p.name).join(', ') } });
  ctx.events.emit('sketchNotice', sketchId, 'status');
  return getSketch(ctx.db, user.id, sketchId);
}
