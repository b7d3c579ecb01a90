// Trailers as the admin sets them up: inside length, width and height and payload — what a truck run's or a
// load's capacity is planned with (lib/planning/load-plan.ts). Same versioned, audited edit as the other set-up pages.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { Trailer } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { AuditActor } from '@/lib/audit.server';
import type { TrailerCreate, TrailerPatch } from './setup-schemas';
import { createAudited, editVersioned } from './versioned-edit.server';

export interface TrailerRow {
  id: number;
  name: string;
  insideLengthMm: number;
  insideWidthMm: number;
  insideHeightMm: number;
  payloadKg: number;
  active: boolean;
  version: number;
  /** Runs planned with it (any status). */
  runs: number;
}

const TRAILER_SQL = `
  SELECT t.id, t.name, t.inside_length_mm AS "insideLengthMm", t.inside_width_mm AS "insideWidthMm", t.inside_height_mm AS "insideHeightMm",
         t.payload_kg AS "payloadKg", t.active, t.version, (SELECT count(*)::int FROM truck_runs r WHERE r.trailer_id = t.id) AS runs
    FROM trailers t`;

export async function listTrailers(): Promise<TrailerRow[]> {
  return sequelize.query<TrailerRow>(`${TRAILER_SQL} ORDER BY t.active DESC, lower(t.name), t.id`, { type: QueryTypes.SELECT });
}

export async function trailerRowById(id: number): Promise<TrailerRow> {
  const [row] = await sequelize.query<TrailerRow>(`${TRAILER_SQL} WHERE t.id = $1`, { bind: [id], type: QueryTypes.SELECT });
  if (!row) throw new AppError('not_found', 'There is no such trailer.');
  return row;
}

const FIELDS = ['name', 'insideLengthMm', 'insideWidthMm', 'insideHeightMm', 'payloadKg', 'active'] as const;
const snapshot = (t: Trailer) => Object.fromEntries(FIELDS.map((f) => [f, t[f]]));

async function nameTaken(name: string, exceptId: number | null, transaction?: import('sequelize').Transaction) {
  const other = await Trailer.findOne({ where: { name }, attributes: ['id'], transaction });
  if (other && other.id !== exceptId) {
    throw new AppError('validation_failed', 'Some fields are not valid.', [{ path: 'name', message: `Another trailer is already called ${name}.` }]);
  }
}

export async function createTrailer(input: TrailerCreate, actor: AuditActor): Promise<TrailerRow> {
  const id = await createAudited('trailer', actor, async (transaction) => {
    await nameTaken(input.name, null, transaction);
    const t = await Trailer.create({ ...input, active: input.active ?? true }, { transaction });
    return { id: t.id, snapshot: snapshot(t), result: t.id };
  });
  return trailerRowById(id);
}

export async function updateTrailer(id: number, patch: TrailerPatch, actor: AuditActor): Promise<TrailerRow> {
  await editVersioned({
    model: Trailer,
    id,
    version: patch.version,
    entityType: 'trailer',
    actor,
    notFound: 'There is no such trailer.',
    describe: (t) => `the trailer ${t.name}`,
    snapshot,
    apply: async (t, transaction) => {
      if (patch.name !== undefined && patch.name !== t.name) await nameTaken(patch.name, t.id, transaction);
      for (const f of FIELDS) if (patch[f] !== undefined) t.set(f, patch[f] as never);
    },
  });
  return trailerRowById(id);
}
