// Putting bins into the pool: one at a time from the form, many from a CSV
// import (all or nothing), or from the demo generator. Every registration is
// also the bin's first entry in the scan log.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize, Asset, BinType, Site, ScanEvent } from '@/models';
import { AppError } from '@/lib/api-errors';
import { nextDue } from '@/lib/inspections/inspection-due';
import { checkRegistration, innerMadeMonthFor, testColumns, type RegisterBinInput } from './registration-check';
import { policyForBinType } from './bin-policy';
import { getSettings } from '@/lib/settings/settings.server';
import type { Actor } from '@/lib/scans/scan-service.server';

// The checks themselves are pure (shared with the CSV import and the forms).
export { checkRegistration, type RegisterBinInput, type RegisterIssue } from './registration-check';

/** The new bin's row: status available at the depot, due dates from its bin type's policy (also used by the demo generator). */
export function newAssetRow(checked: { grai: string; serial: string; manufactureMonth: string }, input: RegisterBinInput, type: BinType, siteId: number, now: Date) {
  const due = nextDue(
    { manufactureMonth: checked.manufactureMonth, lastIntermediateTestMonth: input.lastIntermediateTestMonth, lastFullInspectionMonth: input.lastFullInspectionMonth },
    policyForBinType(type),
  );
  return {
    grai: checked.grai,
    serial: checked.serial,
    binTypeId: type.id,
    manufactureMonth: `${checked.manufactureMonth}-01`,
    unMarking: input.unMarking?.trim() || null,
    innerMadeMonth: ((m) => (m ? `${m}-01` : null))(innerMadeMonthFor(input.innerMadeMonth, checked.manufactureMonth, type.serviceLifeApplies)),
    status: 'available' as const,
    siteId,
    siteSince: now,
    customerId: null,
    currentTripId: null,
    leg: null,
    linerLotId: null,
    lastScanAt: now,
    ...testColumns(input.lastIntermediateTestMonth, input.lastFullInspectionMonth),
    nextIntermediateDue: due.intermediateDue,
    nextFullDue: due.fullDue,
    nextDue: due.nextDue,
    labelPrintedAt: null,
  };
}

/** The bin's first entry in the scan log. */
export function registerEventRow(assetId: number, siteId: number, actor: Actor, now: Date) {
  return {
    assetId,
    action: 'register' as const,
    occurredAt: now,
    siteId,
    userId: actor.id,
    clientEventId: null,
    statusFrom: null,
    statusTo: 'available' as const,
    tripId: null,
    voidedAt: null,
    voidedBy: null,
    voidReason: null,
    payload: { patch: { status: 'available', siteId: String(siteId), siteKind: 'depot' }, trip: 'none' },
  };
}

export function checkedOrThrow(input: RegisterBinInput, prefixLength: number) {
  const checked = checkRegistration(input, prefixLength);
  if (checked.issues.length) throw new AppError('validation_failed', checked.issues[0]!.message, checked.issues);
  return checked as { grai: string; serial: string; manufactureMonth: string };
}

export async function registerBin(actor: Actor, input: RegisterBinInput, opts: { now?: Date; transaction?: Transaction } = {}): Promise<Asset> {
  const settings = await getSettings();
  const checked = checkedOrThrow(input, settings.gs1PrefixLength);
  const now = opts.now ?? new Date();

  const work = async (t: Transaction) => {
    // One query at a time: a transaction has one connection (pg warns about overlapping queries).
    const type = await BinType.findByPk(input.binTypeId, { transaction: t });
    const site = await Site.findByPk(input.siteId, { transaction: t });
    if (!type) throw new AppError('unprocessable', 'That bin type does not exist.', [{ field: 'binTypeId', message: 'Unknown bin type.' }]);
    if (!site || site.kind !== 'depot') throw new AppError('unprocessable', 'Bins are registered at a depot.', [{ field: 'siteId', message: 'Choose a depot.' }]);
    if (await Asset.findOne({ where: { grai: checked.grai }, transaction: t, attributes: ['id'] })) {
      throw new AppError('duplicate', `A bin with GRAI ${checked.grai} is already registered.`, [{ field: 'grai', message: 'Already registered.' }]);
    }
    const asset = await Asset.create(newAssetRow(checked, input, type, site.id, now), { transaction: t });
    await ScanEvent.create(registerEventRow(asset.id, site.id, actor, now), { transaction: t });
    return asset;
  };
  return opts.transaction ? sequelize.transaction({ transaction: opts.transaction }, work) : sequelize.transaction(work);
}

