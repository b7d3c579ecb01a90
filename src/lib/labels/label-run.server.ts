// Finds the bins a label run prints and records when their labels were
// printed. Selections are read and checked by src/lib/labels/label-selection.ts;
// here they become one parameterised query each.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { parseGrai } from '@/lib/gs1';
import { MAX_LABELS_PER_RUN, resolveRange, statusesFor, type InputIssue, type LabelSelection } from './label-selection';
import { getSettings } from '@/lib/settings/settings.server';

export interface LabelBin {
  id: number;
  grai: string;
  serial: string;
  status: string;
  binTypeCode: string;
  siteName: string | null;
  labelPrintedAt: Date | null;
}

export interface UnknownEntry {
  /** The entry as given (a pasted line or an id). */
  entry: string;
  reason: string;
}

export interface LabelRun {
  /** The bins, in label order; empty when the run is too long or the input is wrong. */
  bins: LabelBin[];
  /** How many bins the selection names (may exceed the limit). */
  total: number;
  tooMany: boolean;
  limit: number;
  /** Pasted entries or ids that name no bin, with the reason. */
  unknown: UnknownEntry[];
  /** Entries given twice (printed once). */
  duplicates: number;
  /** Input problems found only against the settings (e.g. a range end that is no serial). */
  issues: InputIssue[];
  /** A note about how the input was read, e.g. a range given high to low. */
  notes: string[];
}

const COLUMNS = `a.id, a.grai, a.serial, a.status, a.label_printed_at AS "labelPrintedAt",
                 bt.code AS "binTypeCode", s.name AS "siteName"`;
const FROM = `FROM assets a JOIN bin_types bt ON bt.id = a.bin_type_id LEFT JOIN sites s ON s.id = a.site_id`;
// Digit-only serials in numeric order first (so 99 comes before 100), then the rest in byte order.
const SERIAL_ORDER = `CASE WHEN a.serial ~ '^[0-9]+$' THEN lpad(a.serial, 16, '0') END NULLS LAST, a.serial COLLATE "C", a.grai`;

type Row = Omit<LabelBin, 'labelPrintedAt'> & { labelPrintedAt: Date | string | null };
const toBin = (r: Row): LabelBin => ({ ...r, labelPrintedAt: r.labelPrintedAt === null ? null : new Date(r.labelPrintedAt) });

function emptyRun(limit: number): LabelRun {
  return { bins: [], total: 0, tooMany: false, limit, unknown: [], duplicates: 0, issues: [], notes: [] };
}

/** WHERE clause and bind values for a range or a filter (the two query-shaped selections). */
async function whereFor(selection: Extract<LabelSelection, { by: 'range' | 'filter' }>, run: LabelRun): Promise<{ where: string[]; bind: unknown[] } | null> {
  const where: string[] = [];
  const bind: unknown[] = [];
  const param = (v: unknown) => {
    bind.push(v);
    return `$${bind.length}`;
  };
  if (selection.by === 'range') {
    const settings = await getSettings();
    const resolved = resolveRange(selection.from, selection.to, settings.gs1PrefixLength);
    if (!resolved.ok) {
      run.issues.push(...resolved.issues);
      return null;
    }
    const r = resolved.range;
    if (r.swapped) run.notes.push(`The range was given high to low; it runs from ${r.low} to ${r.high}.`);
    if (r.fixedPart) where.push(`left(a.grai, 14) = ${param(r.fixedPart)}`);
    if (r.numeric) {
      // CASE, not AND: PostgreSQL may evaluate a cast before the test that guards it.
      where.push(`(CASE WHEN a.serial ~ '^[0-9]+$' THEN a.serial::numeric END) BETWEEN ${param(r.low)}::numeric AND ${param(r.high)}::numeric`);
    } else {
      where.push(`a.serial COLLATE "C" BETWEEN ${param(r.low)} AND ${param(r.high)}`);
    }
    return { where, bind };
  }
  if (selection.siteId !== null) where.push(`a.site_id = ${param(selection.siteId)}`);
  if (selection.binTypeId !== null) where.push(`a.bin_type_id = ${param(selection.binTypeId)}`);
  const statuses = statusesFor(selection.status);
  if (statuses) where.push(`a.status = ANY(${param(statuses)}::text[])`);
  if (selection.neverPrinted) where.push('a.label_printed_at IS NULL');
  return { where, bind };
}

