// Correcting a registered bin: bin type, month of manufacture, UN mark and the
// months of its last tests. The GRAI (its identity on the label and in every
// event) and the status (kept by the scan log) are never edited here.
// Optimistic locking on Asset.version: a form opened before someone else's
// change is refused as "changed meanwhile" instead of overwriting it.
import { z } from 'zod';
import { Asset, BinType, Site, sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { nextDue } from '@/lib/inspections/inspection-due';
import { policyForBinType } from './bin-policy';
import { groupGrai, parseGrai } from '@/lib/gs1';
import { checkBinType, checkMarkAgainstType, checkRegistration, testColumns, testMonthsOf, type RegisterIssue, innerMadeMonthFor } from './registration-check';
import type { Status } from '@/lib/scans/lifecycle';
import { choiceField, markField, monthField } from './bin-forms.server';
import { recordAudit } from '@/lib/audit.server';
import { getSettings } from '@/lib/settings/settings.server';
import type { Actor } from '@/lib/scans/scan-service.server';

const NOT_EDITABLE = {
  grai: "The GRAI cannot be edited: it is the bin's identity on its label and in every recorded event.",
  status: 'The status cannot be edited: it follows the scan log. Record a scan (for example quarantine or retire) instead.',
  siteId: 'The site cannot be edited: it follows the scan log. Record a receipt or a transfer instead.',
} as const;

const refuseKey = (message: string) => z.unknown().refine((v) => v === undefined, message);

export const editBody = z.object({
  version: z.number({ required_error: 'The form lacks the version it was opened at; reload it.' }).int().nonnegative(),
  binTypeId: choiceField,
  manufactureMonth: monthField,
  unMarking: markField,
  lastIntermediateTestMonth: monthField,
  lastFullInspectionMonth: monthField,
  innerMadeMonth: monthField.optional(),
  grai: refuseKey(NOT_EDITABLE.grai),
  status: refuseKey(NOT_EDITABLE.status),
  siteId: refuseKey(NOT_EDITABLE.siteId),
});
export type EditBody = z.infer<typeof editBody>;

export interface EditableBin {
  id: number;
  grai: string;
  groupedGrai: string;
  serial: string;
  status: Status;
  siteName: string | null;
  binTypeId: number;
  binTypeCode: string;
  binTypeActive: boolean;
  manufactureMonth: string;
  unMarking: string | null;
  lastIntermediateTestMonth: string | null;
  lastFullInspectionMonth: string | null;
  innerMadeMonth: string | null;
  nextIntermediateDue: string | null;
  nextFullDue: string | null;
  nextDue: string | null;
  version: number;
}

/** Reads a GRAI from a URL segment (plain, grouped or percent-encoded) into its canonical value. */
export function canonicalGrai(param: string | undefined, prefixLength: number): string | null {
  if (!param) return null;
  let text = param;
  try {
    text = decodeURIComponent(param);
  } catch {
    return null;
  }
  const parsed = parseGrai(text, { companyPrefixLength: prefixLength });
  return parsed.ok ? parsed.grai.value : null;
}

/** The bin as the edit form shows it; null when no bin has that GRAI. */
export async function editableBin(grai: string): Promise<EditableBin | null> {
  const settings = await getSettings();
  const asset = await Asset.findOne({
    where: { grai },
    include: [
      { model: BinType, as: 'binType' },
      { model: Site, as: 'site' },
    ],
  });
  if (!asset) return null;
  const type = (asset as Asset & { binType: BinType }).binType;
  const site = (asset as Asset & { site: Site | null }).site;
  return {
    id: asset.id,
    grai: asset.grai,
    groupedGrai: groupGrai(asset.grai, settings.gs1PrefixLength),
    serial: asset.serial,
    status: asset.status,
    siteName: site?.name ?? null,
    binTypeId: asset.binTypeId,
    binTypeCode: type.code,
    binTypeActive: type.active,
    manufactureMonth: asset.manufactureMonth.slice(0, 7),
    unMarking: asset.unMarking,
    ...testMonthsOf(asset),
    innerMadeMonth: asset.innerMadeMonth?.slice(0, 7) ?? null,
    nextIntermediateDue: asset.nextIntermediateDue,
    nextFullDue: asset.nextFullDue,
    nextDue: asset.nextDue,
    version: asset.version,
  };
}

/** The fields an edit may change, as the audit trail records them. */
function snapshot(asset: Asset, binTypeCode: string) {
  return {
    binType: binTypeCode,
    manufactureMonth: asset.manufactureMonth.slice(0, 7),
    unMarking: asset.unMarking,
    innerMadeMonth: asset.innerMadeMonth?.slice(0, 7) ?? null,
    lastInspectionOn: asset.lastInspectionOn,
    lastLeakTestOn: asset.lastLeakTestOn,
    lastFullInspectionOn: asset.lastFullInspectionOn,
    nextIntermediateDue: asset.nextIntermediateDue,
    nextFullDue: asset.nextFullDue,
    nextDue: asset.nextDue,
  };
}

function changedOnly(before: Record<string, unknown>, after: Record<string, unknown>) {
  const keys = Object.keys(after).filter((k) => JSON.stringify(before[k]) !== JSON.stringify(after[k]));
  return {
    before: Object.fromEntries(keys.map((k) => [k, before[k]])),
    after: Object.fromEntries(keys.map((k) => [k, after[k]])),
  };
}

function refuse(issues: RegisterIssue[]): never {
  throw new AppError(
    'validation_failed',
    issues.length === 1 ? issues[0]!.message : `${issues.length} fields need attention.`,
    issues.map((i) => ({ path: i.field, message: i.message })),
  );
}

/**
 * Applies an edit made on a form opened at `body.version`. Due dates are
 * recomputed through the bin type's policy when anything they depend on
 * changed. Writes an audit entry with the fields before and after; an edit
 * that changes nothing writes nothing.
 */
export async function updateBin(actor: Actor, grai: string, body: EditBody, ip: string | null) {
  const settings = await getSettings();
  return sequelize.transaction(async (t) => {
    const asset = await Asset.findOne({ where: { grai }, transaction: t, lock: t.LOCK.UPDATE });
    if (!asset) throw new AppError('not_found', 'No bin with that GRAI is registered.');
    if (asset.version !== body.version) {
      throw new AppError('changed_meanwhile', 'Someone changed this bin after you opened the form. Reload it to see their change, then make yours again.', {
        yourVersion: body.version,
        currentVersion: asset.version,
      });
    }
    // One query at a time: a transaction has one connection.
    const oldType = await BinType.findByPk(asset.binTypeId, { transaction: t });
    const newType = body.binTypeId ? await BinType.findByPk(body.binTypeId, { transaction: t }) : null;
    const issues: RegisterIssue[] = [];
    const checked = checkRegistration(
      {
        grai: asset.grai,
        manufactureMonth: body.manufactureMonth,
        unMarking: body.unMarking,
        lastIntermediateTestMonth: body.lastIntermediateTestMonth,
        lastFullInspectionMonth: body.lastFullInspectionMonth,
        innerMadeMonth: body.innerMadeMonth,
      },
      settings.gs1PrefixLength,
    );
    issues.push(...checked.issues.filter((i) => i.field !== 'grai'));
    // A bin may keep a bin type that went out of use; it may not be moved to one.
    const typeIssue = !body.binTypeId
      ? { field: 'binTypeId', message: 'Choose a bin type.' }
      : newType && newType.id === asset.binTypeId
        ? null
        : checkBinType(newType ?? undefined, '');
    if (typeIssue) issues.push(typeIssue);
    const markIssue = newType ? checkMarkAgainstType(body.unMarking, newType) : null;
    if (markIssue) issues.push(markIssue);
    if (issues.length) refuse(issues);
    const type = newType!;

    const before = snapshot(asset, oldType?.code ?? String(asset.binTypeId));
    const shownTests = testMonthsOf(asset);
    const testsChanged = shownTests.lastIntermediateTestMonth !== body.lastIntermediateTestMonth || shownTests.lastFullInspectionMonth !== body.lastFullInspectionMonth;
    const manufactureMonth = checked.manufactureMonth!;
    const scheduleChanged = testsChanged || type.id !== asset.binTypeId || manufactureMonth !== before.manufactureMonth;

    asset.set({ binTypeId: type.id, manufactureMonth: `${manufactureMonth}-01`, unMarking: body.unMarking });
    // Left out by the form: kept; given: that month; the rule newly applying with none stored: the bin's own month.
    const inner = body.innerMadeMonth === undefined ? (asset.innerMadeMonth?.slice(0, 7) ?? null) : body.innerMadeMonth;
    const innerMonth = innerMadeMonthFor(inner, manufactureMonth, type.serviceLifeApplies);
    asset.set({ innerMadeMonth: innerMonth ? `${innerMonth}-01` : null });
    // Unchanged test months keep their stored days (an inspection record may have set an exact day).
    if (testsChanged) asset.set(testColumns(body.lastIntermediateTestMonth, body.lastFullInspectionMonth));
    if (scheduleChanged) {
      const due = nextDue(
        { manufactureMonth, lastIntermediateTestMonth: body.lastIntermediateTestMonth, lastFullInspectionMonth: body.lastFullInspectionMonth },
        policyForBinType(type),
      );
      asset.set({ nextIntermediateDue: due.intermediateDue, nextFullDue: due.fullDue, nextDue: due.nextDue });
    }
    const diff = changedOnly(before, snapshot(asset, type.code));
    if (Object.keys(diff.after).length === 0) return { changed: false, version: asset.version, nextDue: asset.nextDue };

    await asset.save({ transaction: t }); // bumps version; refuses if it moved since the read
    await recordAudit(
      { actor: { userId: actor.id, ip: ip ?? null }, action: 'bin.update', entityType: 'asset', entityId: asset.id, before: diff.before, after: diff.after },
      { transaction: t },
    );
    return { changed: true, version: asset.version, nextDue: asset.nextDue, changes: diff };
  });
}
