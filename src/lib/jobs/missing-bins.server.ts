import { stableEventId } from '@/lib/scans/stable-event-id.server';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { MISSING_AFTER_DAYS, SILENT_BINS_SQL } from '@/lib/fleet/missing-rule';
import { recordScan, type Actor } from '@/lib/scans/scan-service.server';
import { localDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import type { JobContext } from './registry.server';

/** One event per bin and day: running the job twice on one day records once. */
const eventId = (assetId: number, day: string) => stableEventId(`missing-rule:${assetId}:${day}`);

/** Marks missing every bin out of the depots that nobody scanned for MISSING_AFTER_DAYS. */
export async function runMissingBinRule({ now }: JobContext) {
  const settings = await getSettings();
  const day = localDate(now, settings.timeZone);
  const bins = await sequelize.query<{ id: number }>(`SELECT id FROM assets WHERE ${SILENT_BINS_SQL} ORDER BY id LIMIT 5000`, {
    bind: [now, MISSING_AFTER_DAYS],
    type: QueryTypes.SELECT,
  });
  const [operator] = await sequelize.query<{ id: number }>(`SELECT id FROM organisations WHERE kind = 'operator'`, { type: QueryTypes.SELECT });
  const actor: Actor = { id: null, role: 'planner', organisationId: operator?.id ?? 0, homeSiteId: null };
  let marked = 0;
  for (const b of bins) {
    const out = await recordScan(
      actor,
      {
        clientEventId: eventId(b.id, day),
        assetId: b.id,
        action: 'mark_missing',
        siteId: null,
        occurredAt: now,
        note: `No scan for ${MISSING_AFTER_DAYS} days (missing-bin rule)`,
      },
      { now },
    );
    if (!out.replayed) marked += 1;
  }
  return { checked: bins.length, marked };
}
