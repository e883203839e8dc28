/**
 * Every e-mail Shockwright sends, as plain text and HTML. One layout; three templates:
 * invitation, password reset, and a generic notice that later features (review requests,
 * mentions) reuse.
 */
export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

function escapeHtml(s: string): string {
  // & first, so the ampersands of the other entities are not escaped again.
  return s.replaceAll('&', '&amp;').replaceAll('<', '&lt;').replaceAll('>', '&gt;').replaceAll('"', '&quot;').replaceAll("'", '&#39;');
}

interface Layout {
  subject: string;
  heading: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  footnote?: string;
}

function render({ subject, heading, paragraphs, action, footnote }: Layout): MailContent {
  const text = [
    heading,
    '',
    ...paragraphs.flatMap((p) => [p, '']),
    ...(action ? [`${action.label}: ${action.url}`, ''] : []),
    ...(footnote ? [footnote, ''] : []),
    '— Shockwright',
  ].join('\n');
  const html = `<!doctype html><html><body style="margin:0;background:#f4f6f5;font-family:'Work Sans',Arial,sans-serif;color:#14212b">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="background:#ffffff;border:1px solid #d8dedb">
<tr><td style="background:#14212b;color:#e8efec;padding:12px 20px;font-weight:600;font-size:16px">Shockwright</td></tr>
<tr><td style="padding:20px">
<h1 style="font-size:18px;margin:0 0 12px">${escapeHtml(heading)}</h1>
${paragraphs.map((p) => `<p style="font-size:14px;line-height:1.5;margin:0 0 12px">${escapeHtml(p)}</p>`).join('\n')}
${action ? `<p style="margin:20px 0"><a href="${escapeHtml(action.url)}" style="background:#0b6e69;color:#ffffff;padding:10px 16px;text-decoration:none;border-radius:3px">${escapeHtml(action.label)}</a></p><p style="font-size:12px;color:#4a5a66">Or paste this address into your browser: ${escapeHtml(action.url)}</p>` : ''}
${footnote ? `<p style="font-size:12px;color:#4a5a66">${escapeHtml(footnote)}</p>` : ''}
</td></tr></table></td></tr></table></body></html>`;
  return { subject, text, html };
}

export function invitationMail(input: { teamName: string; inviterName: string; role: string; url: string; expiresAt: Date }): MailContent {
  return render({
    subject: `${input.inviterName} invited you to ${input.teamName} on Shockwright`,
    heading: `Join ${input.teamName}`,
    paragraphs: [
      `${input.inviterName} invited you to the team ${input.teamName} on Shockwright as ${input.role === 'editor' || input.role === 'owner' ? 'an' : 'a'} ${input.role}.`,
      'Shockwright is where the team draws supersonic sections and reviews their shock-expansion results together.',
    ],
    action: { label: 'Accept the invitation', url: input.url },
    footnote: `The link works once and expires on ${input.expiresAt.toUTCString()}. If you did not expect this, ignore this message.`,
  });
}

export function passwordResetMail(input: { name: string; url: string }): MailContent {
  return render({
    subject: 'Reset your Shockwright password',
    heading: 'Choose a new password',
    paragraphs: [`Hello ${input.name}, someone (hopefully you) asked to reset the password of your Shockwright account.`],
    action: { label: 'Choose a new password', url: input.url },
    footnote: 'The link works once and expires in one hour. If you did not ask for this, ignore this message; your password stays as it is.',
  });
}

/** A generic notice: a sentence or two and an optional link (review requests, mentions…). */
export function noticeMail(input: { subject: string; heading: string; paragraphs: string[]; action?: { label: string; url: string } }): MailContent {
  return render({ ...input, footnote: 'You receive this because you are a member of a Shockwright team.' });
}

export function confirmSignUpMail(input: { name: string; teamName: string; url: string }): MailContent {
  return render({
    subject: 'Confirm your address to finish signing up to Shockwright',
    heading: 'One step left',
    paragraphs: [
      `Hello ${input.name}, someone (hopefully you) asked to create a Shockwright account with this address and a new team, ${input.teamName}.`,
      'Follow the link to confirm the address; the account is created and you are signed in.',
    ],
    action: { label: 'Confirm and create the account', url: input.url },
    footnote: 'The link works once and expires in 24 hours. If you did not ask for this, ignore this message; no account is created.',
  });
}

/** Sent instead of a confirmation when the address already has an account (the sign-up form answers the same either way). */
export function accountExistsMail(input: { name: string; signInUrl: string; resetUrl: string }): MailContent {
  return render({
    subject: 'Someone tried to sign up to Shockwright with your address',
    heading: 'You already have an account',
    paragraphs: [
      `Hello ${input.name}, someone (perhaps you) tried to create a new Shockwright account with this address, which already has one. No new account was created and nothing about yours changed.`,
      `To use your account, sign in at ${input.signInUrl}. If you forgot the password, choose a new one at ${input.resetUrl}.`,
    ],
    footnote: 'If this was not you, you can ignore this message.',
  });
}
