// Bin types as the load plan reads them (footprint, heights, masses): one query for the run capacity and the
// repositioning plan, so both size a truck from the same columns.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import type { BinForLoading } from './load-plan';

export interface BinTypeForLoading {
  id: number;
  name: string;
  bin: BinForLoading;
}

interface Row {
  id: number;
  name: string;
  footprint_length_mm: number;
  footprint_width_mm: number;
  height_erected_mm: number;
  height_folded_mm: number;
  tare_kg: string;
  max_gross_kg: string;
}

/** One bin type by id, or (no id) the active ones by name. */
export async function binTypesForLoading(binTypeId: number | null = null, t?: Transaction): Promise<BinTypeForLoading[]> {
  const rows = await sequelize.query<Row>(
    `SELECT id, name, footprint_length_mm, footprint_width_mm, height_erected_mm, height_folded_mm, tare_kg, max_gross_kg FROM bin_types
      WHERE ${binTypeId !== null ? 'id = $1' : 'active'} ORDER BY name`,
    { bind: binTypeId !== null ? [binTypeId] : [], type: QueryTypes.SELECT, transaction: t },
  );
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    bin: {
      footprint: { lengthMm: r.footprint_length_mm, widthMm: r.footprint_width_mm },
      heightErectedMm: r.height_erected_mm,
      heightFoldedMm: r.height_folded_mm,
      tareKg: Number(r.tare_kg),
      maxGrossKg: Number(r.max_gross_kg),
    },
  }));
}
