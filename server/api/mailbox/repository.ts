import { and, arrayContains, desc, eq, type SQL } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { mailMessages } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';

/** Messages the development mail sink received (server/mail/sink.ts stores, the mailbox reads). */

export async function insertMessage(db: Db, row: { fromAddress: string; toAddresses: string[]; subject: string; textBody: string; htmlBody: string | null; raw: string }): Promise<string> {
  const id = newId('mail');
  await db.insert(mailMessages).values({ id, ...row });
  return id;
}

/** `to`: only messages addressed to it; null: every message (the operator's view). */
const addressedTo = (to: string | null): SQL | undefined => (to === null ? undefined : arrayContains(mailMessages.toAddresses, [to]));

export async function listMessages(db: Db, to: string | null, page: { limit: number; offset: number }) {
  const rows = await db
    .select({ id: mailMessages.id, from: mailMessages.fromAddress, to: mailMessages.toAddresses, subject: mailMessages.subject, receivedAt: mailMessages.receivedAt })
    .from(mailMessages)
    .where(addressedTo(to))
    .orderBy(desc(mailMessages.receivedAt), desc(mailMessages.id))
    .limit(page.limit)
    .offset(page.offset);
  const total = await db.$count(mailMessages, addressedTo(to));
  return { rows, total };
}

export async function findMessage(db: Db, id: string, to: string | null) {
  const rows = await db.select().from(mailMessages).where(and(eq(mailMessages.id, id), addressedTo(to)));
  return rows[0] ?? null;
}
