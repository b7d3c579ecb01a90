// The reorder alert job: every depot and spec with supplier terms is checked; when on hand + in transit + on
// order falls below the reorder point an alert opens and planners get one e-mail listing what newly fell below
// (not one per fit: the job runs on a schedule, and an open alert is not mailed again until it has cleared).
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { getSettings } from '@/lib/settings/settings.server';
import { sendMail } from '@/lib/mail/mailer.server';
import { reorderAlertMail } from '@/lib/mail/mail-templates';
import { appUrl } from '@/lib/app-url.server';
import { stockPicture } from './stock-view.server';
import { reorderAlertStep } from './purchase-orders';

export interface OpenReorderAlert {
  depotSiteId: number;
  depot: string;
  specId: number;
  specCode: string;
  position: number;
  reorderPoint: number;
  raisedAt: Date;
}

/** Alerts open now (the pool overview's mark and the stock page). */
export async function openReorderAlerts(): Promise<OpenReorderAlert[]> {
  return sequelize.query<OpenReorderAlert>(
    `SELECT a.depot_site_id AS "depotSiteId", s.name AS depot, a.liner_spec_id AS "specId", sp.code AS "specCode", a.position, a.reorder_point AS "reorderPoint", a.raised_at AS "raisedAt"
       FROM liner_reorder_alerts a JOIN sites s ON s.id = a.depot_site_id JOIN liner_specs sp ON sp.id = a.liner_spec_id
      WHERE a.cleared_at IS NULL ORDER BY s.name, sp.code`,
    { type: QueryTypes.SELECT },
  );
}

export async function runReorderAlerts({ now }: { now: Date }): Promise<Record<string, unknown>> {
  const picture = await stockPicture(now);
  const open = new Set((await openReorderAlerts()).map((a) => `${a.depotSiteId}:${a.specId}`));
  const raised: Array<{ depot: string; depotSiteId: number; spec: string; position: number; reorderPoint: number; suggested: number }> = [];
  let checked = 0;
  let cleared = 0;
  for (const depot of picture.depots) {
    for (const s of depot.specs) {
      if (s.specId === null || !s.plan) continue;
      checked += 1;
      const position = s.onHand + s.inTransit + s.onOrder;
      const rop = Math.ceil(s.plan.reorderPoint);
      const step = reorderAlertStep(open.has(`${depot.siteId}:${s.specId}`), position, rop);
      if (step === 'raise') {
        const [row] = await sequelize.query<{ id: number }>(
          `INSERT INTO liner_reorder_alerts (depot_site_id, liner_spec_id, raised_at, position, reorder_point) VALUES ($1, $2, $3, $4, $5)
           ON CONFLICT (depot_site_id, liner_spec_id) WHERE cleared_at IS NULL DO NOTHING RETURNING id`,
          { bind: [depot.siteId, s.specId, now, position, rop], type: QueryTypes.SELECT },
        );
        if (row) raised.push({ depot: depot.name, depotSiteId: depot.siteId, spec: s.code, position, reorderPoint: rop, suggested: s.plan.suggestedQuantity });
      } else if (step === 'clear') {
        await sequelize.query('UPDATE liner_reorder_alerts SET cleared_at = $3 WHERE depot_site_id = $1 AND liner_spec_id = $2 AND cleared_at IS NULL', {
          bind: [depot.siteId, s.specId, now],
        });
        cleared += 1;
      }
    }
  }
  let mailed = 0;
  if (raised.length) {
    const settings = await getSettings();
    const planners = await sequelize.query<{ email: string; name: string }>(
      `SELECT u.email, u.name FROM users u JOIN organisations o ON o.id = u.organisation_id
        WHERE u.role = 'planner' AND u.active AND o.active AND o.kind = 'operator' ORDER BY u.id`,
      { type: QueryTypes.SELECT },
    );
    const depots = [...new Set(raised.map((r) => r.depotSiteId))];
    const link = `${appUrl()}/liners/stock${depots.length === 1 ? `/${depots[0]}` : ''}`;
    for (const p of planners) {
      const mail = reorderAlertMail({ recipientName: p.name, operatorName: settings.operatorName, link, below: raised });
      if ((await sendMail({ to: p.email, ...mail, kind: 'liner_reorder_alert' })).status === 'sent') mailed += 1;
    }
    await sequelize.query(`UPDATE liner_reorder_alerts SET mailed_to = $2 WHERE cleared_at IS NULL AND raised_at = $1`, { bind: [now, mailed] });
  }
  return { checked, raised: raised.length, cleared, mailed };
}
