// The demo's liner suppliers and specs, and which bin types each spec fits (scenario.ts), written through
// the models; the history's lots then name them.
import type { Transaction } from 'sequelize';
import { type BinType, LinerSpec, LinerSupplier } from '@/models';
import type { SpecFacts } from '@/lib/liners/liner-specs';
import { sequelize } from '@/db/sequelize';
import { LINER_SUPPLIERS, EXTRA_LINER_SPEC } from './scenario';

export interface LinerRecords {
  /** By supplier name: its record id and the spec its lots carry. */
  bySupplier: Map<string, { supplierId: number; specId: number }>;
  specs: Map<number, SpecFacts>;
  /** The specs each bin type lists (by bin type id). */
  listed: Map<number, SpecFacts[]>;
}

const facts = (s: LinerSpec): SpecFacts => ({
  id: s.id,
  code: s.code,
  nominalCapacityL: s.nominalCapacityL,
  valveType: s.valveType,
  valveSize: s.valveSize,
  glandSize: s.glandSize,
});

export async function seedLinerRecords(types: BinType[], transaction: Transaction): Promise<LinerRecords> {
  const bySupplier = new Map<string, { supplierId: number; specId: number }>();
  const specs = new Map<number, SpecFacts>();
  const listed = new Map<number, SpecFacts[]>(types.map((t) => [t.id, []]));
  const link = async (spec: LinerSpec, binTypes: BinType[]) => {
    for (const t of binTypes) {
      await sequelize.query('INSERT INTO bin_type_liner_specs (bin_type_id, liner_spec_id) VALUES ($1, $2)', { bind: [t.id, spec.id], transaction });
      listed.get(t.id)!.push(facts(spec));
    }
  };
  for (const s of LINER_SUPPLIERS) {
    const supplier = await LinerSupplier.create({ name: s.name, ...s.terms }, { transaction });
    const spec = await LinerSpec.create({ ...s.specRecord, supplierId: supplier.id }, { transaction });
    specs.set(spec.id, facts(spec));
    bySupplier.set(s.name, { supplierId: supplier.id, specId: spec.id });
    await link(spec, types);
  }
  const { supplier, binTypeCodes, ...extra } = EXTRA_LINER_SPEC;
  const spec = await LinerSpec.create({ ...extra, supplierId: bySupplier.get(supplier)!.supplierId }, { transaction });
  specs.set(spec.id, facts(spec));
  await link(
    spec,
    types.filter((t) => binTypeCodes.includes(t.code)),
  );
  return { bySupplier, specs, listed };
}
