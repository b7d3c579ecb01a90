// The monthly count, the customer's side: per site of their scope, whether this month's count is due, and the count
// itself — the pool's list of bins standing at the site, ticked or scanned, compared with the pure rule of
// count-confirmation.ts. A difference is stored as a dispute (one line per bin) that a planner resolves bin by bin
// (count-disputes.server.ts). Every query is scoped to the customer's organisation and sites here, on the server.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { localDate, type LocalDate, type YearMonth } from '@/lib/calendar';
import { parseSerialisedGrai } from '@/lib/gs1';
import { getSettings } from '@/lib/settings/settings.server';
import { compareCount, countMonthFor, countStanding, disputeOutcome, type CountStanding, type DisputeLine, type Resolution } from './count-confirmation';
import { ownSite, scopeSites, type PortalScope } from './portal-scope.server';

import type { CountStatus } from './count-look';
export type { CountStatus };

/** The bins the pool believes stand at a customer site: on hire or waiting there, for that customer. */
const AT_SITE_SQL = `a.site_id = $1 AND a.customer_id = $2 AND a.status IN ('on_hire', 'awaiting_collection')`;

export interface ExpectedBin {
  grai: string;
  serial: string;
  status: 'on_hire' | 'awaiting_collection';
}

export async function binsAtSite(siteId: number, organisationId: number, t?: Transaction): Promise<ExpectedBin[]> {
  return sequelize.query<ExpectedBin>(`SELECT a.grai, a.serial, a.status FROM assets a WHERE ${AT_SITE_SQL} ORDER BY a.serial`, {
    bind: [siteId, organisationId],
    type: QueryTypes.SELECT,
    transaction: t,
  });
}

export interface CountSummary {
  id: number;
  month: YearMonth;
  status: CountStatus;
  countedAt: string;
  countedBy: string;
  expected: number;
  confirmed: number;
  outcome: Record<Resolution, number> & { open: number };
}

interface LineRow {
  count_id: number;
  grai: string;
  kind: DisputeLine['kind'];
  resolution: Resolution | null;
  moved_to: string | null;
}

async function summaries(where: string, bind: unknown[]): Promise<CountSummary[]> {
  const counts = await sequelize.query<{
    id: number;
    month: string;
    status: CountStatus;
    counted_at: string;
    counted_by: string;
    expected: number;
    confirmed: number;
  }>(
    `SELECT c.id, c.month, c.status, c.counted_at, u.name AS counted_by,
            cardinality(c.expected_grais) AS expected, cardinality(c.confirmed_grais) AS confirmed
       FROM site_counts c JOIN users u ON u.id = c.counted_by WHERE ${where} ORDER BY c.month DESC, c.id DESC`,
    { bind, type: QueryTypes.SELECT },
  );
  const lines = counts.length
    ? await sequelize.query<LineRow>(
        `SELECT l.count_id, l.grai, l.kind, l.resolution, s.name AS moved_to FROM site_count_lines l LEFT JOIN sites s ON s.id = l.moved_to_site_id
          WHERE l.count_id = ANY($1::int[])`,
        { bind: [counts.map((c) => c.id)], type: QueryTypes.SELECT },
      )
    : [];
  return counts.map((c) => ({
    id: c.id,
    month: c.month,
    status: c.status,
    countedAt: new Date(c.counted_at).toISOString(),
    countedBy: c.counted_by,
    expected: c.expected,
    confirmed: c.confirmed,
    outcome: disputeOutcome(lines.filter((l) => l.count_id === c.id).map((l) => ({ grai: l.grai, kind: l.kind, resolution: l.resolution, movedTo: l.moved_to }))),
  }));
}

export interface SiteCountStanding {
  site: { id: number; name: string; code: string };
  month: YearMonth;
  standing: CountStanding;
  binsNow: number;
  thisMonth: CountSummary | null;
  earlier: CountSummary[];
}

