// Registering one bin from the form: what the form offers (bin types, depots,
// the operator's GS1 prefix) and the server side of "Register bin", which
// reports every problem at once, field by field, before anything is written.
import { z } from 'zod';
import { text } from '@/lib/text-input';
import { Asset, BinType, Site, sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { groupGrai } from '@/lib/gs1';
import { checkBinType, checkDepot, checkMarkAgainstType, checkRegistration, graiFromSerial, type BinTypeRef, type RegisterIssue, type SiteRef } from './registration-check';
import { registerBin } from './bin-register.server';
import { recordAudit } from '@/lib/audit.server';
import { getSettings } from '@/lib/settings/settings.server';
import type { Actor } from '@/lib/scans/scan-service.server';
import { depotChoices } from '@/lib/fleet/choices.server';

export interface BinTypeOption extends BinTypeRef {
  name: string;
  graiAssetType: string;
  policyKind: 'un' | 'own';
  intermediateMonths: number;
  fullMonths: number;
  /** ADR 4.1.1.15 applies to the type: the form asks for the inner receptacle's month. */
  serviceLifeApplies?: boolean;
  serviceLifeYears?: number;
}

export interface DepotOption extends SiteRef {
  name: string;
}

export interface FormOptions {
  binTypes: BinTypeOption[];
  depots: DepotOption[];
  companyPrefix: string;
  prefixLength: number;
}

/** Bin types in use and open depots for the forms, with the operator's GS1 company prefix. */
export async function formOptions(): Promise<FormOptions> {
  const [settings, types, depots] = await Promise.all([getSettings(), BinType.findAll({ where: { active: true }, order: [['code', 'ASC']] }), depotChoices()]);
  return {
    binTypes: types.map((t) => ({
      id: t.id,
      code: t.code,
      name: t.name,
      graiAssetType: t.graiAssetType,
      unCode: t.unCode,
      active: t.active,
      policyKind: t.policyKind,
      intermediateMonths: t.intermediateMonths,
      fullMonths: t.fullMonths,
      serviceLifeApplies: t.serviceLifeApplies,
      serviceLifeYears: t.serviceLifeYears,
    })),
    depots: depots.map((d) => ({ id: d.id, code: d.code, name: d.name, kind: d.kind, active: true })),
    companyPrefix: settings.gs1CompanyPrefix,
    prefixLength: settings.gs1PrefixLength,
  };
}

/** An empty month field is "not given". The format is checked with the rest, so its message names the field. */
const monthField = text()
  .trim()
  .max(10)
  .nullish()
  .transform((v) => (v ? v : null));
/** A choice from a list by id; 0 (or empty) = nothing chosen. */
const choiceField = z.preprocess((v) => (v === '' || v == null ? 0 : v), z.coerce.number().int().nonnegative());
const markField = text()
  .trim()
  .max(120, 'A UN mark has at most 120 characters.')
  .nullish()
  .transform((v) => (v ? v : null));

export const registerBody = z.object({
  /** 'grai': the full GRAI as typed; 'serial': built from the company prefix, the bin type and the serial. */
  graiMode: z.enum(['grai', 'serial']).default('grai'),
  grai: text().max(300).default(''),
  serial: text().max(40).default(''),
  // 0 = not chosen yet: reported with the other fields' problems, not alone.
  binTypeId: choiceField,
  siteId: choiceField,
  manufactureMonth: monthField,
  unMarking: markField,
  lastIntermediateTestMonth: monthField,
  lastFullInspectionMonth: monthField,
  innerMadeMonth: monthField,
});
export type RegisterBody = z.infer<typeof registerBody>;

export { monthField, markField, choiceField };

function refuse(issues: RegisterIssue[]): never {
  const details = issues.map((i) => ({ path: i.field, message: i.message }));
  throw new AppError('validation_failed', issues.length === 1 ? issues[0]!.message : `${issues.length} fields need attention.`, details);
}

/** Registers one bin from the form, with an audit entry; every problem is reported at once. */
export async function registerFromForm(actor: Actor, body: RegisterBody, ip: string | null) {
  const settings = await getSettings();
  const type = body.binTypeId ? await BinType.findByPk(body.binTypeId) : null;
  const site = body.siteId ? await Site.findByPk(body.siteId) : null;
  const issues: RegisterIssue[] = [];
  const graiField = body.graiMode === 'serial' ? 'serial' : 'grai';

  let grai = body.grai;
  if (body.graiMode === 'serial') {
    const built = type ? graiFromSerial(settings.gs1CompanyPrefix, type.graiAssetType, body.serial) : null;
    if (built && !built.ok) issues.push({ field: 'serial', message: built.message });
    grai = built?.ok ? built.grai : '';
  }
  const input = {
    grai,
    manufactureMonth: body.manufactureMonth,
    unMarking: body.unMarking,
    lastIntermediateTestMonth: body.lastIntermediateTestMonth,
    lastFullInspectionMonth: body.lastFullInspectionMonth,
    innerMadeMonth: body.innerMadeMonth,
  };
  const checked = checkRegistration(input, settings.gs1PrefixLength);
  // In serial mode without a built GRAI the serial (or the bin type) has already said why.
  const graiReadable = body.graiMode === 'grai' || grai !== '';
  issues.push(...checked.issues.filter((i) => i.field !== 'grai' || graiReadable));
  const typeIssue = body.binTypeId ? checkBinType(type ?? undefined, '') : { field: 'binTypeId', message: 'Choose a bin type.' };
  const depotIssue = body.siteId ? checkDepot(site ?? undefined, '') : { field: 'siteId', message: 'Choose a depot.' };
  for (const issue of [typeIssue, depotIssue]) if (issue) issues.push(issue);
  const markIssue = type ? checkMarkAgainstType(body.unMarking, type) : null;
  if (markIssue) issues.push(markIssue);
  if (checked.grai && (await Asset.findOne({ where: { grai: checked.grai }, attributes: ['id'] }))) {
    issues.push({ field: graiField, message: `A bin with GRAI ${groupGrai(checked.grai, settings.gs1PrefixLength)} is already registered.` });
  }
  if (issues.length) refuse(issues.map((i) => (i.field === 'grai' ? { ...i, field: graiField } : i)));

  const asset = await sequelize.transaction(async (t) => {
    const created = await registerBin(actor, { ...input, grai: checked.grai!, binTypeId: type!.id, siteId: site!.id }, { transaction: t });
    await recordAudit(
      {
        actor: { userId: actor.id, ip: ip ?? null },
        action: 'bin.register',
        entityType: 'asset',
        entityId: created.id,
        before: null,
        after: { grai: created.grai, binType: type!.code, depot: site!.code, manufactureMonth: created.manufactureMonth, unMarking: created.unMarking, nextDue: created.nextDue },
      },
      { transaction: t },
    );
    return created;
  });
  return {
    id: asset.id,
    grai: asset.grai,
    groupedGrai: groupGrai(asset.grai, settings.gs1PrefixLength),
    nextDue: asset.nextDue,
  };
}
