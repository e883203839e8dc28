import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { AddressInfo } from 'node:net';
import type { Db } from '../db/client.ts';
import { insertMessage } from '../api/mailbox/repository.ts';

export interface MailSink {
  port: number;
  url: string;
  close(): Promise<void>;
}

const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(value) ? value : value ? [value] : [];
  return list.flatMap((a) => a.value.map((v) => v.address ?? '').filter(Boolean));
}

/**
 * A local SMTP server (development and tests only) on 127.0.0.1 that accepts every message and
 * stores it in the mail_messages table, where the dev mailbox page shows each person the mail
 * addressed to them. No authentication, no relaying: nothing it receives leaves the machine.
 */
export async function startMailSink(db: Db, options: { port?: number; log?: (l: string) => void } = {}): Promise<MailSink> {
  const log = options.log ?? (() => {});
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    banner: 'Shockwright development mail sink',
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', async () => {
        try {
          const raw = Buffer.concat(chunks);
          const parsed = await simpleParser(raw);
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          await insertMessage(db, {
            fromAddress: addresses(parsed.from)[0] ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            toAddresses: envelopeTo.length ? envelopeTo : addresses(parsed.to),
            subject: parsed.subject ?? '',
            textBody: parsed.text ?? '',
            htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
            raw: raw.toString('utf8'),
          });
          log(`[mail sink] stored a message for ${envelopeTo.length} recipient(s)`);
          callback();
        } catch (err) {
          callback(err as Error);
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => resolve());
  });
  const { port } = server.server.address() as AddressInfo;
  return {
    port,
    url: `smtp://127.0.0.1:${port}`,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}
