import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { authorizeSketch, getSketch } from '../sketches/service.ts';
import { findSketch } from '../sketches/repository.ts';
import { membersAmong } from '../pins/repository.ts';
import { findRole } from '../auth/repository.ts';
import { noticeMail } from '../../mail/templates.ts';
import { roleAtLeast } from '../../../shared/model/roles.ts';
import type { ReviewHistoryEntry, ReviewOutcome, ReviewStatus } from '../../../shared/model/review.ts';
import { markInReview, recordOutcome, reviewHistoryPage, type ReviewSubject } from './repository.ts';
import { errorForLog } from '../../log.ts';

type Actor = { id: string; name: string };

/**
 * Records a review outcome and tells the people with the sketch open. The rules are checked
 * under the sketch's row lock (`recordOutcome`), so an edit cannot slip in between.
 */
async function decide(ctx: AppContext, user: Actor, sketchId: string, outcome: ReviewOutcome, status: ReviewStatus, note: string, check: (s: ReviewSubject) => void) {
  const revision = await recordOutcome(ctx.db, { sketchId, outcome, status, actorId: user.id, actorName: user.name, note }, check);
  if (revision === null) throw new HttpError(404, 'not_found', 'No such sketch.');
  ctx.events.emit('sketchNotice', sketchId, 'status');
  return getSketch(ctx.db, user.id, sketchId);
}

/** [A3] An outcome is given to the revision its reviewer looked at; a newer one must be looked at first. */
function sameRevision(seen: number, now: number, what: string) {
  if (seen !== now) {
    throw new HttpError(409, 'revision_moved', `The sketch changed while you were reviewing it (you saw revision ${seen}, it is now at revision ${now}); look at revision ${now} before you ${what}.`, { revision: now });
  }
}

/**
 * A reviewer (or an editor or owner) approves the revision they looked at [A1][A3]. The person
 * who made the last edit cannot approve it: someone else must (a second pair of eyes) [A4].
 */
export async function approve(ctx: AppContext, user: Actor, sketchId: string, input: { revision: number; note: string }) {
  await authorizeSketch(ctx.db, user.id, sketchId, 'reviewer', 'approve sketches');
  return decide(ctx, user, sketchId, 'approved', 'approved', input.note, (s) => {
    sameRevision(input.revision, s.revision, 'approve');
    if (s.updatedBy === user.id) throw new HttpError(403, 'self_approval', 'You made the last edit to this sketch; someone else must approve it.');
  });
}

/** A reviewer (or an editor or owner) asks for changes, saying what, at the revision they looked at [A3]. */
export async function requestChanges(ctx: AppContext, user: Actor, sketchId: string, input: { revision: number; note: string }) {
  await authorizeSketch(ctx.db, user.id, sketchId, 'reviewer', 'request changes');
  return decide(ctx, user, sketchId, 'changes_requested', 'changes_requested', input.note, (s) => sameRevision(input.revision, s.revision, 'request changes'));
}

/** An owner resets the review to draft (withdrawing any approval; the history keeps it) [A5]. */
export async function resetReview(ctx: AppContext, user: Actor, sketchId: string) {
  await authorizeSketch(ctx.db, user.id, sketchId, 'owner', 'reset the review');
  return decide(ctx, user, sketchId, 'reset', 'draft', '', () => {});
}

/** Every approval, request for changes and reset of the sketch, newest first. */
export async function listReviewHistory(ctx: AppContext, userId: string, sketchId: string, page: { limit: number; offset: number }) {
  await authorizeSketch(ctx.db, userId, sketchId, 'viewer', 'see this sketch’s review history');
  const { rows, total } = await reviewHistoryPage(ctx.db, sketchId, page.limit, page.offset);
  const items: ReviewHistoryEntry[] = rows.map((r) => ({ ...r, at: r.at.toISOString() }));
  return { items, total, ...page };
}

/** Asks team members to review: each gets an e-mail with a link; the sketch goes "in review". */
export async function requestReview(ctx: AppContext, user: Actor, sketchId: string, input: { reviewerIds: string[]; message: string }) {
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
    await ctx.mailer.send(p.email, mail).catch((err) => ctx.log(`[mail] review request to user ${p.id} failed: ${errorForLog(err, false)}`));
  }
  await markInReview(ctx.db, sketchId, { actorId: user.id, detail: { reviewerIds: people.map((p) => p.id), reviewerNames: people.map((p) => p.name).join(', ') } });
  ctx.events.emit('sketchNotice', sketchId, 'status');
  return getSketch(ctx.db, user.id, sketchId);
}
