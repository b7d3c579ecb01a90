// Alerts that follow a recorded scan, sent after its transaction committed.
// A seal number that differs at discharge reaches every planner at once.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { sealMismatchMail } from '@/lib/mail/mail-templates';
import { groupGrai } from '@/lib/gs1';
import { sendMail } from '@/lib/mail/mailer.server';
import { getSettings } from '@/lib/settings/settings.server';
import { plannerAddresses } from '@/lib/requests/requests.server';
import { appUrl } from '@/lib/app-url.server';
import type { ScanOutcome } from './scan-service.server';

export async function alertAfterScan(outcome: ScanOutcome): Promise<void> {
  if (outcome.replayed || !outcome.flags.includes('seal_mismatch') || !outcome.tripId) return;
  try {
    const settings = await getSettings();
    const [row] = await sequelize.query<{ serial: string; grai: string; site: string | null; customer: string | null; applied: string[]; found: string[]; at: Date }>(
      `SELECT a.serial, a.grai, s.name AS site, o.name AS customer, t.seals_applied AS applied, t.seals_verified AS found, t.discharged_at AS at
         FROM trips t JOIN assets a ON a.id = t.asset_id LEFT JOIN sites s ON s.id = t.discharge_site_id LEFT JOIN organisations o ON o.id = t.customer_id
        WHERE t.id = $1`,
      { bind: [outcome.tripId], type: QueryTypes.SELECT },
    );
    if (!row) return;
    const mail = sealMismatchMail({
      operatorName: settings.operatorName,
      serial: row.serial,
      grai: groupGrai(row.grai, settings.gs1PrefixLength),
      siteName: row.site,
      customerName: row.customer,
      applied: row.applied,
      found: row.found,
      at: row.at ?? new Date(),
      timeZone: settings.timeZone,
      link: `${appUrl()}/bins/${row.grai}`,
    });
    for (const to of await plannerAddresses()) await sendMail({ to, ...mail, kind: 'seal_mismatch' });
  } catch (err) {
    console.error('[alerts] seal mismatch alert could not be sent', err);
  }
}
