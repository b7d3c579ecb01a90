import { Setting } from '../../models';
import { AppError } from '../api-errors';
import type { SettingsInput, SettingsView } from '../settings-schema';
import { recordAudit, type AuditActor } from './audit';
import { sequelize } from './db';

const FIELDS = [
  'operatorName', 'gs1CompanyPrefix', 'gs1PrefixLength', 'digitalLinkBase', 'timeZone', 'currency', 'taxRate', 'mailSender', 'returnInstructions',
] as const;

function snapshot(s: Setting) {
  return Object.fromEntries(FIELDS.map((f) => [f, s[f]])) as Omit<SettingsView, 'version' | 'updatedAt'>;
}

function view(s: Setting): SettingsView {
  return { ...snapshot(s), version: s.version, updatedAt: new Date(s.updatedAt).toISOString() };
}

export async function readSettings(): Promise<SettingsView> {
  const s = await Setting.findByPk(1);
  if (!s) throw new AppError('not_found', 'The settings have not been created yet; run the set-up first.');
  return view(s);
}

/**
 * Saves the settings when the form was loaded from the current version; a
 * form loaded before someone else's save is refused (409), never merged.
 */
export async function updateSettings(input: SettingsInput, actor: AuditActor): Promise<SettingsView> {
  return sequelize.transaction(async (transaction) => {
    const s = await Setting.findByPk(1, { transaction, lock: transaction.LOCK.UPDATE });
    if (!s) throw new AppError('not_found', 'The settings have not been created yet; run the set-up first.');
    if (s.version !== input.version) {
      throw new AppError('changed_meanwhile', 'Someone changed the settings while you were editing. Reload to see their version, then make your change again.');
    }
    const before = snapshot(s);
    // NUMERIC comes back as "0.2100": an equal rate typed as "0.21" is no change.
    const next = { ...input, taxRate: Number(input.taxRate) === Number(before.taxRate) ? before.taxRate : input.taxRate };
    for (const f of FIELDS) s.set(f, next[f]);
    await s.save({ transaction });
    await s.reload({ transaction });
    await recordAudit({ actor, action: 'settings.update', entityType: 'settings', entityId: s.id, before, after: snapshot(s) }, { transaction });
    return view(s);
  });
}
