// The demo's repair orders, derived from the written history: every bin that is held (in quarantine or in
// repair) today gets the order its latest failed prep check opened, with the fault found; a bin already at the
// repair bench has a first work entry. Older failures in the history were released before repair orders
// existed in the scenario, so they get none.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';

export async function seedRepairOrders(t: Transaction): Promise<number> {
  const opened = await sequelize.query<{ id: number }>(
    `INSERT INTO repair_orders (asset_id, opened_from, scan_event_id, fault, place, opened_by, created_at, updated_at)
     SELECT DISTINCT ON (a.id) a.id, 'prep_check', e.id, COALESCE(NULLIF(btrim(e.payload->>'faults'), ''), 'The prep check failed.'), 'in_house', e.user_id, e.occurred_at, e.occurred_at
       FROM assets a JOIN scan_events e ON e.asset_id = a.id AND e.action = 'prep_check' AND e.status_to = 'quarantine' AND e.voided_at IS NULL
      WHERE a.status IN ('quarantine', 'in_repair')
      ORDER BY a.id, e.occurred_at DESC
     RETURNING id`,
    { type: QueryTypes.SELECT, transaction: t },
  );
  await sequelize.query(
    `INSERT INTO repair_work (repair_order_id, performed_on, description, parts, labour_hours, cost, recorded_by, created_at)
     SELECT r.id, (e.occurred_at AT TIME ZONE (SELECT time_zone FROM settings WHERE id = 1))::date, 'Stripped down and cleaned; damaged parts taken off for replacement.', 'Gasket set', 1.5, 42.00, e.user_id, e.occurred_at
       FROM repair_orders r JOIN assets a ON a.id = r.asset_id
       JOIN LATERAL (SELECT occurred_at, user_id FROM scan_events s WHERE s.asset_id = a.id AND s.action = 'send_to_repair' ORDER BY s.occurred_at DESC LIMIT 1) e ON true
      WHERE a.status = 'in_repair' AND r.status = 'open'`,
    { transaction: t },
  );
  return opened.length;
}
