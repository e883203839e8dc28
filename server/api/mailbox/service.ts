import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import type { SessionUser } from '../../auth/passport.ts';
import * as repo from './repository.ts';

/**
 * The development mailbox: what the local SMTP sink received. It is not a skeleton key: each
 * person reads only the messages addressed to their own address; every message (other people's
 * reset and invitation links included) only an operator account named in MAILBOX_OPERATOR, and
 * never in production (the mailbox does not exist there).
 */
export type MailboxScope = 'mine' | 'all';

function visibleTo(ctx: AppContext, user: SessionUser, scope: MailboxScope): string | null {
  if (scope === 'mine') return user.email;
  if (!ctx.mailboxOperators.has(user.email)) {
    throw new HttpError(403, 'forbidden', 'Only the mailbox operator (MAILBOX_OPERATOR) may read every message; your inbox shows the mail sent to you.');
  }
  return null;
}

export async function listMail(ctx: AppContext, user: SessionUser, scope: MailboxScope, page: { limit: number; offset: number }) {
  const { rows, total } = await repo.listMessages(ctx.db, visibleTo(ctx, user, scope), page);
  return { items: rows.map((r) => ({ ...r, receivedAt: r.receivedAt.toISOString() })), total, ...page, scope };
}

/** One message: an operator may open any; anyone else only one addressed to them (404 otherwise). */
export async function getMail(ctx: AppContext, user: SessionUser, mailId: string) {
  const row = await repo.findMessage(ctx.db, mailId, ctx.mailboxOperators.has(user.email) ? null : user.email);
  if (!row) throw new HttpError(404, 'not_found', 'No such message in your inbox.');
  return { id: row.id, from: row.fromAddress, to: row.toAddresses, subject: row.subject, text: row.textBody, html: row.htmlBody, receivedAt: row.receivedAt.toISOString() };
}