async function runQuery(selection: Extract<LabelSelection, { by: 'range' | 'filter' }>, limit: number): Promise<LabelRun> {
  const run = emptyRun(limit);
  const clause = await whereFor(selection, run);
  if (!clause) return run;
  const whereSql = clause.where.length ? `WHERE ${clause.where.join(' AND ')}` : '';
  const [counted] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM assets a ${whereSql}`, {
    bind: clause.bind,
    type: QueryTypes.SELECT,
  });
  run.total = counted?.n ?? 0;
  if (run.total > limit) {
    run.tooMany = true;
    return run;
  }
  const rows = await sequelize.query<Row>(`SELECT ${COLUMNS} ${FROM} ${whereSql} ORDER BY ${SERIAL_ORDER}`, {
    bind: clause.bind,
    type: QueryTypes.SELECT,
  });
  run.bins = rows.map(toBin);
  return run;
}

/** Bins by id, in the order given. */
async function runIds(ids: number[], limit: number): Promise<LabelRun> {
  const run = emptyRun(limit);
  run.total = ids.length;
  if (ids.length > limit) {
    run.tooMany = true;
    return run;
  }
  const rows = await sequelize.query<Row>(`SELECT ${COLUMNS} ${FROM} WHERE a.id = ANY($1::int[])`, {
    bind: [ids],
    type: QueryTypes.SELECT,
  });
  const byId = new Map(rows.map((r) => [r.id, r]));
  for (const id of ids) {
    const row = byId.get(id);
    if (row) run.bins.push(toBin(row));
    else run.unknown.push({ entry: String(id), reason: `No bin has id ${id}.` });
  }
  run.total = run.bins.length;
  return run;
}

/** Pasted GRAIs (any written form), in the order pasted; unreadable or unregistered ones are reported. */
async function runList(entries: string[], limit: number): Promise<LabelRun> {
  const run = emptyRun(limit);
  const settings = await getSettings();
  const wanted: string[] = [];
  const seen = new Set<string>();
  for (const entry of entries) {
    const parsed = parseGrai(entry, { companyPrefixLength: settings.gs1PrefixLength });
    if (!parsed.ok) {
      run.unknown.push({ entry, reason: parsed.error.message });
      continue;
    }
    if (seen.has(parsed.grai.value)) {
      run.duplicates += 1;
      continue;
    }
    seen.add(parsed.grai.value);
    wanted.push(parsed.grai.value);
  }
  if (wanted.length > limit) {
    run.total = wanted.length;
    run.tooMany = true;
    return run;
  }
  const rows = wanted.length ? await sequelize.query<Row>(`SELECT ${COLUMNS} ${FROM} WHERE a.grai = ANY($1::text[])`, { bind: [wanted], type: QueryTypes.SELECT }) : [];
  const byGrai = new Map(rows.map((r) => [r.grai, r]));
  for (const grai of wanted) {
    const row = byGrai.get(grai);
    if (row) run.bins.push(toBin(row));
    else run.unknown.push({ entry: grai, reason: `No bin with GRAI ${grai} is registered.` });
  }
  run.total = run.bins.length;
  return run;
}

/**
 * The bins a selection names, in label order: ranges and filters by serial,
 * id lists and pasted lists in the order given. A run longer than `limit`
 * comes back empty with `tooMany` and the count, so the page can say so.
 */
export async function selectLabelBins(selection: LabelSelection, opts: { limit?: number } = {}): Promise<LabelRun> {
  const limit = opts.limit ?? MAX_LABELS_PER_RUN;
  switch (selection.by) {
    case 'range':
    case 'filter':
      return runQuery(selection, limit);
    case 'ids':
      return runIds(selection.ids, limit);
    case 'list':
      return runList(selection.entries, limit);
  }
}

/**
 * Records that these bins' labels were printed (when the user confirms the
 * printout, never on viewing the sheet). Returns how many bins were marked
 * and the ids that name no bin.
 */
export async function markLabelsPrinted(ids: readonly number[], at: Date = new Date()): Promise<{ marked: number; missing: number[]; printedAt: Date }> {
  const unique = [...new Set(ids)];
  // A plain UPDATE that leaves `version` alone: the print date is no part of
  // the bin's state that scans lock against, so it must not make a yard's
  // concurrent scan fail as "changed meanwhile".
  if (unique.length === 0) return { marked: 0, missing: [], printedAt: at };
  const rows = await sequelize.query<{ id: number }>(`UPDATE assets SET label_printed_at = $2, updated_at = now() WHERE id = ANY($1::int[]) RETURNING id`, {
    bind: [unique, at],
    type: QueryTypes.SELECT,
  });
  const found = new Set(rows.map((r) => r.id));
  return { marked: found.size, missing: unique.filter((id) => !found.has(id)), printedAt: at };
}

export interface LabelFormChoices {
  sites: Array<{ id: number; name: string; code: string; kind: string }>;
  binTypes: Array<{ id: number; code: string; name: string }>;
}

/** What the selection form offers: active sites by kind and name, every bin type by code. */
export async function labelFormChoices(): Promise<LabelFormChoices> {
  const [sites, binTypes] = await Promise.all([
    sequelize.query<LabelFormChoices['sites'][number]>(`SELECT id, name, code, kind FROM sites WHERE active ORDER BY kind, name`, { type: QueryTypes.SELECT }),
    sequelize.query<LabelFormChoices['binTypes'][number]>(`SELECT id, code, name FROM bin_types ORDER BY code`, { type: QueryTypes.SELECT }),
  ]);
  return { sites, binTypes };
}
