import nodemailer, { type Transporter } from 'nodemailer';
import type { MailContent } from './templates.ts';

export interface Mailer {
  send(to: string | string[], content: MailContent): Promise<void>;
  close(): void;
}

/**
 * Outgoing mail through nodemailer over SMTP (SMTP_URL). Without SMTP_URL the message is written
 * to the log instead, so a developer without a mail server still sees links.
 */
export function createMailer(smtpUrl: string | undefined, from: string, log: (l: string) => void = console.log): Mailer {
  const transport: Transporter = smtpUrl
    ? nodemailer.createTransport(smtpUrl)
    : nodemailer.createTransport({ jsonTransport: true });
  return {
    async send(to, content) {
      const info = await transport.sendMail({ from, to, subject: content.subject, text: content.text, html: content.html });
      if (!smtpUrl) log(`[mail] (no SMTP_URL; not sent) to ${String(to)}: ${content.subject}\n${content.text}`);
      void info;
    },
    close: () => transport.close(),
  };
}
