// Reading statements back: the month overview for the operator (issued ones as issued, the rest as drafts by the
// same rule), one statement with its lines, and a customer's own list. A customer sees only their organisation's
// statements, and only a user not limited to some sites (statements are the whole organisation's money).
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import type { LocalDate } from '@/lib/calendar';
import type { BillingPeriod, LineKind, StatementLine } from './hire-billing';
import { draftStatement } from './statements.server';
import type { StatementSummary } from './statement-csv';
import { customerScopeSql } from './statement-scope.server';

export interface StatementHead extends StatementSummary {
  rounding: string;
  issuedAt: Date;
  issuedBy: string | null;
  lineCount: number;
}

export interface StatementView extends StatementHead {
  lines: Array<StatementLine & { position: number; adjustsStatementId: number | null }>;
}

/** Who asks: the operator's staff see every customer; a customer only their own organisation. */
export type StatementScope = { kind: 'operator' } | { kind: 'customer'; organisationId: number; siteIds: number[] | null };

const HEAD_SQL = `SELECT s.id, s.customer_id AS "customerId", o.name AS customer, to_char(s.period_from, 'YYYY-MM-DD') AS "from", to_char(s.period_to, 'YYYY-MM-DD') AS "to",
       s.currency, s.net_minor AS "netMinor", s.tax_minor AS "taxMinor", s.gross_minor AS "grossMinor", s.tax_note AS "taxNote", s.rounding,
       s.customer_vat_id AS "customerVatId", s.issued_at AS "issuedAt", u.name AS "issuedBy",
       (SELECT count(*)::int FROM statement_lines l WHERE l.statement_id = s.id) AS "lineCount"
  FROM statements s JOIN organisations o ON o.id = s.customer_id LEFT JOIN users u ON u.id = s.issued_by`;

type HeadRow = Omit<StatementHead, 'period' | 'netMinor' | 'taxMinor' | 'grossMinor'> & { from: LocalDate; to: LocalDate; netMinor: string; taxMinor: string; grossMinor: string };

function head(r: HeadRow): StatementHead {
  const { from, to, ...rest } = r;
  return { ...rest, period: { from, to }, netMinor: Number(r.netMinor), taxMinor: Number(r.taxMinor), grossMinor: Number(r.grossMinor) };
}

export async function listStatements(scope: StatementScope, filter: { customerId?: number } = {}): Promise<StatementHead[]> {
  const where = customerScopeSql(scope, 's.customer_id', 1);
  const bind = [...where.bind];
  let extra = '';
  if (filter.customerId !== undefined) {
    bind.push(filter.customerId);
    extra = ` AND s.customer_id = $${bind.length}`;
  }
  const rows = await sequelize.query<HeadRow>(`${HEAD_SQL} WHERE ${where.sql}${extra} ORDER BY s.period_from DESC, o.name LIMIT 500`, { bind, type: QueryTypes.SELECT });
  return rows.map(head);
}

interface LineRow {
  position: number;
  kind: LineKind;
  bin_label: string | null;
  trip_id: number | null;
  reference: string | null;
  from_on: LocalDate;
  to_on: LocalDate;
  trip_day_first: number | null;
  trip_day_last: number | null;
  quantity: number;
  unit_minor: string;
  amount_minor: string;
  estimated: boolean;
  photo_ids: number[];
  text: string;
  adjusts_statement_id: number | null;
}

/** One statement with its lines; "no such statement" alike for another organisation's and a missing one. */
export async function statementView(id: number, scope: StatementScope): Promise<StatementView> {
  const where = customerScopeSql(scope, 's.customer_id', 2);
  const [row] = await sequelize.query<HeadRow>(`${HEAD_SQL} WHERE s.id = $1 AND ${where.sql}`, { bind: [id, ...where.bind], type: QueryTypes.SELECT });
  if (!row) throw new AppError('not_found', 'There is no such statement.');
  const lines = await sequelize.query<LineRow>(
    `SELECT position, kind, bin_label, trip_id, reference, to_char(from_on, 'YYYY-MM-DD') AS from_on, to_char(to_on, 'YYYY-MM-DD') AS to_on,
            trip_day_first, trip_day_last, quantity, unit_minor, amount_minor, estimated, photo_ids, text, adjusts_statement_id
       FROM statement_lines WHERE statement_id = $1 ORDER BY position`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  return {
    ...head(row),
    lines: lines.map((l) => ({
      position: l.position,
      kind: l.kind,
      binId: l.bin_label,
      tripId: l.trip_id === null ? null : String(l.trip_id),
      reference: l.reference,
      from: l.from_on,
      to: l.to_on,
      tripDays: l.trip_day_first === null || l.trip_day_last === null ? null : { first: l.trip_day_first, last: l.trip_day_last },
      quantity: l.quantity,
      unitMinor: Number(l.unit_minor),
      amountMinor: Number(l.amount_minor),
      estimated: l.estimated,
      photoIds: l.photo_ids.map(String),
      text: l.text,
      adjustsStatementId: l.adjusts_statement_id,
    })),
  };
}

export interface MonthRow {
  customerId: number;
  customer: string;
  /** The issued statement, when there is one. */
  issued: StatementHead | null;
  /** What issuing now would give (null when issued, or when the month cannot be priced: then `problem`). */
  draft: { lines: number; currency: string; netMinor: number; grossMinor: number; corrections: number } | null;
  problem: string | null;
}

/** Every active customer for one month: issued, or the draft the same rule gives now. */
export async function monthOverview(period: BillingPeriod): Promise<MonthRow[]> {
  const customers = await sequelize.query<{ id: number; name: string }>(`SELECT id, name FROM organisations WHERE kind = 'customer' AND active ORDER BY name`, {
    type: QueryTypes.SELECT,
  });
  const issued = new Map(
    (await sequelize.query<HeadRow>(`${HEAD_SQL} WHERE s.period_from = $1::date`, { bind: [period.from], type: QueryTypes.SELECT })).map((r) => [r.customerId, head(r)]),
  );
  const rows: MonthRow[] = [];
  for (const c of customers) {
    const done = issued.get(c.id) ?? null;
    if (done) {
      rows.push({ customerId: c.id, customer: c.name, issued: done, draft: null, problem: null });
      continue;
    }
    try {
      const d = await draftStatement(c.id, period);
      const t = d.statement.totals;
      rows.push({
        customerId: c.id,
        customer: c.name,
        issued: null,
        draft: { lines: d.statement.lines.length, currency: t.currency, netMinor: t.netMinor, grossMinor: t.grossMinor, corrections: d.corrections.length },
        problem: null,
      });
    } catch (err) {
      if (!(err instanceof AppError)) throw err;
      rows.push({ customerId: c.id, customer: c.name, issued: null, draft: null, problem: err.message });
    }
  }
  return rows;
}