/** Each site of the scope: this month's standing (due, overdue or counted), the bins there now, and past counts. */
export async function countOverview(scope: PortalScope, today?: LocalDate): Promise<{ month: YearMonth; today: LocalDate; sites: SiteCountStanding[] }> {
  const day = today ?? localDate(new Date(), (await getSettings()).timeZone);
  const month = countMonthFor(day);
  const sites = await scopeSites(scope);
  const ids = sites.map((s) => s.id);
  const all = ids.length ? await summariesWithSite(`c.organisation_id = $1 AND c.site_id = ANY($2::int[])`, [scope.organisationId, ids]) : [];
  const binsNow = ids.length
    ? await sequelize.query<{ site_id: number; n: number }>(
        `SELECT a.site_id, count(*)::int AS n FROM assets a
          WHERE a.site_id = ANY($1::int[]) AND a.customer_id = $2 AND a.status IN ('on_hire', 'awaiting_collection') GROUP BY a.site_id`,
        { bind: [ids, scope.organisationId], type: QueryTypes.SELECT },
      )
    : [];
  return {
    month,
    today: day,
    sites: sites.map((s) => {
      const mine = all.filter((c) => c.siteId === s.id);
      const last = mine[0]?.month ?? null;
      return {
        site: { id: s.id, name: s.name, code: s.code },
        month,
        standing: countStanding(day, last),
        binsNow: binsNow.find((b) => b.site_id === s.id)?.n ?? 0,
        thisMonth: mine.find((c) => c.month === month) ?? null,
        earlier: mine.filter((c) => c.month !== month).slice(0, 6),
      };
    }),
  };
}

async function summariesWithSite(where: string, bind: unknown[]): Promise<Array<CountSummary & { siteId: number }>> {
  const list = await summaries(where, bind);
  if (list.length === 0) return [];
  const sites = await sequelize.query<{ id: number; site_id: number }>(`SELECT id, site_id FROM site_counts WHERE id = ANY($1::int[])`, {
    bind: [list.map((c) => c.id)],
    type: QueryTypes.SELECT,
  });
  return list.map((c) => ({ ...c, siteId: sites.find((s) => s.id === c.id)!.site_id }));
}

export interface CountSheet {
  site: { id: number; name: string; code: string };
  month: YearMonth;
  today: LocalDate;
  standing: CountStanding;
  bins: ExpectedBin[];
  /** This month's count when it is in already (then the sheet shows it instead of the form). */
  counted: (CountSummary & { lines: Array<{ grai: string; serial: string | null; kind: DisputeLine['kind']; resolution: Resolution | null; movedTo: string | null }> }) | null;
}

/** The count sheet of one site of the scope; another organisation's site (or another site than theirs) is "no such site". */
export async function countSheet(scope: PortalScope, siteId: number, today?: LocalDate): Promise<CountSheet> {
  const site = await ownSite(scope, siteId);
  const day = today ?? localDate(new Date(), (await getSettings()).timeZone);
  const month = countMonthFor(day);
  const [done] = await summaries(`c.site_id = $1 AND c.organisation_id = $2 AND c.month = $3`, [site.id, scope.organisationId, month]);
  const lines = done
    ? await sequelize.query<{ grai: string; serial: string | null; kind: DisputeLine['kind']; resolution: Resolution | null; movedTo: string | null }>(
        // A bin the customer scanned that is not theirs shows only as the GRAI they scanned: nothing of its holder.
        `SELECT l.grai, CASE WHEN a.customer_id = $2 THEN a.serial END AS serial, l.kind, l.resolution,
                CASE WHEN ms.organisation_id = $2 OR ms.kind = 'depot' THEN ms.name END AS "movedTo"
           FROM site_count_lines l LEFT JOIN assets a ON a.id = l.asset_id LEFT JOIN sites ms ON ms.id = l.moved_to_site_id
          WHERE l.count_id = $1 ORDER BY l.kind, l.grai`,
        { bind: [done.id, scope.organisationId], type: QueryTypes.SELECT },
      )
    : [];
  return {
    site,
    month,
    today: day,
    standing: countStanding(day, done ? month : null),
    bins: done ? [] : await binsAtSite(site.id, scope.organisationId),
    counted: done ? { ...done, lines } : null,
  };
}

