import bcrypt from 'bcryptjs';
import { sequelize } from '@/db/sequelize';
import { Organisation, Setting, User } from '@/models';
import { AppError } from '@/lib/api-errors';
import { accountLinkUrl, linkProblemMessage, passwordProblem, RESET_LINK_MINUTES, type LinkPurpose } from './account-rules';
import { inviteMail, passwordResetMail } from '@/lib/mail/mail-templates';
import { ROLE_LABELS, type PersonRow } from './people';
import type { InviteInput } from './people-schemas';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { sendMail, type MailOutcome } from '@/lib/mail/mailer.server';
import { checkAssignment, personById, userSnapshot } from './people.server';
import { claimToken, dropUnusedTokens, inspectToken, issueToken } from './user-tokens.server';
import { hit, passwordResetLimits } from '@/lib/rate-limits.server';
import { appUrl } from '@/lib/app-url.server';

// Invitations, set-password links and password resets. Admin actions carry an
// actor (who, from where) for the audit trail; the public steps (using a link,
// asking for a reset) are recorded against the account itself.

/** bcrypt cost; the same as the sign-in's comparison hash, so both paths take the same time. */
const BCRYPT_COST = 10;

export interface Inviter extends AuditActor {
  name: string;
}

async function operatorSettings() {
  const s = await Setting.findByPk(1, { attributes: ['operatorName', 'timeZone'] });
  return { operatorName: s?.operatorName ?? 'Loopfold', timeZone: s?.timeZone ?? 'UTC' };
}

async function mailInvitation(user: User, token: string, expiresAt: Date, inviterName: string): Promise<MailOutcome> {
  const [{ operatorName, timeZone }, org] = await Promise.all([operatorSettings(), Organisation.findByPk(user.organisationId, { attributes: ['name'] })]);
  const content = inviteMail({
    recipientName: user.name,
    recipientEmail: user.email,
    roleLabel: ROLE_LABELS[user.role],
    organisationName: org?.name ?? operatorName,
    operatorName,
    inviterName,
    link: accountLinkUrl(appUrl(), 'invite', token),
    expiresAt,
    timeZone,
  });
  return sendMail({ to: user.email, ...content, kind: 'invite', secrets: [token] });
}

/**
 * Creates the account without a password and mails a one-time link to choose
 * one. The account and its link are committed before the mail goes out, so a
 * mail failure leaves a pending invitation that can be resent.
 */
export async function invitePerson(input: InviteInput, inviter: Inviter): Promise<{ person: PersonRow; mail: MailOutcome }> {
  const existing = await User.findOne({ where: { email: input.email }, attributes: ['id'] });
  if (existing) {
    throw new AppError('duplicate', `There is already an account for ${input.email}. Find it in the list (to resend its invitation or reactivate it).`, [
      { path: 'email', message: 'This e-mail address already has an account.' },
    ]);
  }
  const { user, token, expiresAt } = await sequelize.transaction(async (transaction) => {
    await checkAssignment(input, transaction);
    const user = await User.create(
      {
        email: input.email,
        name: input.name,
        passwordHash: null,
        role: input.role,
        organisationId: input.organisationId,
        homeSiteId: input.homeSiteId,
        qualifiedInspector: input.qualifiedInspector,
        lastSignInAt: null,
      },
      { transaction },
    );
    const link = await issueToken(user.id, 'invite', transaction);
    await recordAudit({ actor: inviter, action: 'user.invite', entityType: 'user', entityId: user.id, after: userSnapshot(user) }, { transaction });
    return { user, ...link };
  });
  const mail = await mailInvitation(user, token, expiresAt, inviter.name);
  return { person: await personById(user.id), mail };
}

