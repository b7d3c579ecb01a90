import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import type PgBoss from 'pg-boss';
import { usePoolWorld, newBin, makeUser } from '../support/fixtures';
import { recordScan } from '@/lib/scans/scan-service.server';
import { runJobNow, JOBS } from '@/lib/jobs/registry.server';
import { startJobQueue } from '@/lib/jobs/queue.server';
import { Asset, MailMessage } from '@/models';

const w = usePoolWorld();

/** A bin delivered to the customer at `at` and not scanned since. */
async function onHireSince(at: string) {
  const bin = await newBin(w, { registeredAt: '2026-05-01T08:00:00Z' });
  const steps = [
    { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id },
    { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id },
    { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id },
    { action: 'deliver', siteId: w.customerSite.id },
  ] as const;
  let i = 0;
  for (const s of steps) {
    await recordScan(
      w.yard,
      { clientEventId: randomUUID(), assetId: bin.id, occurredAt: new Date(Date.parse(at) + i++ * 60_000), ...s },
      { now: new Date('2026-12-01T12:00:00Z') },
    );
  }
  return bin;
}

describe('jobs at a fixed clock', () => {
  test('missing-bin rule: a bin silent for more than 120 days is marked missing once; a recent one is left', async () => {
    const old = await onHireSince('2026-07-01T08:00:00Z'); // 153 days before the clock
    const recent = await onHireSince('2026-09-01T08:00:00Z'); // 91 days
    const clock = { now: new Date('2026-12-01T01:15:00Z') };
    const first = await runJobNow('missing-bin-rule', clock);
    expect(first).toEqual({ checked: 1, marked: 1 });
    expect((await Asset.findByPk(old.id))!.status).toBe('missing');
    expect((await Asset.findByPk(recent.id))!.status).toBe('on_hire');
    const again = await runJobNow('missing-bin-rule', clock);
    expect(again).toEqual({ checked: 0, marked: 0 });
  });

  test('planner digest: every active planner gets one mail with the overdue bins', async () => {
    await makeUser('planner', w.operator.id, { email: 'second.planner@test.example' });
    process.env.SMTP_HOST = '127.0.0.1';
    process.env.SMTP_PORT = '1'; // nobody listens: the outbox still records each attempt
    const out = await runJobNow('planner-digest', { now: new Date('2026-12-01T06:00:00Z') });
    expect(out.planners).toBe(2);
    const mails = await MailMessage.findAll({ where: { kind: 'planner_digest' } });
    expect(mails).toHaveLength(2);
    // the 91-day bin is past the test customer's 14 free days
    expect(mails[0]!.textBody).toMatch(/Test Customer: 1 \(oldest \d+ days on hire\)/);
  });

  test('pg-boss: every job gets its queue and its schedule in the operator’s zone', async () => {
    const boss: PgBoss = await startJobQueue(process.env.DATABASE_URL!, 'Europe/Amsterdam', () => {});
    try {
      const schedules = await boss.getSchedules();
      expect(schedules.map((s) => s.name).sort()).toEqual(JOBS.map((j) => j.name).sort());
      expect(schedules.every((s) => s.options?.tz === 'Europe/Amsterdam' || (s as unknown as { tz?: string }).tz === 'Europe/Amsterdam')).toBe(true);
      // a job sent now is worked by the handler registered for it
      const id = await boss.send('missing-bin-rule', {});
      let state = '';
      for (let i = 0; i < 50 && state !== 'completed'; i++) {
        await new Promise((r) => setTimeout(r, 200));
        state = (await boss.getJobById('missing-bin-rule', id!))?.state ?? '';
      }
      expect(state).toBe('completed');
    } finally {
      await boss.stop({ graceful: false, wait: true });
    }
  }, 60_000);
});
