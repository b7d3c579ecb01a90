// The monthly count, the planner's side: the counts customers sent, and each dispute resolved bin by bin with the
// pure rules of count-confirmation.ts (checkResolution, disputeStanding, disputeOutcome). A resolution is recorded on
// its line with who and when (and in the audit trail); "lost" marks the bin missing through the scan service (the one
// path by which a bin's state changes, so the missing rule's figures count it), and "found" for a bin marked missing
// that the customer saw at the site records it found there, the same way.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { recordScan } from '@/lib/scans/scan-service.server';
import { stableEventId } from '@/lib/scans/stable-event-id.server';
import type { Status } from '@/lib/scans/lifecycle';
import { checkResolution, disputeOutcome, disputeStanding, type DisputeLine, type Resolution } from './count-confirmation';
import type { CountStatus } from './site-counts.server';
import { addDays, type LocalDate } from '@/lib/calendar';
import { startOfLocalDay } from '@/lib/trips/bin-life.server';

export interface CountLossFigures {
  lost: number;
  found: number;
  moved: number;
  open: number;
}

export interface CountListRow {
  id: number;
  month: string;
  status: CountStatus;
  customer: string;
  site: string;
  countedAt: string;
  countedBy: string;
  expected: number;
  confirmed: number;
  outcome: Record<Resolution, number> & { open: number };
}

const LIST_FILTERS = { open: `c.status = 'disputed'`, all: 'TRUE' } as const;

export async function listCounts(filter: keyof typeof LIST_FILTERS = 'open', limit = 100): Promise<CountListRow[]> {
  const rows = await sequelize.query<Omit<CountListRow, 'outcome'> & { lines: DisputeLine[] | null }>(
    `SELECT c.id, c.month, c.status, o.name AS customer, s.name AS site, c.counted_at AS "countedAt", u.name AS "countedBy",
            cardinality(c.expected_grais) AS expected, cardinality(c.confirmed_grais) AS confirmed,
            (SELECT json_agg(json_build_object('grai', l.grai, 'kind', l.kind, 'resolution', l.resolution)) FROM site_count_lines l WHERE l.count_id = c.id) AS lines
       FROM site_counts c JOIN organisations o ON o.id = c.organisation_id JOIN sites s ON s.id = c.site_id JOIN users u ON u.id = c.counted_by
      WHERE ${LIST_FILTERS[filter]}
      ORDER BY (c.status = 'disputed') DESC, c.counted_at DESC, c.id DESC LIMIT $1`,
    { bind: [limit], type: QueryTypes.SELECT },
  );
  return rows.map(({ lines, ...r }) => ({ ...r, countedAt: new Date(r.countedAt).toISOString(), outcome: disputeOutcome(lines ?? []) }));
}

export interface DisputeLineView {
  id: number;
  grai: string;
  kind: DisputeLine['kind'];
  resolution: Resolution | null;
  movedToSiteId: number | null;
  movedTo: string | null;
  note: string | null;
  resolvedBy: string | null;
  resolvedAt: string | null;
  scanEventId: number | null;
  version: number;
  bin: { serial: string; status: Status; site: string | null; customer: string | null } | null;
}

export interface CountDispute {
  id: number;
  month: string;
  status: CountStatus;
  customer: string;
  siteId: number;
  site: string;
  countedAt: string;
  countedBy: string;
  method: 'ticked' | 'scanned';
  expected: number;
  confirmed: number;
  lines: DisputeLineView[];
  outcome: Record<Resolution, number> & { open: number };
}

