// The test-day plan of a depot on the real database: bins due within the window, at the depot or out on
// hire (expected back after the customer's usual days on hire), planned within the bench's capacity, none
// after its due date; a bin expected back only after its due date is flagged with why.
import { describe, test, expect } from 'vitest';
import { addDays, format } from 'date-fns';
import { usePoolWorld, newBin } from '../support/fixtures';
import { setAsset, handTrip } from '../support/hand-made';
import { sequelize } from '../support/db';
import { depotTestPlan } from '@/lib/inspections/test-days.server';
import { capacityOn } from '@/lib/inspections/test-day-plan';
import { localDate } from '@/lib/calendar';

const w = usePoolWorld();
const today = localDate(new Date(), 'Europe/Amsterdam');
const day = (n: number) => format(addDays(new Date(`${today}T12:00:00`), n), 'yyyy-MM-dd');

describe('test days at a depot', () => {
  test('capacity respected, nothing after its due date, the late one flagged', async () => {
    await sequelize.query(`UPDATE sites SET test_capacity = '{0,2,2,2,2,2,0}' WHERE id = $1`, { bind: [w.depot.id] });
    for (let i = 0; i < 7; i++) {
      const b = await newBin(w);
      await setAsset(b.id, { next_intermediate_due: day(10 + i), next_due: day(10 + i), next_full_due: day(900) });
    }
    // Out on hire since today - 5 with a customer who keeps bins 40 days: back in 35 days, due in 20.
    const out = await newBin(w);
    for (let i = 0; i < 3; i++) {
      const b = await newBin(w);
      const sent = new Date(Date.UTC(2026, i, 1, 10));
      await handTrip({
        assetId: b.id,
        customerId: w.customer.id,
        depotSiteId: w.depot.id,
        dispatchedAt: sent.toISOString(),
        returnedAt: new Date(sent.getTime() + 40 * 86_400_000).toISOString(),
      });
    }
    const trip = await handTrip({ assetId: out.id, customerId: w.customer.id, depotSiteId: w.depot.id, customerSiteId: w.customerSite.id, dispatchedAt: `${day(-5)}T10:00:00Z` });
    await setAsset(out.id, {
      status: 'on_hire',
      site_id: w.customerSite.id,
      customer_id: w.customer.id,
      current_trip_id: trip,
      next_intermediate_due: day(20),
      next_due: day(20),
      next_full_due: day(900),
    });

    const p = await depotTestPlan(w.depot.id, 2);
    const placed = p.plan.days.flatMap((d) => d.binIds);
    expect(placed).toHaveLength(7);
    for (const d of p.plan.days) {
      expect(d.binIds.length).toBeLessThanOrEqual(capacityOn({ perWeekday: [0, 2, 2, 2, 2, 2, 0] }, d.date));
      for (const id of d.binIds) expect(d.date <= p.bins.get(id)!.dueOn).toBe(true);
    }
    expect(p.plan.flagged).toEqual([{ id: String(out.id), code: 'back_after_due', reason: expect.stringContaining(`Expected back on ${day(35)}, after its due date ${day(20)}`) }]);
  });
});
