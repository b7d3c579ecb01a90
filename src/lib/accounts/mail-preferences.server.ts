// A person's choice about non-essential mail (reminders and notices they could do without: the overdue-return
// reminder, the monthly count's reminder). Essential mail — invitations, password resets, confirmations of what
// they asked for, safety alerts — is sent whatever they choose.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { recordAudit, type AuditActor } from '@/lib/audit.server';

export async function mailOptOut(userId: number): Promise<boolean> {
  const [row] = await sequelize.query<{ mail_opt_out: boolean }>('SELECT mail_opt_out FROM users WHERE id = $1', { bind: [userId], type: QueryTypes.SELECT });
  return row?.mail_opt_out ?? false;
}

export async function setMailOptOut(userId: number, optOut: boolean, actor: AuditActor): Promise<{ optOut: boolean }> {
  return sequelize.transaction(async (transaction) => {
    const [before] = await sequelize.query<{ mail_opt_out: boolean }>('SELECT mail_opt_out FROM users WHERE id = $1 FOR UPDATE', {
      bind: [userId],
      type: QueryTypes.SELECT,
      transaction,
    });
    await sequelize.query('UPDATE users SET mail_opt_out = $2 WHERE id = $1', { bind: [userId, optOut], transaction });
    await recordAudit(
      { actor, action: 'user.mail_preference', entityType: 'user', entityId: userId, before: { mailOptOut: before?.mail_opt_out ?? false }, after: { mailOptOut: optOut } },
      { transaction },
    );
    return { optOut };
  });
}
