// Bin types as the admin sets them up: footprint, folded and erected height,
// capacity, tare and maximum gross mass, UN code and inspection policy.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { BinType } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { AuditActor } from '@/lib/audit.server';
import { binTypeProblems, type BinTypeCreate, type BinTypePatch } from './setup-schemas';
import { createAudited, editVersioned } from './versioned-edit.server';

export interface BinTypeRow {
  id: number;
  code: string;
  name: string;
  graiAssetType: string;
  nominalCapacityL: number;
  tareKg: number;
  maxGrossKg: number;
  footprintLengthMm: number;
  footprintWidthMm: number;
  heightErectedMm: number;
  heightFoldedMm: number;
  unCode: string | null;
  policyKind: 'un' | 'own';
  intermediateMonths: number;
  fullMonths: number;
  /** ADR 4.1.1.15 period of use of the inner receptacle: applies or not, and for how many years. */
  serviceLifeApplies: boolean;
  serviceLifeYears: number;
  active: boolean;
  version: number;
  /** Registered bins of this type (retired ones included). */
  bins: number;
}

const BIN_TYPE_SQL = `
  SELECT b.id, b.code, b.name, b.grai_asset_type AS "graiAssetType", b.nominal_capacity_l AS "nominalCapacityL",
         b.tare_kg::float8 AS "tareKg", b.max_gross_kg::float8 AS "maxGrossKg",
         b.footprint_length_mm AS "footprintLengthMm", b.footprint_width_mm AS "footprintWidthMm",
         b.height_erected_mm AS "heightErectedMm", b.height_folded_mm AS "heightFoldedMm", b.un_code AS "unCode",
         b.policy_kind AS "policyKind", b.intermediate_months AS "intermediateMonths", b.full_months AS "fullMonths",
         b.service_life_applies AS "serviceLifeApplies", b.service_life_years AS "serviceLifeYears",
         b.active, b.version, (SELECT count(*)::int FROM assets a WHERE a.bin_type_id = b.id) AS bins
    FROM bin_types b`;

export async function listBinTypes(): Promise<BinTypeRow[]> {
  return sequelize.query<BinTypeRow>(`${BIN_TYPE_SQL} ORDER BY b.active DESC, b.code`, { type: QueryTypes.SELECT });
}

export async function binTypeById(id: number): Promise<BinTypeRow> {
  const [row] = await sequelize.query<BinTypeRow>(`${BIN_TYPE_SQL} WHERE b.id = $1`, { bind: [id], type: QueryTypes.SELECT });
  if (!row) throw new AppError('not_found', 'There is no such bin type.');
  return row;
}

const FIELDS = [
  'code',
  'name',
  'graiAssetType',
  'nominalCapacityL',
  'tareKg',
  'maxGrossKg',
  'footprintLengthMm',
  'footprintWidthMm',
  'heightErectedMm',
  'heightFoldedMm',
  'unCode',
  'policyKind',
  'intermediateMonths',
  'fullMonths',
  'serviceLifeApplies',
  'serviceLifeYears',
  'active',
] as const;

function snapshot(b: BinType) {
  const s = Object.fromEntries(FIELDS.map((f) => [f, b[f]])) as Record<(typeof FIELDS)[number], unknown>;
  return { ...s, tareKg: Number(b.tareKg), maxGrossKg: Number(b.maxGrossKg) };
}

/**
 * Fields that existing bins depend on: their GRAIs carry the asset type, and
 * their stored due dates were worked out from the policy. Changing them under
 * registered bins would leave those bins wrong, so they are fixed once bins exist.
 */
const FIXED_ONCE_USED = ['graiAssetType', 'policyKind', 'intermediateMonths', 'fullMonths'] as const;

async function codeTaken(code: string, exceptId: number | null, transaction?: import('sequelize').Transaction) {
  const other = await BinType.findOne({ where: { code }, attributes: ['id'], transaction });
  if (other && other.id !== exceptId) {
    throw new AppError('validation_failed', 'Some fields are not valid.', [{ path: 'code', message: `The code ${code} is already used by another bin type.` }]);
  }
}

function refuseProblems(problems: { path: string; message: string }[]) {
  if (problems.length) throw new AppError('validation_failed', problems[0]!.message, problems);
}

export async function createBinType(input: BinTypeCreate, actor: AuditActor): Promise<BinTypeRow> {
  const id = await createAudited('bin_type', actor, async (transaction) => {
    await codeTaken(input.code, null, transaction);
    const row = await BinType.create({ ...input, tareKg: String(input.tareKg), maxGrossKg: String(input.maxGrossKg), active: input.active ?? true }, { transaction });
    return { id: row.id, snapshot: snapshot(row), result: row.id };
  });
  return binTypeById(id);
}

export async function updateBinType(id: number, patch: BinTypePatch, actor: AuditActor): Promise<BinTypeRow> {
  await editVersioned({
    model: BinType,
    id,
    version: patch.version,
    entityType: 'bin_type',
    actor,
    notFound: 'There is no such bin type.',
    describe: (b) => `the bin type ${b.code}`,
    snapshot,
    apply: async (b, transaction) => {
      const current = snapshot(b);
      const merged = { ...current, ...patch } as ReturnType<typeof snapshot> & BinTypeCreate;
      refuseProblems(binTypeProblems(merged));
      if (patch.code !== undefined && patch.code !== b.code) await codeTaken(patch.code, b.id, transaction);
      const changedFixed = FIXED_ONCE_USED.filter((f) => patch[f] !== undefined && patch[f] !== current[f]);
      if (changedFixed.length) {
        const [{ n }] = (await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM assets WHERE bin_type_id = $1', {
          bind: [b.id],
          type: QueryTypes.SELECT,
          transaction,
        })) as [{ n: number }];
        if (n > 0) {
          const message = `${n} registered ${n === 1 ? 'bin carries' : 'bins carry'} this type's asset type and inspection dates; they stay as they are. Add a new bin type for different ones.`;
          refuseProblems(changedFixed.map((f) => ({ path: f, message })));
        }
      }
      for (const f of FIELDS) {
        const v = patch[f];
        if (v === undefined) continue;
        if (f === 'tareKg' || f === 'maxGrossKg') b[f] = String(v);
        else (b as unknown as Record<string, unknown>)[f] = v;
      }
    },
  });
  return binTypeById(id);
}
