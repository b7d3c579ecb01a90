// The rules of one-time account links (invitations and password resets) and of
// the passwords people choose with them. Pure: the services in
// the server modules (`*.server.ts`) apply them to the database.
import { z } from 'zod';
import { text } from '@/lib/text-input';

export type LinkPurpose = 'invite' | 'reset';

/** An invitation link lasts a week (people are invited ahead of their first shift). */
const INVITE_LINK_DAYS = 7;
/** A reset link lasts an hour: whoever asks is at the keyboard now. */
export const RESET_LINK_MINUTES = 60;

export function linkLifetimeMs(purpose: LinkPurpose): number {
  return purpose === 'invite' ? INVITE_LINK_DAYS * 24 * 3600 * 1000 : RESET_LINK_MINUTES * 60 * 1000;
}

/** The page each purpose's link opens; both pages show the same set-password form. */
const LINK_PATHS: Record<LinkPurpose, string> = { invite: '/account/invite', reset: '/account/reset' };

/** `${APP_URL}/account/invite?token=…`; the base comes from configuration, never from a request's Host. */
export function accountLinkUrl(appUrl: string, purpose: LinkPurpose, token: string): string {
  return `${appUrl.replace(/\/+$/, '')}${LINK_PATHS[purpose]}?token=${encodeURIComponent(token)}`;
}

/** 32 random bytes in base64url (RFC 4648 §5) are 43 characters without padding. */
export const TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

export const PASSWORD_MIN_CHARS = 10;
// NIST SP 800-63B §5.1.1.2 asks verifiers to accept at least 64 characters;
// bcrypt reads only the first 72 bytes, so longer input is refused rather than cut silently.
const PASSWORD_MAX_CHARS = 64;
const PASSWORD_MAX_BYTES = 72;

/** Why a chosen password is refused, or null when it is acceptable. */
export function passwordProblem(password: string, context: { email?: string } = {}): string | null {
  if ([...password].length < PASSWORD_MIN_CHARS) return `Use at least ${PASSWORD_MIN_CHARS} characters.`;
  if ([...password].length > PASSWORD_MAX_CHARS) return `Use at most ${PASSWORD_MAX_CHARS} characters.`;
  if (new TextEncoder().encode(password).length > PASSWORD_MAX_BYTES) return 'This password is too long; use fewer special characters.';
  if (password.trim() === '') return 'A password of spaces only is not a password.';
  if (context.email && password.trim().toLowerCase() === context.email.trim().toLowerCase()) {
    return 'Do not use your e-mail address as your password.';
  }
  return null;
}

/** The set-password form: the link's token, the password and its confirmation. */
export const setPasswordSchema = z
  .object({
    token: text().regex(TOKEN_PATTERN, 'This link is not complete. Open it again from the e-mail.'),
    password: text().max(500),
    confirm: text().max(500),
  })
  .superRefine((v, ctx) => {
    const problem = passwordProblem(v.password);
    if (problem) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['password'], message: problem });
    else if (v.password !== v.confirm) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['confirm'], message: 'The two passwords are not the same.' });
  });

export const resetRequestSchema = z.object({
  email: text().trim().toLowerCase().email('Enter an e-mail address, like name@company.example.').max(254),
});

/** The one answer to every reset request, so the page never tells whether an account exists. */
export const RESET_REQUEST_ANSWER =
  'If an account exists for that address, we have sent it a link to choose a new password. The link works for one hour. ' +
  'Nothing arrived within a few minutes? Check your spam folder, or ask your administrator.';

export type LinkState =
  | { status: 'valid'; purpose: LinkPurpose; name: string; email: string; expiresAt: Date }
  | { status: 'used' | 'expired' | 'inactive'; purpose: LinkPurpose }
  | { status: 'unknown' };

/** What a person reads when a link cannot be used, per purpose. */
export function linkProblemMessage(state: Exclude<LinkState, { status: 'valid' }>): string {
  const askAgain =
    state.status !== 'unknown' && state.purpose === 'invite'
      ? 'Ask your administrator to send you a new invitation.'
      : 'Ask for a new link on the “Forgotten your password?” page.';
  switch (state.status) {
    case 'used':
      return `This link has already been used. If you set your password with it, sign in. Otherwise: ${askAgain}`;
    case 'expired':
      return `This link has expired. ${askAgain}`;
    case 'inactive':
      return 'This account has been deactivated, so its password cannot be set. Ask your administrator if you still need access.';
    case 'unknown':
      return 'This link is not valid: it may be incomplete, or a newer link replaced it. Use the newest e-mail you received, or ask for a new link.';
  }
}
