// Liner specs and suppliers: the records, the bin types each spec fits, and the fit check the scan
// service runs (the rule itself is specFitsBinType in liner-specs.ts).
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize, LinerSpec, LinerSupplier } from '@/models';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { specFitsBinType, type SpecFacts, type SpecFit } from './liner-specs';
import type { SpecInput, SupplierInput } from './liner-schemas';

const FACTS = `s.id, s.code, s.nominal_capacity_l AS "nominalCapacityL", s.valve_type AS "valveType", s.valve_size AS "valveSize", s.gland_size AS "glandSize"`;

/** May a liner of this spec go into a bin of this type? (no spec: a lot from before specs existed, not checked) */
export async function specFitFor(specId: number | null, binTypeId: number, t?: Transaction): Promise<SpecFit> {
  if (specId === null) return { ok: true };
  const [spec] = await sequelize.query<SpecFacts>(`SELECT ${FACTS} FROM liner_specs s WHERE s.id = $1`, { bind: [specId], type: QueryTypes.SELECT, transaction: t });
  const listed = await sequelize.query<SpecFacts>(
    `SELECT ${FACTS} FROM liner_specs s JOIN bin_type_liner_specs b ON b.liner_spec_id = s.id WHERE b.bin_type_id = $1 ORDER BY s.id`,
    { bind: [binTypeId], type: QueryTypes.SELECT, transaction: t },
  );
  const [type] = await sequelize.query<{ name: string }>('SELECT name FROM bin_types WHERE id = $1', { bind: [binTypeId], type: QueryTypes.SELECT, transaction: t });
  return specFitsBinType(spec ?? null, type?.name ?? 'this bin type', listed);
}

export interface SpecRow {
  id: number;
  version: number;
  active: boolean;
  code: string;
  name: string;
  material: string;
  layers: number;
  nominalCapacityL: number;
  valveType: SpecInput['valveType'];
  valveSize: string | null;
  glandSize: string;
  foodContact: boolean;
  maxFillTempC: number | null;
  supplierId: number | null;
  supplierName: string | null;
  articleNumber: string | null;
  binTypeIds: number[];
  lots: number;
}

export async function listSpecs(): Promise<SpecRow[]> {
  return sequelize.query<SpecRow>(
    `SELECT s.id, s.version, s.active, s.code, s.name, s.material, s.layers, s.nominal_capacity_l AS "nominalCapacityL", s.valve_type AS "valveType",
            s.valve_size AS "valveSize", s.gland_size AS "glandSize", s.food_contact AS "foodContact", s.max_fill_temp_c AS "maxFillTempC",
            s.supplier_id AS "supplierId", sup.name AS "supplierName", s.article_number AS "articleNumber",
            COALESCE((SELECT array_agg(b.bin_type_id ORDER BY b.bin_type_id) FROM bin_type_liner_specs b WHERE b.liner_spec_id = s.id), '{}') AS "binTypeIds",
            (SELECT count(*)::int FROM liner_lots l WHERE l.liner_spec_id = s.id) AS lots
       FROM liner_specs s LEFT JOIN liner_suppliers sup ON sup.id = s.supplier_id
      ORDER BY s.active DESC, s.code`,
    { type: QueryTypes.SELECT },
  );
}

const SPEC_FIELDS = [
  'code',
  'name',
  'material',
  'layers',
  'nominalCapacityL',
  'valveType',
  'valveSize',
  'glandSize',
  'foodContact',
  'maxFillTempC',
  'supplierId',
  'articleNumber',
] as const;
const SUPPLIER_FIELDS = ['name', 'orderEmail', 'leadTimeDays', 'orderCost', 'packSize', 'minOrderQty', 'pricePerLiner'] as const;

async function setBinTypes(specId: number, binTypeIds: number[], t: Transaction): Promise<number[]> {
  const ids = [...new Set(binTypeIds)].sort((a, b) => a - b);
  const found = await sequelize.query<{ id: number }>('SELECT id FROM bin_types WHERE id = ANY($1::int[])', { bind: [ids], type: QueryTypes.SELECT, transaction: t });
  if (found.length !== ids.length) throw new AppError('validation_failed', 'One of the bin types chosen does not exist.', { field: 'binTypeIds' });
  await sequelize.query('DELETE FROM bin_type_liner_specs WHERE liner_spec_id = $1', { bind: [specId], transaction: t });
  if (ids.length) {
    await sequelize.query('INSERT INTO bin_type_liner_specs (bin_type_id, liner_spec_id) SELECT unnest($1::int[]), $2', { bind: [ids, specId], transaction: t });
  }
  return ids;
}

async function uniqueCode(code: string, id: number | null, t: Transaction) {
  const other = await LinerSpec.findOne({ where: { code }, transaction: t });
  if (other && other.id !== id) throw new AppError('duplicate', `Another spec already has the code ${code}.`, { field: 'code' });
}

async function supplierExists(id: number | null, t: Transaction) {
  if (id !== null && !(await LinerSupplier.findByPk(id, { transaction: t }))) throw new AppError('validation_failed', 'That supplier does not exist.', { field: 'supplierId' });
}

const snapshotOf = <T extends object>(m: T, fields: readonly string[]) => Object.fromEntries(fields.map((f) => [f, (m as Record<string, unknown>)[f] ?? null]));

