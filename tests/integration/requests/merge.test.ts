// Ten identical reports for one bin are one request holding ten reports, with the latest quantity stated, and
// the planners are mailed once; a report about a site without a bin joins the site's request; past the window, or
// once the request is done, a report opens a new one.
import { describe, test, expect } from 'vitest';
import { usePoolWorld, newBin } from '../support/fixtures';
import { sqlRows } from '../support/hand-made';
import { sequelize } from '../support/db';
import { createCollectionRequest, type CollectionRequestInput } from '@/lib/requests/requests.server';

const w = usePoolWorld();
const report = (over: Partial<CollectionRequestInput>): CollectionRequestInput => ({
  source: 'public',
  assetId: null,
  quantity: 12,
  locationNote: null,
  contactName: 'Driver',
  contactPhone: null,
  contactEmail: null,
  note: null,
  requestedBy: null,
  requesterIp: '198.51.100.7',
  ...over,
});
const planners = async () => (await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM mail_outbox WHERE kind = 'collection_request'`))[0]!.n;

describe('merged collection requests', () => {
  test('ten reports for one bin: one request, ten reports, the latest quantity, one mail per planner', async () => {
    const bin = await newBin(w);
    const mailsBefore = await planners();
    const ids = new Set<number>();
    for (let i = 0; i < 10; i += 1) {
      const out = await createCollectionRequest(report({ assetId: bin.id, quantity: i === 9 ? 14 : 12 }));
      await out.delivery;
      ids.add(out.id);
    }
    expect(ids.size).toBe(1);
    const [row] = await sqlRows<{ report_count: number; quantity: number }>(`SELECT report_count, quantity FROM collection_requests WHERE id = $1`, [[...ids][0]]);
    expect(row).toEqual({ report_count: 10, quantity: 14 }); // not 12 × 9 + 14
    const plannerCount = (await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM users WHERE role IN ('planner') AND active`))[0]!.n;
    expect((await planners()) - mailsBefore).toBe(plannerCount);
  });

  test('reports about one site join its request, whatever bin they came from; a done request or an old one do not', async () => {
    const a = await createCollectionRequest(report({ source: 'portal', siteId: w.customerSite.id, customerId: w.customer.id, quantity: 6 }));
    const b = await createCollectionRequest(report({ source: 'planner', siteId: w.customerSite.id, customerId: w.customer.id, quantity: 8 }));
    expect([b.id, b.merged]).toEqual([a.id, true]);
    const atSite = await newBin(w);
    await sequelize.query(`UPDATE assets SET site_id = $2, customer_id = $3 WHERE id = $1`, { bind: [atSite.id, w.customerSite.id, w.customer.id] });
    const fromLabel = await createCollectionRequest(report({ assetId: atSite.id, quantity: 9 }));
    expect([fromLabel.id, fromLabel.merged]).toEqual([a.id, true]);
    expect((await sqlRows<{ report_count: number; quantity: number }>(`SELECT report_count, quantity FROM collection_requests WHERE id = $1`, [a.id]))[0]).toEqual({
      report_count: 3,
      quantity: 9,
    });
    await sequelize.query(`UPDATE collection_requests SET status = 'done' WHERE id = $1`, { bind: [a.id] });
    const c = await createCollectionRequest(report({ source: 'portal', siteId: w.customerSite.id, customerId: w.customer.id }));
    expect(c.merged).toBe(false);
    await sequelize.query(`UPDATE collection_requests SET last_reported_at = now() - interval '73 hours' WHERE id = $1`, { bind: [c.id] });
    expect((await createCollectionRequest(report({ source: 'portal', siteId: w.customerSite.id, customerId: w.customer.id }))).id).not.toBe(c.id);
  });

  test('twenty reports for one bin at once still make one request', async () => {
    await sequelize.query(`UPDATE collection_requests SET status = 'cancelled' WHERE status IN ('open', 'scheduled')`); // nothing to join at its depot
    const bin = await newBin(w);
    const out = await Promise.all(Array.from({ length: 20 }, () => createCollectionRequest(report({ assetId: bin.id }))));
    await Promise.all(out.map((o) => o.delivery));
    expect(new Set(out.map((o) => o.id)).size).toBe(1);
    expect((await sqlRows<{ report_count: number }>(`SELECT report_count FROM collection_requests WHERE asset_id = $1`, [bin.id]))[0]!.report_count).toBe(20);
  });
});

describe('what the public page offers where the bin is', () => {
  test('a bin in our own depot has nothing to collect: a posted collection request is refused in the finder’s language, a damage report is taken', async () => {
    const { receivePublicReport } = await import('@/lib/requests/public-reports.server');
    const bin = await newBin(w); // available at the depot
    const multipart = (fields: Record<string, string>) => {
      const f = new FormData();
      for (const [k, v] of Object.entries(fields)) f.set(k, v);
      return f;
    };
    const before = (await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM collection_requests WHERE asset_id = $1`, [bin.id]))[0]!.n;
    const refused = await receivePublicReport({
      bin: { id: bin.id, grai: bin.grai, serial: bin.serial, customerId: null, status: 'available' },
      request: new Request('http://pool.test/8003/x', {
        method: 'POST',
        body: multipart({ form: 'collection', quantity: '2', contactName: 'Driver', contactPhone: '+31101234567' }),
      }),
      clientAddress: '198.51.100.201',
      userId: null,
      language: 'de',
    });
    expect(refused).toMatchObject({ ok: false, code: 'unprocessable', message: expect.stringMatching(/nichts abzuholen/) });
    expect((await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM collection_requests WHERE asset_id = $1`, [bin.id]))[0]!.n).toBe(before);
    const damage = await receivePublicReport({
      bin: { id: bin.id, grai: bin.grai, serial: bin.serial, customerId: null, status: 'available' },
      request: new Request('http://pool.test/8003/x', { method: 'POST', body: multipart({ form: 'damage', description: 'Cracked pallet base' }) }),
      clientAddress: '198.51.100.202',
      userId: null,
    });
    expect(damage.ok).toBe(true);
    if (damage.ok) await damage.delivery;
  });
});
