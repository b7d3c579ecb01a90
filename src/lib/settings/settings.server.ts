import { Setting } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { SettingsInput, SettingsView } from './settings-schema';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { sequelize } from '@/db/sequelize';
import type { PublicLanguage } from '@/lib/requests/public-languages';

export interface OperatorSettings {
  operatorName: string;
  gs1CompanyPrefix: string;
  gs1PrefixLength: number;
  digitalLinkBase: string;
  timeZone: string;
  currency: string;
  taxRate: number;
  mailSender: string;
  returnInstructions: string;
  returnInstructionsByLanguage: Partial<Record<PublicLanguage, string>>;
  undoSeconds: number;
  reminderDaysOver: number;
  /** Days past an invoice's due date before the first payment reminder (then weekly). */
  paymentReminderDays: number;
  /** A repair that would cost more than this proposes the bin for retirement ("400.00"); null: never. */
  repairRetireThreshold: string | null;
  version: number;
}

// Settings change rarely and are read on most requests: cache for a few
// seconds per process (several app servers each see a change within 5 s).
let cached: { at: number; value: OperatorSettings } | null = null;
const TTL_MS = 5_000;

// Requests that find the cache stale at the same moment share one read (one pool connection, not one each).
let reading: Promise<OperatorSettings> | null = null;

export async function getSettings(): Promise<OperatorSettings> {
  if (cached && Date.now() - cached.at < TTL_MS) return cached.value;
  reading ??= loadSettings().finally(() => {
    reading = null;
  });
  return reading;
}

async function loadSettings(): Promise<OperatorSettings> {
  const row = await Setting.findByPk(1);
  if (!row) throw new AppError('unavailable', 'Loopfold has no operator settings yet; run the seed or set them up as admin.');
  const value: OperatorSettings = {
    operatorName: row.operatorName,
    gs1CompanyPrefix: row.gs1CompanyPrefix,
    gs1PrefixLength: row.gs1PrefixLength,
    digitalLinkBase: row.digitalLinkBase,
    timeZone: row.timeZone,
    currency: row.currency,
    taxRate: Number(row.taxRate),
    mailSender: row.mailSender,
    returnInstructions: row.returnInstructions,
    returnInstructionsByLanguage: (row.returnInstructionsByLanguage ?? {}) as Partial<Record<PublicLanguage, string>>,
    undoSeconds: row.undoSeconds,
    reminderDaysOver: row.reminderDaysOver,
    paymentReminderDays: row.paymentReminderDays,
    repairRetireThreshold: row.repairRetireThreshold ?? null,
    version: row.version,
  };
  cached = { at: Date.now(), value };
  return value;
}

/** Call after changing settings so this process sees the change at once. */
export function forgetSettings() {
  cached = null;
  reading = null;
}

// Editing (admin settings page)

const FIELDS = [
  'operatorName',
  'gs1CompanyPrefix',
  'gs1PrefixLength',
  'digitalLinkBase',
  'timeZone',
  'currency',
  'taxRate',
  'mailSender',
  'returnInstructions',
  'returnInstructionsByLanguage',
  'undoSeconds',
  'reminderDaysOver',
  'paymentReminderDays',
  'repairRetireThreshold',
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
    // Left out by an older form: kept as it was. NUMERIC comes back as "400.00": an equal amount is no change.
    if (input.repairRetireThreshold === undefined || (input.repairRetireThreshold !== null && Number(input.repairRetireThreshold) === Number(before.repairRetireThreshold)))
      next.repairRetireThreshold = before.repairRetireThreshold;
    next.reminderDaysOver ??= before.reminderDaysOver;
    next.paymentReminderDays ??= before.paymentReminderDays;
    for (const f of FIELDS) s.set(f, next[f] ?? null);
    await s.save({ transaction });
    await s.reload({ transaction });
    await recordAudit({ actor, action: 'settings.update', entityType: 'settings', entityId: s.id, before, after: snapshot(s) }, { transaction });
    forgetSettings();
    return view(s);
  });
}

/** The operator's time zone, or UTC while no settings exist yet (admin pages still open before the set-up). */
export async function operatorTimeZone(): Promise<string> {
  try {
    return (await getSettings()).timeZone;
  } catch (err) {
    if (err instanceof AppError && err.code === 'unavailable') return 'UTC';
    throw err;
  }
}
