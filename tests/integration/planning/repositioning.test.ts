// The repositioning plan on a generated demo pool, against the database itself: every figure the page shows is
// recounted here with SQL of its own, and the plan keeps the rules (all customer empties collected, no depot
// sends more than it may spare, no lane into a depot beyond its shortage unless it carries collected empties).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { resetDatabase, sequelize } from '../support/db';
import { seedDemo } from '@/db/seed/demo';
import { forgetSettings } from '@/lib/settings/settings.server';
import { repositioningView, type RepositioningView } from '@/lib/planning/repositioning.server';
import { parsePlanSettings } from '@/lib/planning/repositioning-settings';
import { stopPlanSolver } from '@/lib/planning/plan-solver.server';

const NOW = new Date('2026-12-01T12:00:00Z');
let view: RepositioningView;

beforeAll(async () => {
  await resetDatabase();
  forgetSettings();
  await seedDemo({ bins: 160, months: 10, now: NOW });
  const parsed = parsePlanSettings(new URLSearchParams('horizonDays=21'));
  if (!parsed.ok) throw new Error('settings');
  view = await repositioningView(parsed.settings, NOW);
}, 600_000);
afterAll(async () => {
  await stopPlanSolver();
  await sequelize.close();
});

const count = async (sql: string, bind: unknown[] = []) => (await sequelize.query<{ n: number }>(sql, { bind, type: QueryTypes.SELECT }))[0]!.n;

describe('the repositioning plan on the demo pool', () => {
  it('"in the yard" per depot and type is the count of available and prepared bins there', async () => {
    expect(view.rows.length).toBeGreaterThan(0);
    for (const r of view.rows) {
      const n = await count(
        `SELECT count(*)::int n FROM assets a JOIN sites s ON s.id = a.site_id JOIN bin_types t ON t.id = a.bin_type_id
          WHERE s.id = $1 AND t.name = $2 AND a.status IN ('available', 'prepared')`,
        [Number(r.key), r.type],
      );
      expect(n, `${r.name} · ${r.type}`).toBe(r.onHand);
    }
  });

  it('"needed" is what confirmed orders wanted by the horizon still have to load', async () => {
    for (const r of view.rows) {
      const n = await count(
        `SELECT coalesce(sum(greatest(ho.quantity - (SELECT count(*) FROM trips tr WHERE tr.hire_order_id = ho.id), 0)), 0)::int n
           FROM hire_orders ho JOIN bin_types t ON t.id = ho.bin_type_id
          WHERE ho.depot_site_id = $1 AND t.name = $2 AND ho.status IN ('confirmed', 'loading') AND ho.needed_by <= $3::date`,
        [Number(r.key), r.type, view.horizonEnd],
      );
      expect(n, `${r.name} · ${r.type}`).toBe(r.needed);
    }
  });

  it('every folded empty waiting at a customer is collected, and no depot sends more than it may spare', async () => {
    const waiting = await count(
      `SELECT count(*)::int n FROM assets a JOIN sites s ON s.id = a.site_id WHERE s.kind = 'customer' AND a.status = 'awaiting_collection' AND s.latitude IS NOT NULL`,
    );
    const lanes = view.result.plan.lanes;
    expect(lanes.filter((l) => l.fromKind === 'site').reduce((n, l) => n + l.bins.reduce((a, b) => a + b, 0), 0)).toBe(waiting);
    for (const l of lanes.filter((x) => x.fromKind === 'depot')) {
      l.bins.forEach((b, k) => {
        const row = view.rows.find((r) => r.key === l.fromKey && r.type === view.types[k]!.name);
        expect(b, `${l.from} → ${l.to}`).toBeLessThanOrEqual(row?.spare ?? 0);
      });
    }
  });

  it('bins meant for orders never exceed a depot’s shortage; what is short after the plan is named', () => {
    const { lanes, unmet } = view.result.plan;
    for (const r of view.rows) {
      const k = view.types.findIndex((t) => t.name === r.type);
      const into = lanes.filter((l) => l.toKey === r.key).reduce((n, l) => n + l.toShortage[k]!, 0);
      const left = unmet.find((u) => u.depotKey === r.key && u.type === r.type)?.bins ?? 0;
      expect(into + left, `${r.name} · ${r.type}`).toBe(r.shortage);
    }
  });

  it('the solver says how each stage ended', () => {
    for (const stage of Object.values(view.result.stages)) if (stage) expect(['optimal', 'time_limit']).toContain(stage.status);
  });
});
