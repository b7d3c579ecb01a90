// Putting bins into the pool: one at a time from the form, many from a CSV
// import (all or nothing), or from the demo generator. Every registration is
// also the bin's first entry in the scan log.
import type { Transaction } from 'sequelize';
import { sequelize, Asset, BinType, Site, ScanEvent } from '../../models';
import { AppError } from '../api-errors';
import { parseSerialisedGrai } from '../gs1';
import { parseUnMarking } from '../un-marking';
import { nextDue } from '../inspection-due';
import { policyForBinType } from '../bin-policy';
import { getSettings } from './settings';
import type { Actor } from './scan-service';

export interface RegisterBinInput {
  grai: string;
  binTypeId: number;
  siteId: number;
  /** 'YYYY-MM'; may be left out when a UN mark gives it. */
  manufactureMonth?: string | null;
  unMarking?: string | null;
  lastIntermediateTestMonth?: string | null;
  lastFullInspectionMonth?: string | null;
}

export interface RegisterIssue { field: string; message: string }

/** Checks one registration without writing; returns the problems found (empty = fine). */
export function checkRegistration(input: RegisterBinInput, prefixLength: number): { issues: RegisterIssue[]; grai?: string; serial?: string; manufactureMonth?: string } {
  const issues: RegisterIssue[] = [];
  const parsed = parseSerialisedGrai(input.grai, { companyPrefixLength: prefixLength });
  if (!parsed.ok) issues.push({ field: 'grai', message: parsed.error.message });
  let manufactureMonth = input.manufactureMonth ?? undefined;
  if (input.unMarking) {
    const mark = parseUnMarking(input.unMarking);
    if (!mark.ok) issues.push({ field: 'unMarking', message: mark.error.message });
    else {
      const fromMark = `${mark.marking.manufacture.year}-${String(mark.marking.manufacture.month).padStart(2, '0')}`;
      if (manufactureMonth && manufactureMonth !== fromMark) {
        issues.push({ field: 'manufactureMonth', message: `The UN mark says manufactured ${fromMark}, not ${manufactureMonth}.` });
      }
      manufactureMonth ??= fromMark;
    }
  }
  if (!manufactureMonth) issues.push({ field: 'manufactureMonth', message: 'Give the month of manufacture (YYYY-MM) or a UN mark that carries it.' });
  else if (!/^\d{4}-(0[1-9]|1[0-2])$/.test(manufactureMonth)) issues.push({ field: 'manufactureMonth', message: 'Month of manufacture must look like 2024-03.' });
  for (const key of ['lastIntermediateTestMonth', 'lastFullInspectionMonth'] as const) {
    const v = input[key];
    if (v && (!/^\d{4}-(0[1-9]|1[0-2])$/.test(v) || (manufactureMonth && v < manufactureMonth))) {
      issues.push({ field: key, message: 'A test month looks like 2025-06 and is not before manufacture.' });
    }
  }
  return parsed.ok ? { issues, grai: parsed.grai.value, serial: parsed.grai.serial, manufactureMonth } : { issues, manufactureMonth };
}

export async function registerBin(actor: Actor, input: RegisterBinInput, opts: { now?: Date; transaction?: Transaction } = {}): Promise<Asset> {
  const settings = await getSettings();
  const checked = checkRegistration(input, settings.gs1PrefixLength);
  if (checked.issues.length) throw new AppError('validation_failed', checked.issues[0]!.message, checked.issues);
  const now = opts.now ?? new Date();

  const work = async (t: Transaction) => {
    const [type, site] = await Promise.all([BinType.findByPk(input.binTypeId, { transaction: t }), Site.findByPk(input.siteId, { transaction: t })]);
    if (!type) throw new AppError('unprocessable', 'That bin type does not exist.', [{ field: 'binTypeId', message: 'Unknown bin type.' }]);
    if (!site || site.kind !== 'depot') throw new AppError('unprocessable', 'Bins are registered at a depot.', [{ field: 'siteId', message: 'Choose a depot.' }]);
    if (await Asset.findOne({ where: { grai: checked.grai! }, transaction: t, attributes: ['id'] })) {
      throw new AppError('duplicate', `A bin with GRAI ${checked.grai} is already registered.`, [{ field: 'grai', message: 'Already registered.' }]);
    }
    const due = nextDue(
      { manufactureMonth: checked.manufactureMonth!, lastIntermediateTestMonth: input.lastIntermediateTestMonth, lastFullInspectionMonth: input.lastFullInspectionMonth },
      policyForBinType(type),
    );
    const lastTest = [input.lastIntermediateTestMonth, input.lastFullInspectionMonth].filter(Boolean).sort().pop();
    const asset = await Asset.create(
      {
        grai: checked.grai!, serial: checked.serial!, binTypeId: type.id, manufactureMonth: `${checked.manufactureMonth}-01`,
        unMarking: input.unMarking?.trim() || null, status: 'available', siteId: site.id, siteSince: now, customerId: null,
        currentTripId: null, leg: null, linerLotId: null, lastScanAt: now,
        lastInspectionOn: lastTest ? `${lastTest}-01` : null, lastFullInspectionOn: input.lastFullInspectionMonth ? `${input.lastFullInspectionMonth}-01` : null,
        nextIntermediateDue: due.intermediateDue, nextFullDue: due.fullDue, nextDue: due.nextDue, labelPrintedAt: null,
      },
      { transaction: t },
    );
    await ScanEvent.create(
      {
        assetId: asset.id, action: 'register', occurredAt: now, siteId: site.id, userId: actor.id, clientEventId: null,
        statusFrom: null, statusTo: 'available', tripId: null, voidedAt: null, voidedBy: null, voidReason: null,
        payload: { patch: { status: 'available', siteId: String(site.id), siteKind: 'depot' }, trip: 'none' },
      },
      { transaction: t },
    );
    return asset;
  };
  return opts.transaction ? sequelize.transaction({ transaction: opts.transaction }, work) : sequelize.transaction(work);
}
