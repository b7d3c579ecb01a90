import { Setting } from '../../models';
import { AppError } from '../api-errors';

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
  version: number;
}

// Settings change rarely and are read on most requests: cache for a few
// seconds per process (several app servers each see a change within 5 s).
let cached: { at: number; value: OperatorSettings } | null = null;
const TTL_MS = 5_000;

export async function getSettings(): Promise<OperatorSettings> {
  if (cached && Date.now() - cached.at < TTL_MS) return cached.value;
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
    version: row.version,
  };
  cached = { at: Date.now(), value };
  return value;
}

/** Call after changing settings so this process sees the change at once. */
export function forgetSettings() {
  cached = null;
}
