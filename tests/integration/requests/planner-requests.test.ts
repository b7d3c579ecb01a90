// A planner records a collection request taken on the phone: the customer follows from the site, the request is
// audited and joins the open requests the run suggestions read; a site that is not an open customer site is refused
// and nothing is written.
import { describe, test, expect } from 'vitest';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, appErrorOf } from '../support/fixtures';
import { sequelize } from '../support/db';
import { customerSitesForRequests, recordPlannerCollection } from '@/lib/requests/requests.server';
import { plannerCollectionRequest } from '@/lib/requests/report-forms';
import { CollectionRequest } from '@/models';

const w = usePoolWorld();
const actor = () => ({ userId: w.planner.id, ip: '127.0.0.1' });
const count = async () => (await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM collection_requests', { type: QueryTypes.SELECT }))[0]!.n;

describe('collection requests recorded by a planner', () => {
  test('stored for the site’s customer, from the planner, audited, and offered among the customer sites', async () => {
    const sites = await customerSitesForRequests();
    expect(sites.map((s) => s.id)).toContain(w.customerSite.id);
    expect(sites.map((s) => s.id)).not.toContain(w.depot.id);
    const input = plannerCollectionRequest.parse({ siteId: w.customerSite.id, quantity: 7, readyOn: '2027-01-14', contactName: 'Gate office', contactPhone: '+31 10 123 4567' });
    const created = await recordPlannerCollection(input, actor());
    await created.delivery;
    const row = (await CollectionRequest.findByPk(created.id))!;
    expect(row).toMatchObject({
      source: 'planner',
      siteId: w.customerSite.id,
      customerId: w.customer.id,
      quantity: 7,
      readyOn: '2027-01-14',
      status: 'open',
      requestedBy: w.planner.id,
    });
    const audit = await sequelize.query<{ action: string }>(`SELECT action FROM audit_entries WHERE entity_type = 'collection_request' AND entity_id = $1`, {
      bind: [String(created.id)],
      type: QueryTypes.SELECT,
    });
    expect(audit.map((a) => a.action)).toEqual(['collection_request.record']);
  });

  test('a depot, or a site that does not exist, is refused and nothing is written', async () => {
    const before = await count();
    for (const siteId of [w.depot.id, 999_999]) {
      const input = plannerCollectionRequest.parse({ siteId, quantity: 3, readyOn: '2027-01-14', contactName: 'Gate office' });
      const refused = await appErrorOf(recordPlannerCollection(input, actor()));
      expect(refused).toMatchObject({ code: 'validation_failed', message: 'That is not an open customer site.' });
    }
    expect(await count()).toBe(before);
  });
});