export async function createSpec(input: SpecInput, actor: AuditActor): Promise<SpecRow> {
  const id = await sequelize.transaction(async (t) => {
    await uniqueCode(input.code, null, t);
    await supplierExists(input.supplierId, t);
    const spec = await LinerSpec.create({ ...pick(input, SPEC_FIELDS), active: input.active ?? true }, { transaction: t });
    const binTypeIds = await setBinTypes(spec.id, input.binTypeIds, t);
    await recordAudit(
      { actor, action: 'liner_spec.create', entityType: 'liner_spec', entityId: spec.id, after: { ...snapshotOf(spec, SPEC_FIELDS), binTypeIds } },
      { transaction: t },
    );
    return spec.id;
  });
  return (await listSpecs()).find((r) => r.id === id)!;
}

export async function updateSpec(id: number, input: SpecInput, actor: AuditActor): Promise<SpecRow> {
  await sequelize.transaction(async (t) => {
    const spec = await LinerSpec.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
    if (!spec) throw new AppError('not_found', 'No such liner spec.');
    if (input.version !== undefined && input.version !== spec.version) throw changed('spec');
    await uniqueCode(input.code, id, t);
    await supplierExists(input.supplierId, t);
    const [before] = await sequelize.query<{ ids: number[] }>(
      "SELECT COALESCE(array_agg(bin_type_id ORDER BY bin_type_id), '{}') AS ids FROM bin_type_liner_specs WHERE liner_spec_id = $1",
      { bind: [id], type: QueryTypes.SELECT, transaction: t },
    );
    const snap = { ...snapshotOf(spec, SPEC_FIELDS), active: spec.active, binTypeIds: before!.ids };
    spec.set({ ...pick(input, SPEC_FIELDS), active: input.active ?? spec.active });
    await spec.save({ transaction: t });
    const binTypeIds = await setBinTypes(id, input.binTypeIds, t);
    await recordAudit(
      { actor, action: 'liner_spec.update', entityType: 'liner_spec', entityId: id, before: snap, after: { ...snapshotOf(spec, SPEC_FIELDS), active: spec.active, binTypeIds } },
      { transaction: t },
    );
  });
  return (await listSpecs()).find((r) => r.id === id)!;
}

export interface SupplierRow {
  id: number;
  version: number;
  active: boolean;
  name: string;
  orderEmail: string | null;
  leadTimeDays: number;
  orderCost: string;
  packSize: number;
  minOrderQty: number;
  pricePerLiner: string;
  specs: number;
  lots: number;
}

export async function listSuppliers(): Promise<SupplierRow[]> {
  return sequelize.query<SupplierRow>(
    `SELECT s.id, s.version, s.active, s.name, s.order_email AS "orderEmail", s.lead_time_days AS "leadTimeDays", s.order_cost AS "orderCost",
            s.pack_size AS "packSize", s.min_order_qty AS "minOrderQty", s.price_per_liner AS "pricePerLiner",
            (SELECT count(*)::int FROM liner_specs p WHERE p.supplier_id = s.id) AS specs,
            (SELECT count(*)::int FROM liner_lots l WHERE l.supplier_id = s.id) AS lots
       FROM liner_suppliers s ORDER BY s.active DESC, s.name`,
    { type: QueryTypes.SELECT },
  );
}

async function uniqueSupplier(name: string, id: number | null, t: Transaction) {
  const other = await LinerSupplier.findOne({ where: { name }, transaction: t });
  if (other && other.id !== id) throw new AppError('duplicate', `A supplier named ${name} already exists.`, { field: 'name' });
}

export async function createSupplier(input: SupplierInput, actor: AuditActor): Promise<SupplierRow> {
  const id = await sequelize.transaction(async (t) => {
    await uniqueSupplier(input.name, null, t);
    const s = await LinerSupplier.create({ ...supplierValues(input), active: input.active ?? true }, { transaction: t });
    await recordAudit({ actor, action: 'liner_supplier.create', entityType: 'liner_supplier', entityId: s.id, after: snapshotOf(s, SUPPLIER_FIELDS) }, { transaction: t });
    return s.id;
  });
  return (await listSuppliers()).find((r) => r.id === id)!;
}

export async function updateSupplier(id: number, input: SupplierInput, actor: AuditActor): Promise<SupplierRow> {
  await sequelize.transaction(async (t) => {
    const s = await LinerSupplier.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
    if (!s) throw new AppError('not_found', 'No such supplier.');
    if (input.version !== undefined && input.version !== s.version) throw changed('supplier');
    await uniqueSupplier(input.name, id, t);
    const before = { ...snapshotOf(s, SUPPLIER_FIELDS), active: s.active };
    s.set({ ...supplierValues(input), active: input.active ?? s.active });
    await s.save({ transaction: t });
    await s.reload({ transaction: t });
    await recordAudit(
      { actor, action: 'liner_supplier.update', entityType: 'liner_supplier', entityId: id, before, after: { ...snapshotOf(s, SUPPLIER_FIELDS), active: s.active } },
      { transaction: t },
    );
  });
  return (await listSuppliers()).find((r) => r.id === id)!;
}

function supplierValues(i: SupplierInput) {
  return { ...pick(i, SUPPLIER_FIELDS), orderCost: i.orderCost.toFixed(2), pricePerLiner: i.pricePerLiner.toFixed(2) };
}

function pick<T extends object, K extends keyof T>(o: T, keys: readonly K[]): Pick<T, K> {
  return Object.fromEntries(keys.map((k) => [k, o[k]])) as Pick<T, K>;
}

function changed(what: string) {
  return new AppError('changed_meanwhile', `Someone changed this ${what} while you were editing. Reload to see their version, then make your change again.`);
}

/** Bin types to list a spec against (the spec form's choices). */
export async function listBinTypeChoices(): Promise<Array<{ id: number; name: string }>> {
  return sequelize.query<{ id: number; name: string }>('SELECT id, name FROM bin_types ORDER BY active DESC, name', { type: QueryTypes.SELECT });
}
