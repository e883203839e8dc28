import nodemailer, { type Transporter } from 'nodemailer';
import type { MailContent } from './templates.ts';

export interface Mailer {
  send(to: string | string[], content: MailContent): Promise<void>;
  close(): void;
}

/**
 * Outgoing mail through nodemailer over SMTP (SMTP_URL). Without SMTP_URL nothing is sent and the
 * log says so (`npm start` always sets SMTP_URL: its local sink keeps every message).
 */
export function createMailer(smtpUrl: string | undefined, from: string, log: (l: string) => void = console.log): Mailer {
  const transport: Transporter = smtpUrl
    ? nodemailer.createTransport(smtpUrl)
    : nodemailer.createTransport({ jsonTransport: true });
  return {
    async send(to, content) {
      const info = await transport.sendMail({ from, to, subject: content.subject, text: content.text, html: content.html });
      // Not the text: it carries links with tokens, and logs are no place for credentials.
      if (!smtpUrl) log(`[mail] not sent (no SMTP_URL is set): "${content.subject}" to ${([] as string[]).concat(to).length} recipient(s)`);
      void info;
    },
    close: () => transport.close(),
  };
}
