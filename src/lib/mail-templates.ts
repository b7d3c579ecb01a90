// The words of every message Loopfold sends, as small pure functions: data in,
// { subject, text, html } out. Plain text is the message; the HTML part is the
// same text with clickable links, for mail programs that prefer HTML.
import { formatMomentAbsolute } from './moment-text';
import { textToHtml } from './text-links';

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

/** What the mailer records as the message's kind (mail_outbox.kind). */
export type MailKind = 'invite' | 'password_reset';

function compose(subject: string, lines: string[]): MailContent {
  const text = lines.join('\n').replace(/\n{3,}/g, '\n\n').trim() + '\n';
  return { subject, text, html: textToHtml(text) };
}

function signature(operatorName: string): string[] {
  return ['', `— ${operatorName}, sent by Loopfold`];
}

export interface InviteMailInput {
  recipientName: string;
  recipientEmail: string;
  roleLabel: string;
  organisationName: string;
  operatorName: string;
  inviterName: string;
  link: string;
  expiresAt: Date;
  timeZone: string;
}

export function inviteMail(i: InviteMailInput): MailContent {
  const where = i.organisationName === i.operatorName ? i.operatorName : `${i.organisationName} (with ${i.operatorName})`;
  return compose(`Your Loopfold account at ${i.operatorName}`, [
    `Hello ${i.recipientName},`,
    '',
    `${i.inviterName} has opened a Loopfold account for you: ${i.roleLabel}, ${where}.`,
    '',
    `Choose your password with this link. It works once, until ${formatMomentAbsolute(i.expiresAt, i.timeZone)} (${i.timeZone} time):`,
    i.link,
    '',
    `After that, sign in with your e-mail address (${i.recipientEmail}) and the password you chose.`,
    '',
    'If you were not expecting this, you can ignore this message: nothing happens unless the link is used.',
    ...signature(i.operatorName),
  ]);
}

export interface ResetMailInput {
  recipientName: string;
  recipientEmail: string;
  operatorName: string;
  link: string;
  validForMinutes: number;
}

export function passwordResetMail(i: ResetMailInput): MailContent {
  const validity = i.validForMinutes % 60 === 0 ? `${i.validForMinutes / 60} hour${i.validForMinutes === 60 ? '' : 's'}` : `${i.validForMinutes} minutes`;
  return compose('Reset your Loopfold password', [
    `Hello ${i.recipientName},`,
    '',
    `Someone asked to reset the password of the Loopfold account ${i.recipientEmail} at ${i.operatorName}.`,
    '',
    `Choose a new password with this link. It works once, within ${validity}:`,
    i.link,
    '',
    'If you did not ask for this, ignore this message: your password stays as it is.',
    ...signature(i.operatorName),
  ]);
}

/** How each kind is named on the "Sent mail" page. */
export const MAIL_KIND_LABELS: Record<MailKind, string> = {
  invite: 'Invitation',
  password_reset: 'Password reset',
};
