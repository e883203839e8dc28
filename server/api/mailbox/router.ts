import { Router } from 'express';
import { desc, count, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser } from '../../auth/guards.ts';
import { HttpError } from '../../http/errors.ts';
import { parseOr400 } from '../../http/validate.ts';
import { mailMessages, memberships } from '../../db/schema.ts';
import { pageQuerySchema } from '../../../shared/model/teams.ts';

/**
 * The development mailbox: what the local SMTP sink received. Mounted only outside production,
 * and only team owners may read it (it holds other people's invitation links).
 */
export function mailboxRouter(ctx: AppContext): Router {
  const router = Router();

  router.use(async (req, _res, next) => {
    const user = currentUser(req);
    const owner = await ctx.db.query.memberships.findFirst({ where: sql`${memberships.userId} = ${user.id} and ${memberships.role} = 'owner'` });
    if (!owner) throw new HttpError(403, 'forbidden', 'You need the owner role in a team to read the development mailbox.', { needed: 'owner' });
    next();
  });

  router.get('/', async (req, res) => {
    const page = parseOr400(pageQuerySchema, req.query, 'query');
    const rows = await ctx.db
      .select({ id: mailMessages.id, from: mailMessages.fromAddress, to: mailMessages.toAddresses, subject: mailMessages.subject, receivedAt: mailMessages.receivedAt })
      .from(mailMessages)
      .orderBy(desc(mailMessages.receivedAt), desc(mailMessages.id))
      .limit(page.limit)
      .offset(page.offset);
    const [{ total }] = await ctx.db.select({ total: count() }).from(mailMessages);
    res.json({ items: rows.map((r) => ({ ...r, receivedAt: r.receivedAt.toISOString() })), total, ...page });
  });

  router.get('/:mailId', async (req, res) => {
    const { mailId } = parseOr400(z.object({ mailId: z.string().regex(/^mail_[a-z0-9]{20}$/, 'must be a message id') }), req.params, 'params');
    const row = await ctx.db.query.mailMessages.findFirst({ where: eq(mailMessages.id, mailId) });
    if (!row) throw new HttpError(404, 'not_found', 'No such message.');
    res.json({
      id: row.id,
      from: row.fromAddress,
      to: row.toAddresses,
      subject: row.subject,
      text: row.textBody,
      html: row.htmlBody,
      receivedAt: row.receivedAt.toISOString(),
    });
  });

  return router;
}
