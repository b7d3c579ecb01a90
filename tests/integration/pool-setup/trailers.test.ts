import { describe, test, expect } from 'vitest';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, appErrorOf } from '../support/fixtures';
import { sequelize } from '../support/db';
import { trailerCreateSchema, trailerPatchSchema } from '@/lib/pool-setup/setup-schemas';
import { createTrailer, updateTrailer } from '@/lib/pool-setup/trailers.server';
import { runCapacity } from '@/lib/planning/truck-runs.server';

const w = usePoolWorld();
const actor = () => ({ userId: w.planner.id, ip: '127.0.0.1' });

describe('trailers as admin data', () => {
  test('created and edited through the versioned, audited edit; a run’s capacity uses its inside size', async () => {
    const t = await createTrailer(
      trailerCreateSchema.parse({ name: 'Short rigid 7.2 m', insideLengthMm: 7200, insideWidthMm: 2450, insideHeightMm: 2700, payloadKg: 24000 }),
      actor(),
    );
    expect(t).toMatchObject({ name: 'Short rigid 7.2 m', active: true, runs: 0 });
    // Hand-worked: bins of 1200 × 1000 mm with 10 mm play are 1210 × 1010; across 2450 mm two fit either way, so rows of
    // 1010 mm along 7200 mm: 7 rows × 2 = 14 floor positions; folded 380 mm under 2700 − 50 mm head room: 6 levels → 84.
    // (The standard 13.6 m trailer: 13 rows × 2 = 26 × 6 = 156.)
    expect((await runCapacity(t.id, w.binType.id))?.bins).toBe(84);
    expect((await runCapacity(null, w.binType.id))?.bins).toBe(156);

    const same = await updateTrailer(t.id, trailerPatchSchema.parse({ version: t.version, payloadKg: 24000 }), actor());
    expect(same.version).toBe(t.version); // nothing changed: no new version, no entry
    const changed = await updateTrailer(t.id, trailerPatchSchema.parse({ version: t.version, insideHeightMm: 2400 }), actor());
    expect(changed.version).toBe(t.version + 1);
    // (2400 − 50) / 380 = 6.18 → still 6 levels; 84 bins.
    expect((await runCapacity(t.id, w.binType.id))?.bins).toBe(84);
    const stale = await appErrorOf(updateTrailer(t.id, trailerPatchSchema.parse({ version: t.version, name: 'Other' }), actor()));
    expect(stale.code).toBe('changed_meanwhile');
    const twin = await appErrorOf(
      createTrailer(trailerCreateSchema.parse({ name: 'Short rigid 7.2 m', insideLengthMm: 7000, insideWidthMm: 2400, insideHeightMm: 2500, payloadKg: 10000 }), actor()),
    );
    expect(twin.message).toMatch(/Some fields/);
    const audit = await sequelize.query<{ action: string; after: Record<string, unknown> }>(
      `SELECT action, after FROM audit_entries WHERE entity_type = 'trailer' AND entity_id = $1 ORDER BY id`,
      { bind: [String(t.id)], type: QueryTypes.SELECT },
    );
    expect(audit.map((a) => a.action)).toEqual(['trailer.create', 'trailer.update']);
    expect(audit[1]!.after).toEqual({ insideHeightMm: 2400 });
  });

  test('bad sizes are refused with the field named', () => {
    const r = trailerCreateSchema.safeParse({ name: 'X', insideLengthMm: 500, insideWidthMm: 2450, insideHeightMm: 2700, payloadKg: 24000 });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]).toMatchObject({ path: ['insideLengthMm'], message: 'At least 1,000 mm.' });
  });
});