export async function countDispute(id: number): Promise<CountDispute> {
  const [c] = await sequelize.query<Omit<CountDispute, 'lines' | 'outcome'>>(
    `SELECT c.id, c.month, c.status, o.name AS customer, c.site_id AS "siteId", s.name AS site, c.counted_at AS "countedAt", u.name AS "countedBy", c.method,
            cardinality(c.expected_grais) AS expected, cardinality(c.confirmed_grais) AS confirmed
       FROM site_counts c JOIN organisations o ON o.id = c.organisation_id JOIN sites s ON s.id = c.site_id JOIN users u ON u.id = c.counted_by
      WHERE c.id = $1`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  if (!c) throw new AppError('not_found', 'There is no such count.');
  const rows = await sequelize.query<Omit<DisputeLineView, 'bin'> & { serial: string | null; bin_status: Status | null; bin_site: string | null; bin_customer: string | null }>(
    `SELECT l.id, l.grai, l.kind, l.resolution, l.moved_to_site_id AS "movedToSiteId", ms.name AS "movedTo", l.note, ru.name AS "resolvedBy",
            l.resolved_at AS "resolvedAt", l.scan_event_id::int AS "scanEventId", l.version,
            a.serial, a.status AS bin_status, bs.name AS bin_site, bo.name AS bin_customer
       FROM site_count_lines l LEFT JOIN sites ms ON ms.id = l.moved_to_site_id LEFT JOIN users ru ON ru.id = l.resolved_by
       LEFT JOIN assets a ON a.id = l.asset_id LEFT JOIN sites bs ON bs.id = a.site_id LEFT JOIN organisations bo ON bo.id = a.customer_id
      WHERE l.count_id = $1 ORDER BY (l.resolution IS NULL) DESC, l.kind, l.grai`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  const lines: DisputeLineView[] = rows.map(({ serial, bin_status, bin_site, bin_customer, ...l }) => ({
    ...l,
    resolvedAt: l.resolvedAt ? new Date(l.resolvedAt).toISOString() : null,
    bin: serial ? { serial, status: bin_status!, site: bin_site, customer: bin_customer } : null,
  }));
  return { ...c, countedAt: new Date(c.countedAt).toISOString(), lines, outcome: disputeOutcome(lines) };
}

export interface Resolve {
  resolution: Resolution;
  movedToSiteId: number | null;
  note: string | null;
  version: number;
}

/**
 * Resolves one line of a dispute. The line is locked; a stale version is "changed meanwhile"; the pure rule checks
 * the resolution fits the line; "lost" (and "found" for a bin marked missing) goes through the scan service inside
 * the same transaction, so a refusal there records nothing here either. When no line is left open, the count is
 * resolved.
 */
export async function resolveLine(
  user: SessionUser,
  countId: number,
  lineId: number,
  input: Resolve,
  actor: AuditActor,
  now = new Date(),
): Promise<{ line: DisputeLineView; countStatus: CountStatus }> {
  await sequelize.transaction(async (t) => {
    const [line] = await sequelize.query<{
      id: number;
      kind: DisputeLine['kind'];
      grai: string;
      asset_id: number | null;
      resolution: Resolution | null;
      version: number;
      site_id: number;
      month: string;
      asset_status: Status | null;
    }>(
      `SELECT l.id, l.kind, l.grai, l.asset_id, l.resolution, l.version, c.site_id, c.month, a.status AS asset_status
         FROM site_count_lines l JOIN site_counts c ON c.id = l.count_id LEFT JOIN assets a ON a.id = l.asset_id
        WHERE l.id = $1 AND l.count_id = $2 FOR UPDATE OF l, c`,
      { bind: [lineId, countId], type: QueryTypes.SELECT, transaction: t },
    );
    if (!line) throw new AppError('not_found', 'There is no such line in this count.');
    if (line.version !== input.version) throw new AppError('changed_meanwhile', 'Someone resolved this bin meanwhile. Look at the count again.');
    if (line.resolution !== null) throw new AppError('conflict', 'This bin is resolved already; each resolution stands as recorded.');
    let movedTo: string | null = null;
    if (input.movedToSiteId !== null) {
      const [site] = await sequelize.query<{ name: string }>('SELECT name FROM sites WHERE id = $1 AND active', {
        bind: [input.movedToSiteId],
        type: QueryTypes.SELECT,
        transaction: t,
      });
      if (!site) throw new AppError('validation_failed', 'Choose the site the bin was moved to from the list.', [{ path: 'movedToSiteId', message: 'No such site.' }]);
      movedTo = site.name;
    }
    const check = checkResolution(line, input.resolution, movedTo);
    if (!check.ok) throw new AppError('unprocessable', check.reason, [{ path: input.resolution === 'moved' ? 'movedToSiteId' : 'resolution', message: check.reason }]);

    let scanEventId: number | null = null;
    const where = `${line.month} count at site ${line.site_id}`;
    if (input.resolution === 'lost' && line.asset_id !== null) {
      const out = await recordScan(
        user,
        { clientEventId: stableEventId(`count-line:${line.id}:lost`), assetId: line.asset_id, action: 'mark_missing', siteId: null, occurredAt: now, note: `Lost: ${where}` },
        { now, transaction: t },
      );
      scanEventId = out.eventId;
    }
    if (input.resolution === 'found' && line.kind === 'unexpected' && line.asset_id !== null && line.asset_status === 'missing') {
      const out = await recordScan(
        user,
        {
          clientEventId: stableEventId(`count-line:${line.id}:found`),
          assetId: line.asset_id,
          action: 'mark_found',
          siteId: line.site_id,
          occurredAt: now,
          note: `Found: ${where}`,
        },
        { now, transaction: t },
      );
      scanEventId = out.eventId;
    }
    await sequelize.query(
      `UPDATE site_count_lines SET resolution = $2, moved_to_site_id = $3, note = $4, scan_event_id = $5, resolved_by = $6, resolved_at = $7, version = version + 1
        WHERE id = $1`,
      { bind: [line.id, input.resolution, input.movedToSiteId, input.note, scanEventId, user.id, now], transaction: t },
    );
    const open = await sequelize.query<{ grai: string; kind: DisputeLine['kind']; resolution: Resolution | null }>(
      'SELECT grai, kind, resolution FROM site_count_lines WHERE count_id = $1',
      { bind: [countId], type: QueryTypes.SELECT, transaction: t },
    );
    if (disputeStanding(open) === 'resolved') {
      await sequelize.query(`UPDATE site_counts SET status = 'resolved', resolved_at = $2, version = version + 1 WHERE id = $1`, { bind: [countId, now], transaction: t });
    }
    await recordAudit(
      {
        actor,
        action: 'count.resolve',
        entityType: 'site_count_line',
        entityId: line.id,
        after: { countId, grai: line.grai, kind: line.kind, resolution: input.resolution, movedTo, note: input.note, scanEventId },
      },
      { transaction: t },
    );
  });
  const dispute = await countDispute(countId);
  return { line: dispute.lines.find((l) => l.id === lineId)!, countStatus: dispute.status };
}

/**
 * The counts' share of the loss-control figures in a window: bins declared lost at a monthly count (their
 * mark_missing scans are already among the shrinkage's declarations), bins found at a count, and the bins still
 * in open disputes.
 */
export async function countLossFigures(window: { from: LocalDate; to: LocalDate }, timeZone: string): Promise<CountLossFigures> {
  const inWindow = `l.resolved_at >= ${startOfLocalDay('$2', '$1')} AND l.resolved_at < ${startOfLocalDay('$3', '$1')}`;
  const [row] = await sequelize.query<CountLossFigures>(
    `SELECT count(*) FILTER (WHERE l.resolution = 'lost' AND ${inWindow}
                              AND EXISTS (SELECT 1 FROM scan_events e WHERE e.id = l.scan_event_id AND e.voided_at IS NULL))::int AS lost,
            count(*) FILTER (WHERE l.resolution = 'found' AND ${inWindow})::int AS found,
            count(*) FILTER (WHERE l.resolution = 'moved' AND ${inWindow})::int AS moved,
            count(*) FILTER (WHERE l.resolution IS NULL)::int AS open
       FROM site_count_lines l`,
    { bind: [timeZone, window.from, addDays(window.to, 1)], type: QueryTypes.SELECT },
  );
  return row ?? { lost: 0, found: 0, moved: 0, open: 0 };
}

/** Sites a moved bin may have gone to: every active site, depots first. */
export async function movedToChoices(): Promise<Array<{ id: number; name: string; kind: string }>> {
  return sequelize.query(`SELECT id, name, kind FROM sites WHERE active ORDER BY (kind = 'depot') DESC, name`, { type: QueryTypes.SELECT });
}
