// Inspection records: recording one at the test bench (through the scan service and the rule table, so the
// bin's state and due dates follow its log), amending one with a reason (never editing), and reading them
// for the bin page and the printable record. The rules are pure: inspection-due.ts (which clocks restart),
// inspection-form.ts (what a record must hold).
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { localDate, type LocalDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { recordScan, type Actor, type ScanOutcome } from '@/lib/scans/scan-service.server';
import { policyForBinType } from '@/lib/bins/bin-policy';
import type { TestOutcome } from './inspection-due';
import { scheduleAfterTest } from './schedule-after';
import { repairEffectsOfInspection } from './repair-hooks.server';
import { inspectionProblems, initialsOf, testMark, type InspectionDraft, type PeriodicKind } from './inspection-form';

export interface RecordInspectionInput extends InspectionDraft {
  clientEventId: string;
  assetId: number;
  siteId?: number | null;
  expectedVersion?: number;
  photoIds?: number[];
}

export interface RecordedInspection {
  inspectionId: number;
  scan: ScanOutcome;
  /** The due dates after it; unchanged ones when it restarted nothing. */
  nextIntermediateDue: string | null;
  nextFullDue: string | null;
  nextDue: string | null;
  restarted: { intermediate: boolean; full: boolean };
  testMark: string | null;
  /** The repair order a failure opened (or the one already open), or the one a passed test after repair closed. */
  repairOrderId?: number | null;
  repairClosed?: boolean;
}

interface BinRow {
  id: number;
  manufacture_month: string;
  last_inspection_on: string | null;
  last_leak_test_on: string | null;
  last_full_inspection_on: string | null;
  next_intermediate_due: string | null;
  next_full_due: string | null;
  next_due: string | null;
  policy_kind: 'un' | 'own';
  intermediate_months: number;
  full_months: number;
}

const invalid = (problems: Array<{ field: string; message: string }>) =>
  new AppError(
    'validation_failed',
    problems[0]!.message,
    problems.map((p) => ({ path: p.field, message: p.message })),
  );

/** The inspector named on the record must be a qualified, active user of the operator; returns the mark they apply. */
async function inspectorMark(draft: Pick<InspectionDraft, 'inspectorId' | 'inspectionBody'>, t: Transaction): Promise<string> {
  if (draft.inspectorId === null) return draft.inspectionBody!.trim();
  const [u] = await sequelize.query<{ name: string; qualified_inspector: boolean; active: boolean; role: string }>(
    'SELECT name, qualified_inspector, active, role FROM users WHERE id = $1',
    { bind: [draft.inspectorId], type: QueryTypes.SELECT, transaction: t },
  );
  if (!u || !u.active || u.role === 'customer' || !u.qualified_inspector) {
    throw invalid([{ field: 'inspector', message: 'That person is not flagged as a qualified inspector; choose one who is, or name the outside inspection body.' }]);
  }
  return initialsOf(u.name);
}

/** The schedule a passed test sets (schedule-after.ts), from the bin's columns. */
function scheduleAfter(bin: BinRow, draft: InspectionDraft) {
  return scheduleAfterTest(
    { manufactureMonth: bin.manufacture_month, lastInspectionOn: bin.last_inspection_on, lastLeakTestOn: bin.last_leak_test_on, lastFullInspectionOn: bin.last_full_inspection_on },
    { kind: draft.kind, outcome: draft.outcome, leakTest: draft.leakTest, performedOn: draft.performedOn },
    policyForBinType({ policyKind: bin.policy_kind, intermediateMonths: bin.intermediate_months, fullMonths: bin.full_months }),
  );
}

/**
 * Records an inspection: checks the draft and the inspector, works out the schedule a pass sets, records the
 * `inspect` scan (the rule table decides the bin's status; the log keeps the patch), then the record itself.
 * All in one transaction: a refusal anywhere leaves no trace.
 */
export async function recordInspection(
  actor: Actor & { id: number },
  input: RecordInspectionInput,
  opts: { now?: Date; transaction?: Transaction } = {},
): Promise<RecordedInspection> {
  const now = opts.now ?? new Date();
  const settings = await getSettings();
  const today = localDate(now, settings.timeZone);
  const run = async (t: Transaction): Promise<RecordedInspection> => {
    const [bin] = await sequelize.query<BinRow>(
      `SELECT a.id, a.manufacture_month::text, a.last_inspection_on::text, a.last_leak_test_on::text, a.last_full_inspection_on::text,
              a.next_intermediate_due::text, a.next_full_due::text, a.next_due::text, bt.policy_kind, bt.intermediate_months, bt.full_months
         FROM assets a JOIN bin_types bt ON bt.id = a.bin_type_id WHERE a.id = $1`,
      { bind: [input.assetId], type: QueryTypes.SELECT, transaction: t },
    );
    if (!bin) throw new AppError('not_found', 'No bin with that identity is registered.');
    const problems = inspectionProblems(input, today, bin.manufacture_month.slice(0, 7));
    if (problems.length) throw invalid(problems);
    const mark = await inspectorMark(input, t);
    const { schedule, restarted } = scheduleAfter(bin, input);
    const scan = await recordScan(
      actor,
      {
        clientEventId: input.clientEventId,
        assetId: bin.id,
        action: 'inspect',
        siteId: input.siteId,
        expectedVersion: input.expectedVersion,
        photoIds: input.photoIds?.length ? input.photoIds : undefined,
        occurredAt: now,
        inspection: { kind: input.kind, outcome: input.outcome, leakTest: input.leakTest },
        inspectionResult: { kind: input.kind, outcome: input.outcome, scheduleAfter: schedule },
      },
      { now, transaction: t },
    );
    if (scan.replayed) {
      const [again] = await sequelize.query<{ id: number }>('SELECT id FROM inspections WHERE scan_event_id = $1 AND amends_id IS NULL', {
        bind: [scan.eventId],
        type: QueryTypes.SELECT,
        transaction: t,
      });
      if (again) return { ...(await recordedOf(again.id, t)), scan };
    }
    const dues = schedule ?? { nextIntermediateDue: bin.next_intermediate_due, nextFullDue: bin.next_full_due, nextDue: bin.next_due };
    const markText = input.outcome === 'pass' && schedule ? testMark(input.performedOn, mark) : null;
    const [row] = await sequelize.query<{ id: number; site_id: number | null }>(
      `INSERT INTO inspections (asset_id, kind, performed_on, inspector_id, inspection_body, site_id, checklist, leak_test_pressure_kpa, leak_test_minutes,
                                leak_test_passed, outcome, next_intermediate_due, next_full_due, photo_ids, notes, scan_event_id, recorded_by, test_mark)
       VALUES ($1, $2, $3, $4, $5, (SELECT site_id FROM scan_events WHERE id = $16), $6, $7, $8, $9, $10, $11, $12, $13, $14, $16, $15, $17) RETURNING id, site_id`,
      {
        bind: [
          bin.id,
          input.kind,
          input.performedOn,
          input.inspectorId,
          input.inspectionBody?.trim() || null,
          JSON.stringify(input.checklist),
          input.leakTest?.pressureKpa ?? null,
          input.leakTest?.minutes ?? null,
          input.leakTest?.passed ?? null,
          input.outcome,
          dues.nextIntermediateDue,
          dues.nextFullDue,
          input.photoIds ?? [],
          input.remarks?.trim() || null,
          actor.id,
          scan.eventId,
          markText,
        ],
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    const repair = await repairEffectsOfInspection(
      { assetId: bin.id, inspectionId: row!.id, kind: input.kind, outcome: input.outcome, remarks: input.remarks?.trim() || null, siteId: row!.site_id, actorId: actor.id },
      t,
    );
    return {
      inspectionId: row!.id,
      scan,
      nextIntermediateDue: dues.nextIntermediateDue,
      nextFullDue: dues.nextFullDue,
      nextDue: dues.nextDue,
      restarted,
      testMark: markText,
      ...repair,
    };
  };
  return opts.transaction ? sequelize.transaction({ transaction: opts.transaction }, run) : sequelize.transaction(run);
}

async function recordedOf(id: number, t: Transaction): Promise<Omit<RecordedInspection, 'scan'>> {
  const r = (await inspectionById(id, t))!;
  return {
    inspectionId: id,
    nextIntermediateDue: r.nextIntermediateDue,
    nextFullDue: r.nextFullDue,
    nextDue: null,
    restarted: { intermediate: false, full: false },
    testMark: r.testMark,
  };
}

export interface InspectionRecord {
  id: number;
  assetId: number;
  grai: string;
  serial: string;
  unMarking: string | null;
  binTypeName: string;
  kind: PeriodicKind | 'prep_check';
  performedOn: LocalDate;
  inspectorName: string | null;
  inspectionBody: string | null;
  recordedByName: string | null;
  siteName: string | null;
  checklist: Record<string, boolean>;
  leakTest: { pressureKpa: number; minutes: number; passed: boolean } | null;
  outcome: TestOutcome;
  nextIntermediateDue: string | null;
  nextFullDue: string | null;
  photoIds: number[];
  remarks: string | null;
  testMark: string | null;
  createdAt: Date;
  /** The corrections, oldest first; the last one is what the record now says. */
  amendments: Array<{ id: number; reason: string; createdAt: Date; recordedByName: string | null }>;
  amendsId: number | null;
  amendmentReason: string | null;
}

const RECORD_SQL = `
  SELECT i.id, i.asset_id, a.grai, a.serial, a.un_marking, bt.name AS bin_type_name, i.kind, i.performed_on::text, iu.name AS inspector_name,
         i.inspection_body, ru.name AS recorded_by_name, s.name AS site_name, i.checklist, i.leak_test_pressure_kpa, i.leak_test_minutes,
         i.leak_test_passed, i.outcome, i.next_intermediate_due::text, i.next_full_due::text, i.photo_ids, i.notes, i.test_mark, i.created_at,
         i.amends_id, i.amendment_reason
    FROM inspections i JOIN assets a ON a.id = i.asset_id JOIN bin_types bt ON bt.id = a.bin_type_id
    LEFT JOIN users iu ON iu.id = i.inspector_id LEFT JOIN users ru ON ru.id = i.recorded_by LEFT JOIN sites s ON s.id = i.site_id`;

type RecordRow = {
  id: number;
  asset_id: number;
  grai: string;
  serial: string;
  un_marking: string | null;
  bin_type_name: string;
  kind: InspectionRecord['kind'];
  performed_on: string;
  inspector_name: string | null;
  inspection_body: string | null;
  recorded_by_name: string | null;
  site_name: string | null;
  checklist: Record<string, boolean>;
  leak_test_pressure_kpa: string | null;
  leak_test_minutes: string | null;
  leak_test_passed: boolean | null;
  outcome: TestOutcome;
  next_intermediate_due: string | null;
  next_full_due: string | null;
  photo_ids: number[];
  notes: string | null;
  test_mark: string | null;
  created_at: Date;
  amends_id: number | null;
  amendment_reason: string | null;
};

function recordOf(r: RecordRow, amendments: InspectionRecord['amendments']): InspectionRecord {
  return {
    id: r.id,
    assetId: r.asset_id,
    grai: r.grai,
    serial: r.serial,
    unMarking: r.un_marking,
    binTypeName: r.bin_type_name,
    kind: r.kind,
    performedOn: r.performed_on,
    inspectorName: r.inspector_name,
    inspectionBody: r.inspection_body,
    recordedByName: r.recorded_by_name,
    siteName: r.site_name,
    checklist: r.checklist,
    leakTest:
      r.leak_test_pressure_kpa === null ? null : { pressureKpa: Number(r.leak_test_pressure_kpa), minutes: Number(r.leak_test_minutes), passed: Boolean(r.leak_test_passed) },
    outcome: r.outcome,
    nextIntermediateDue: r.next_intermediate_due,
    nextFullDue: r.next_full_due,
    photoIds: r.photo_ids,
    remarks: r.notes,
    testMark: r.test_mark,
    createdAt: r.created_at,
    amendments,
    amendsId: r.amends_id,
    amendmentReason: r.amendment_reason,
  };
}

/** One record as it now reads: the original with its latest amendment's content, and the list of amendments. */
export async function inspectionById(id: number, t?: Transaction): Promise<InspectionRecord | null> {
  const [orig] = await sequelize.query<RecordRow>(`${RECORD_SQL} WHERE i.id = $1`, { bind: [id], type: QueryTypes.SELECT, transaction: t });
  if (!orig) return null;
  if (orig.amends_id !== null) return inspectionById(orig.amends_id, t); // always shown from the original
  const amendments = await sequelize.query<RecordRow>(`${RECORD_SQL} WHERE i.amends_id = $1 ORDER BY i.id`, { bind: [id], type: QueryTypes.SELECT, transaction: t });
  const latest = amendments.at(-1);
  const current = latest ? { ...latest, id: orig.id, amends_id: null, amendment_reason: null, created_at: orig.created_at } : orig;
  return recordOf(
    current,
    amendments.map((a) => ({ id: a.id, reason: a.amendment_reason!, createdAt: a.created_at, recordedByName: a.recorded_by_name })),
  );
}

/** A bin's periodic inspection records, newest first, as they now read. */
export async function inspectionsOfBin(assetId: number): Promise<InspectionRecord[]> {
  const ids = await sequelize.query<{ id: number }>(
    `SELECT id FROM inspections WHERE asset_id = $1 AND amends_id IS NULL AND kind <> 'prep_check' ORDER BY performed_on DESC, id DESC LIMIT 50`,
    { bind: [assetId], type: QueryTypes.SELECT },
  );
  const out: InspectionRecord[] = [];
  for (const { id } of ids) out.push((await inspectionById(id))!);
  return out;
}

export interface AmendInput {
  reason: string;
  checklist?: Record<string, boolean>;
  leakTest?: { pressureKpa: number; minutes: number; passed: boolean } | null;
  inspectorId?: number | null;
  inspectionBody?: string | null;
  remarks?: string | null;
}

/**
 * A correction: a new record pointing at the original, with the reason. Kind, day and outcome stay as they
 * were (they decided the bin's state and due dates: a wrong one is voided as a scan and recorded again), and
 * so does whether the leakproofness test passed; what the amended record says must still be a valid record.
 */
export async function amendInspection(actor: { id: number }, id: number, input: AmendInput, opts: { now?: Date } = {}): Promise<InspectionRecord> {
  const reason = input.reason.trim();
  if (reason.length < 5) throw invalid([{ field: 'reason', message: 'Say why the record is corrected (at least a few words).' }]);
  const settings = await getSettings();
  const today = localDate(opts.now ?? new Date(), settings.timeZone);
  return sequelize.transaction(async (t) => {
    const current = await inspectionById(id, t);
    if (!current || current.kind === 'prep_check') throw new AppError('not_found', 'No such inspection record.');
    await sequelize.query('SELECT id FROM inspections WHERE id = $1 FOR UPDATE', { bind: [current.id], transaction: t });
    const [ids] = await sequelize.query<{ inspector_id: number | null; site_id: number | null; scan_event_id: number | null }>(
      `SELECT inspector_id, site_id, scan_event_id FROM inspections WHERE id = $1`,
      { bind: [current.amendments.at(-1)?.id ?? current.id], type: QueryTypes.SELECT, transaction: t },
    );
    const next: InspectionDraft = {
      kind: current.kind,
      performedOn: current.performedOn,
      outcome: current.outcome,
      checklist: input.checklist ?? current.checklist,
      leakTest: input.leakTest === undefined ? current.leakTest : input.leakTest,
      inspectorId: input.inspectorId === undefined ? (ids?.inspector_id ?? null) : input.inspectorId,
      inspectionBody: input.inspectionBody === undefined ? current.inspectionBody : input.inspectionBody,
      remarks: input.remarks === undefined ? current.remarks : input.remarks,
    };
    if (input.inspectionBody && input.inspectorId === undefined) next.inspectorId = null;
    if (input.inspectorId && input.inspectionBody === undefined) next.inspectionBody = null;
    const problems = inspectionProblems(next, today);
    if ((current.leakTest?.passed ?? null) !== (next.leakTest?.passed ?? null)) {
      problems.push({ field: 'leakTest', message: 'Whether the leakproofness test was done and passed decided the due dates; void the inspection and record it again instead.' });
    }
    if (problems.length) throw invalid(problems);
    await inspectorMark(next, t);
    await sequelize.query(
      `INSERT INTO inspections (asset_id, kind, performed_on, inspector_id, inspection_body, site_id, checklist, leak_test_pressure_kpa, leak_test_minutes,
                                leak_test_passed, outcome, next_intermediate_due, next_full_due, photo_ids, notes, scan_event_id, recorded_by, test_mark, amends_id, amendment_reason)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16, $17, $18, $19, $20)`,
      {
        bind: [
          current.assetId,
          current.kind,
          current.performedOn,
          next.inspectorId,
          next.inspectionBody?.trim() || null,
          ids?.site_id ?? null,
          JSON.stringify(next.checklist),
          next.leakTest?.pressureKpa ?? null,
          next.leakTest?.minutes ?? null,
          next.leakTest?.passed ?? null,
          current.outcome,
          current.nextIntermediateDue,
          current.nextFullDue,
          current.photoIds,
          next.remarks?.trim() || null,
          ids?.scan_event_id ?? null,
          actor.id,
          current.testMark,
          current.id,
          reason,
        ],
        transaction: t,
      },
    );
    return (await inspectionById(current.id, t))!;
  });
}

/** The qualified inspectors a form offers (active users flagged as such). */
export async function qualifiedInspectors(): Promise<Array<{ id: number; name: string }>> {
  return sequelize.query<{ id: number; name: string }>(`SELECT id, name FROM users WHERE qualified_inspector AND active AND role <> 'customer' ORDER BY name`, {
    type: QueryTypes.SELECT,
  });
}