export interface CountInput {
  /** What was ticked or scanned: GRAIs (any written form) or, for bins of the list, their serials. */
  counted: string[];
  method: 'ticked' | 'scanned';
}

export const MAX_COUNTED = 2000;

/**
 * Records this month's count of one site: the pool's list as it stands now, what the customer confirmed, and a
 * dispute line for each difference. A second count of the same site and month is refused (the first stands).
 */
export async function submitCount(
  scope: PortalScope,
  siteId: number,
  input: CountInput,
  now = new Date(),
): Promise<{ id: number; status: CountStatus; missing: number; unexpected: number }> {
  const site = await ownSite(scope, siteId);
  const settings = await getSettings();
  const month = countMonthFor(localDate(now, settings.timeZone));
  if (input.counted.length > MAX_COUNTED) throw new AppError('validation_failed', `At most ${MAX_COUNTED} bins in one count.`, [{ path: 'counted', message: 'Too many.' }]);
  return sequelize.transaction(async (t) => {
    // One count per site and month: a second submission waits here for the first, then finds it.
    await sequelize.query('SELECT pg_advisory_xact_lock(hashtext($1))', { bind: [`site-count:${site.id}:${month}`], transaction: t });
    const [already] = await sequelize.query<{ id: number }>(`SELECT id FROM site_counts WHERE site_id = $1 AND month = $2`, {
      bind: [site.id, month],
      type: QueryTypes.SELECT,
      transaction: t,
    });
    if (already) throw new AppError('conflict', `${site.name} is counted for this month already.`);
    const bins = await binsAtSite(site.id, scope.organisationId, t);
    const bySerial = new Map(bins.map((b) => [b.serial, b.grai]));
    const expected = bins.map((b) => b.grai);
    const confirmed: string[] = [];
    const problems: Array<{ path: string; message: string }> = [];
    for (const raw of input.counted) {
      const text = raw.trim();
      if (!text) continue;
      const listed = bySerial.get(text);
      if (listed) {
        confirmed.push(listed);
        continue;
      }
      const parsed = parseSerialisedGrai(text, { companyPrefixLength: settings.gs1PrefixLength });
      if (parsed.ok) confirmed.push(parsed.grai.value);
      else
        problems.push({
          path: 'counted',
          message: `“${text.slice(0, 40)}” is neither a bin of this site's list nor a GRAI: scan the label again or type the GRAI under the code.`,
        });
    }
    if (problems.length) throw new AppError('validation_failed', problems[0]!.message, problems);
    const comparison = compareCount(expected, confirmed);
    const status: CountStatus = comparison.disputed ? 'disputed' : 'agreed';
    const [count] = await sequelize.query<{ id: number }>(
      `INSERT INTO site_counts (organisation_id, site_id, month, method, expected_grais, confirmed_grais, status, counted_by, counted_at)
       VALUES ($1, $2, $3, $4, $5::text[], $6::text[], $7, $8, $9) RETURNING id`,
      {
        bind: [scope.organisationId, site.id, month, input.method, expected, [...comparison.matched, ...comparison.unexpected], status, scope.userId, now],
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    const lines = [...comparison.missing.map((g) => ({ grai: g, kind: 'missing' })), ...comparison.unexpected.map((g) => ({ grai: g, kind: 'unexpected' }))];
    if (lines.length) {
      await sequelize.query(
        `INSERT INTO site_count_lines (count_id, grai, kind, asset_id)
         SELECT $1, l.grai, l.kind, a.id FROM unnest($2::text[], $3::text[]) AS l(grai, kind) LEFT JOIN assets a ON a.grai = l.grai`,
        { bind: [count!.id, lines.map((l) => l.grai), lines.map((l) => l.kind)], transaction: t },
      );
    }
    return { id: count!.id, status, missing: comparison.missing.length, unexpected: comparison.unexpected.length };
  });
}