const BULK_CHUNK = 1000;

/**
 * One multi-row insert of bins and one of their register events, each a
 * single statement over arrays (unnest): model-by-model inserts cost about
 * half a millisecond per bin, which a 50,000-bin import cannot afford.
 */
async function insertChunk(rows: Array<ReturnType<typeof newAssetRow>>, actor: Actor, now: Date, t: Transaction) {
  const col = <K extends keyof (typeof rows)[number]>(key: K) => rows.map((r) => r[key]);
  const inserted = await sequelize.query<{ id: number; grai: string; site_id: number }>(
    `INSERT INTO assets (grai, serial, bin_type_id, manufacture_month, un_marking, status, site_id, site_since, last_scan_at,
                         last_inspection_on, last_full_inspection_on, next_intermediate_due, next_full_due, next_due, last_leak_test_on)
     SELECT r.grai, r.serial, r.bin_type_id, r.manufacture_month, r.un_marking, 'available', r.site_id, $12, $12,
            r.last_inspection_on, r.last_full_inspection_on, r.next_intermediate_due, r.next_full_due, r.next_due, r.last_leak_test_on
       FROM unnest($1::text[], $2::text[], $3::int[], $4::date[], $5::text[], $6::int[], $7::date[], $8::date[], $9::date[], $10::date[], $11::date[], $13::date[])
            AS r(grai, serial, bin_type_id, manufacture_month, un_marking, site_id, last_inspection_on, last_full_inspection_on,
                 next_intermediate_due, next_full_due, next_due, last_leak_test_on)
     RETURNING id, grai, site_id`,
    {
      bind: [
        col('grai'),
        col('serial'),
        col('binTypeId'),
        col('manufactureMonth'),
        col('unMarking'),
        col('siteId'),
        col('lastInspectionOn'),
        col('lastFullInspectionOn'),
        col('nextIntermediateDue'),
        col('nextFullDue'),
        col('nextDue'),
        now,
        col('lastLeakTestOn'),
      ],
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  const events = inserted.map((a) => registerEventRow(a.id, a.site_id, actor, now));
  await sequelize.query(
    `INSERT INTO scan_events (asset_id, action, occurred_at, site_id, user_id, status_to, payload)
     SELECT r.asset_id, 'register', $3, r.site_id, $4, 'available', r.payload
       FROM unnest($1::int[], $2::int[], $5::jsonb[]) AS r(asset_id, site_id, payload)`,
    { bind: [events.map((e) => e.assetId), events.map((e) => e.siteId), now, actor.id, events.map((e) => JSON.stringify(e.payload))], transaction: t },
  );
}

/**
 * Registers many bins inside the caller's transaction, in chunks of multi-row
 * inserts. The caller has checked every line; this refuses again on the first
 * problem, and the transaction makes it all or nothing.
 */
export async function registerBins(actor: Actor, inputs: RegisterBinInput[], opts: { now?: Date; transaction: Transaction }): Promise<number> {
  const t = opts.transaction;
  const settings = await getSettings();
  const now = opts.now ?? new Date();
  const checked = inputs.map((input) => checkedOrThrow(input, settings.gs1PrefixLength));
  const types = new Map((await BinType.findAll({ transaction: t })).map((b) => [b.id, b]));
  const depots = new Set((await Site.findAll({ where: { kind: 'depot' }, attributes: ['id'], transaction: t })).map((s) => s.id));
  for (let start = 0; start < inputs.length; start += BULK_CHUNK) {
    const rows = inputs.slice(start, start + BULK_CHUNK).map((input, i) => {
      const type = types.get(input.binTypeId);
      if (!type) throw new AppError('unprocessable', 'That bin type does not exist.');
      if (!depots.has(input.siteId)) throw new AppError('unprocessable', 'Bins are registered at a depot.');
      return newAssetRow(checked[start + i]!, input, type, input.siteId, now);
    });
    // A GRAI registered meanwhile fails the unique key here and rolls the whole import back.
    await insertChunk(rows, actor, now, t);
  }
  return inputs.length;
}
