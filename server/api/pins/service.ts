import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { authorizeSketch } from '../sketches/service.ts';
import { findSketch } from '../sketches/repository.ts';
import { recordSketchEvent } from '../activity/repository.ts';
import { noticeMail } from '../../mail/templates.ts';
import type { PinDetail, PinSummary, PinTarget } from '../../../shared/model/review.ts';
import * as repo from './repository.ts';
import { errorForLog } from '../../log.ts';

function excerpt(body: string): string {
  const one = body.replace(/\s+/g, ' ').trim();
  return one.length > 80 ? `${one.slice(0, 77)}…` : one;
}

function targetLabel(target: PinTarget): string {
  if (target.kind === 'facet') return `facet ${target.facet}`;
  if (target.kind === 'wave') return target.label ?? 'a wave';
  return 'a point';
}

type PinRow = NonNullable<Awaited<ReturnType<typeof repo.findPin>>>;

function summary(row: PinRow & { firstBody: string; replyCount: number }): PinSummary {
  return {
    id: row.id,
    sketchId: row.sketchId,
    target: row.target as PinTarget,
    status: row.status,
    authorName: row.authorName,
    firstBody: row.firstBody,
    replyCount: row.replyCount,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
    resolvedByName: row.resolvedByName,
  };
}

type Mentioned = Awaited<ReturnType<typeof repo.membersAmong>>;

/** The people mentioned, all of whom must be members of the sketch's team (400 otherwise). */
async function checkMentions(ctx: AppContext, teamId: string, mentions: string[]): Promise<Mentioned> {
  const mentioned = await repo.membersAmong(ctx.db, teamId, mentions);
  if (mentioned.length !== new Set(mentions).size) {
    throw new HttpError(400, 'invalid_input', 'Invalid body: mentions: everyone mentioned must be a member of this team.');
  }
  return mentioned;
}

/** E-mails each mentioned person (but the author) a notice with a link to the pin. */
async function notifyMentions(ctx: AppContext, mentioned: Mentioned, input: { sketchId: string; pinId: string; authorId: string; authorName: string; body: string }) {
  const sketch = await findSketch(ctx.db, input.sketchId);
  const url = `${ctx.publicUrl()}/sketches/${input.sketchId}?pin=${input.pinId}`;
  for (const person of mentioned) {
    if (person.id === input.authorId) continue;
    const mail = noticeMail({
      subject: `${input.authorName} mentioned you on “${sketch?.title ?? 'a sketch'}”`,
      heading: `${input.authorName} mentioned you`,
      paragraphs: [`On the sketch “${sketch?.title ?? ''}”:`, `“${excerpt(input.body)}”`],
      action: { label: 'Open the pin', url },
    });
    await ctx.mailer.send(person.email, mail).catch((err) => ctx.log(`[mail] mention to user ${person.id} failed: ${errorForLog(err, false)}`));
  }
}

export async function listPins(ctx: AppContext, userId: string, sketchId: string, query: { status: 'open' | 'resolved' | 'all'; limit: number; offset: number }) {
  await authorizeSketch(ctx.db, userId, sketchId, 'viewer', 'see review pins');
  const { rows, total } = await repo.listPins(ctx.db, sketchId, query.status, query.limit, query.offset);
  return { items: rows.map(summary), total, limit: query.limit, offset: query.offset };
}

export async function getPin(ctx: AppContext, userId: string, pinId: string): Promise<PinDetail> {
  const row = await repo.findPin(ctx.db, pinId);
  if (!row) throw new HttpError(404, 'not_found', 'No such pin.');
  await authorizeSketch(ctx.db, userId, row.sketchId, 'viewer', 'see review pins');
  const replies = await repo.listReplies(ctx.db, pinId);
  return {
    ...summary({ ...row, firstBody: replies[0]?.body ?? '', replyCount: Math.max(0, replies.length - 1) }),
    replies: replies.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() })),
  };
}

export async function createPin(ctx: AppContext, user: { id: string; name: string }, sketchId: string, input: { target: PinTarget; body: string; mentions: string[] }): Promise<PinDetail> {
  const { teamId } = await authorizeSketch(ctx.db, user.id, sketchId, 'reviewer', 'place review pins');
  const mentioned = await checkMentions(ctx, teamId, input.mentions);
  const pinId = await repo.insertPin(ctx.db, { sketchId, authorId: user.id, ...input });
  await recordSketchEvent(ctx.db, { sketchId, actorId: user.id, kind: 'pin.created', detail: { pinId, targetLabel: targetLabel(input.target), excerpt: excerpt(input.body) } });
  await notifyMentions(ctx, mentioned, { sketchId, pinId, authorId: user.id, authorName: user.name, body: input.body });
  ctx.events.emit('sketchNotice', sketchId, 'pins');
  return getPin(ctx, user.id, pinId);
}

export async function reply(ctx: AppContext, user: { id: string; name: string }, pinId: string, input: { body: string; mentions: string[] }): Promise<PinDetail> {
  const pin = await repo.findPin(ctx.db, pinId);
  if (!pin) throw new HttpError(404, 'not_found', 'No such pin.');
  const { teamId } = await authorizeSketch(ctx.db, user.id, pin.sketchId, 'reviewer', 'reply on review pins');
  const mentioned = await checkMentions(ctx, teamId, input.mentions);
  await repo.insertReply(ctx.db, { pinId, authorId: user.id, ...input });
  await recordSketchEvent(ctx.db, { sketchId: pin.sketchId, actorId: user.id, kind: 'pin.replied', detail: { pinId, excerpt: excerpt(input.body) } });
  await notifyMentions(ctx, mentioned, { sketchId: pin.sketchId, pinId, authorId: user.id, authorName: user.name, body: input.body });
  ctx.events.emit('sketchNotice', pin.sketchId, 'pins');
  return getPin(ctx, user.id, pinId);
}

export async function setStatus(ctx: AppContext, userId: string, pinId: string, status: 'open' | 'resolved'): Promise<PinDetail> {
  const pin = await repo.findPin(ctx.db, pinId);
  if (!pin) throw new HttpError(404, 'not_found', 'No such pin.');
  await authorizeSketch(ctx.db, userId, pin.sketchId, 'reviewer', status === 'resolved' ? 'resolve pins' : 'reopen pins');
  if (pin.status !== status) {
    await repo.setPinStatus(ctx.db, pinId, status, userId);
    await recordSketchEvent(ctx.db, { sketchId: pin.sketchId, actorId: userId, kind: status === 'resolved' ? 'pin.resolved' : 'pin.reopened', detail: { pinId } });
    ctx.events.emit('sketchNotice', pin.sketchId, 'pins');
  }
  return getPin(ctx, userId, pinId);
}
