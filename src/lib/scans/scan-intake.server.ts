import { AppError } from '@/lib/api-errors';
import type { ScanEventBody } from './scan-schema';
import { findBin } from '@/lib/bins/bin-lookup.server';
import { recordScan, type ScanOutcome } from './scan-service.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { alertAfterScan } from './scan-alerts.server';

/** A scan as a client sent it: resolve the bin, then record it. */
export async function recordScanFromClient(user: SessionUser, e: ScanEventBody): Promise<ScanOutcome> {
  let assetId = e.assetId;
  if (assetId === undefined) {
    const found = await findBin(e.grai!, user);
    if (found.kind !== 'found') throw new AppError('not_found', found.kind === 'none' ? found.message : 'Several bins match; scan or type the full GRAI.');
    assetId = found.assetId;
  }
  const outcome = await recordScan(user, {
    ...e,
    assetId,
    occurredAt: e.occurredAt ? new Date(e.occurredAt) : undefined,
    lotsAsOf: e.lotsAsOf ? new Date(e.lotsAsOf) : undefined,
    fill: e.fill ? { ...e.fill, seals: e.fill.seals } : undefined,
  });
  await alertAfterScan(outcome);
  return outcome;
}