/** A new link for someone who has not set a password yet; older links stop working. */
export async function resendInvitation(userId: number, inviter: Inviter): Promise<{ person: PersonRow; mail: MailOutcome }> {
  const { user, token, expiresAt } = await sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw new AppError('not_found', 'There is no such person.');
    if (!user.active) throw new AppError('unprocessable', `${user.name}'s account is deactivated. Reactivate it first.`);
    if (user.passwordHash) {
      throw new AppError('conflict', `${user.name} has already set a password. If they have forgotten it, they can ask for a reset link on the sign-in page.`);
    }
    const link = await issueToken(user.id, 'invite', transaction);
    await recordAudit({ actor: inviter, action: 'user.reinvite', entityType: 'user', entityId: user.id, after: { expiresAt: link.expiresAt.toISOString() } }, { transaction });
    return { user, ...link };
  });
  const mail = await mailInvitation(user, token, expiresAt, inviter.name);
  return { person: await personById(user.id), mail };
}

/**
 * Sets the password with an invitation or reset link. The link is claimed
 * atomically (a second use fails), and any other pending links of the account
 * stop working.
 */
export async function setPasswordWithLink(token: string, password: string, ip: string | null): Promise<{ email: string; purpose: LinkPurpose }> {
  return sequelize.transaction(async (transaction) => {
    const claimed = await claimToken(token, transaction);
    if (!claimed) {
      const state = await inspectToken(token, transaction);
      if (state.status === 'valid') throw new AppError('conflict', 'This link is being used right now. Reload the page.');
      throw new AppError('unprocessable', linkProblemMessage(state), { reason: state.status });
    }
    const user = await User.findByPk(claimed.userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user || !user.active) {
      throw new AppError('unprocessable', linkProblemMessage({ status: 'inactive', purpose: claimed.purpose }), { reason: 'inactive' });
    }
    const problem = passwordProblem(password, { email: user.email });
    if (problem) throw new AppError('validation_failed', problem, [{ path: 'password', message: problem }]);

    user.passwordHash = await bcrypt.hash(password, BCRYPT_COST);
    await user.save({ transaction });
    await dropUnusedTokens(user.id, transaction);
    await recordAudit(
      {
        actor: { userId: user.id, ip },
        action: claimed.purpose === 'invite' ? 'user.invite_accepted' : 'user.password_reset',
        entityType: 'user',
        entityId: user.id,
        after: { passwordSet: true, via: claimed.purpose },
      },
      { transaction },
    );
    return { email: user.email, purpose: claimed.purpose };
  });
}

export type ResetDelivery = 'sent' | 'mail_failed' | 'no_account' | 'throttled' | 'error';

/**
 * "Forgotten password". The caller answers the same whatever happens next:
 * the account lookup, the link and the mail run in `delivery`, which the
 * request does not wait for, so neither the answer nor its timing tells
 * whether an account exists. Only the per-address limit is answered (429).
 */
export async function requestPasswordReset(email: string, address: string): Promise<{ delivery: Promise<ResetDelivery> }> {
  const wait = await hit(passwordResetLimits.address(), address);
  if (wait > 0) {
    const minutes = Math.ceil(wait / 60);
    throw new AppError('rate_limited', `Too many requests from your network. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`, { retryAfterSeconds: wait });
  }
  const delivery = (async (): Promise<ResetDelivery> => {
    if ((await hit(passwordResetLimits.account(), email)) > 0) return 'throttled';
    const user = await User.findOne({ where: { email, active: true } });
    if (!user) return 'no_account';
    const { token } = await issueToken(user.id, 'reset');
    const { operatorName } = await operatorSettings();
    const content = passwordResetMail({
      recipientName: user.name,
      recipientEmail: user.email,
      operatorName,
      link: accountLinkUrl(appUrl(), 'reset', token),
      validForMinutes: RESET_LINK_MINUTES,
    });
    const outcome = await sendMail({ to: user.email, ...content, kind: 'password_reset', secrets: [token] });
    return outcome.status === 'sent' ? 'sent' : 'mail_failed';
  })().catch((err: unknown): ResetDelivery => {
    console.error('[accounts] password reset request failed', err);
    return 'error';
  });
  return { delivery };
}
