// Putting bins into the pool: one at a time from the form, many from a CSV
// import (all or nothing), or from the demo generator. Every registration is
// also the bin's first entry in the scan log.
import type { Transaction } from 'sequelize';
import { sequelize, Asset, BinType, Site, ScanEvent } from '../../models';
import { AppError } from '../api-errors';
import { nextDue } from '../inspection-due';
import { checkRegistration, testColumns, type RegisterBinInput } from '../registration-check';
import { policyForBinType } from '../bin-policy';
import { getSettings } from './settings';
import type { Actor } from './scan-service';

// The checks themselves are pure (shared with the CSV import and the forms).
export { checkRegistration, type RegisterBinInput, type RegisterIssue } from '../registration-check';

/** The new bin's row: status available at the depot, due dates from its bin type's policy. */
function newAssetRow(checked: { grai: string; serial: string; manufactureMonth: string }, input: RegisterBinInput, type: BinType, siteId: number, now: Date) {
  const due = nextDue(
    { manufactureMonth: checked.manufactureMonth, lastIntermediateTestMonth: input.lastIntermediateTestMonth, lastFullInspectionMonth: input.lastFullInspectionMonth },
    policyForBinType(type),
  );
  return {
    grai: checked.grai, serial: checked.serial, binTypeId: type.id, manufactureMonth: `${checked.manufactureMonth}-01`,
    unMarking: input.unMarking?.trim() || null, status: 'available' as const, siteId, siteSince: now, customerId: null,
    currentTripId: null, leg: null, linerLotId: null, lastScanAt: now,
    ...testColumns(input.lastIntermediateTestMonth, input.lastFullInspectionMonth),
    nextIntermediateDue: due.intermediateDue, nextFullDue: due.fullDue, nextDue: due.nextDue, labelPrintedAt: null,
  };
}

/** The bin's first entry in the scan log. */
function registerEventRow(assetId: number, siteId: number, actor: Actor, now: Date) {
  return {
    assetId, action: 'register' as const, occurredAt: now, siteId, userId: actor.id, clientEventId: null,
    statusFrom: null, statusTo: 'available' as const, tripId: null, voidedAt: null, voidedBy: null, voidReason: null,
    payload: { patch: { status: 'available', siteId: String(siteId), siteKind: 'depot' }, trip: 'none' },
  };
}

function checkedOrThrow(input: RegisterBinInput, prefixLength: number) {
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
 * Registers many bins inside the caller's transaction, in chunks of multi-row
 * inserts (a CSV import of tens of thousands of bins must not take one round
 * trip per bin). The caller has checked every line; this refuses again on the
 * first problem, and the transaction makes it all or nothing.
 */
export async function registerBins(actor: Actor, inputs: RegisterBinInput[], opts: { now?: Date; transaction: Transaction }): Promise<number> {
  const t = opts.transaction;
  const settings = await getSettings();
  const now = opts.now ?? new Date();
  const checked = inputs.map((input) => checkedOrThrow(input, settings.gs1PrefixLength));
  const types = new Map((await BinType.findAll({ transaction: t })).map((b) => [b.id, b]));
  const depots = new Set((await Site.findAll({ where: { kind: 'depot' }, attributes: ['id'], transaction: t })).map((s) => s.id));
  for (let start = 0; start < inputs.length; start += BULK_CHUNK) {
    const slice = inputs.slice(start, start + BULK_CHUNK);
    const rows = slice.map((input, i) => {
      const type = types.get(input.binTypeId);
      if (!type) throw new AppError('unprocessable', 'That bin type does not exist.');
      if (!depots.has(input.siteId)) throw new AppError('unprocessable', 'Bins are registered at a depot.');
      return newAssetRow(checked[start + i]!, input, type, input.siteId, now);
    });
    // A GRAI registered meanwhile fails the unique key here and rolls the whole import back.
    const assets = await Asset.bulkCreate(rows, { transaction: t, returning: ['id'] });
    await ScanEvent.bulkCreate(assets.map((a, i) => registerEventRow(a.id, slice[i]!.siteId, actor, now)), { transaction: t });
  }
  return inputs.length;
}
