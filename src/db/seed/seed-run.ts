// The demo seed's completion stamp (table seed_runs): started before the first
// row is written, finished in the same transaction as the last one. So a seed
// killed half-way is told apart from a finished one and from data someone
// entered themselves.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';

export type SeedState = 'seeded' | 'interrupted' | 'empty' | 'other data';

export async function seedState(name = 'demo'): Promise<SeedState> {
  const [row] = await sequelize.query<{ finished: number; unfinished: number; orgs: number }>(
    `SELECT (SELECT count(*)::int FROM seed_runs WHERE name = $1 AND finished_at IS NOT NULL) AS finished,
            (SELECT count(*)::int FROM seed_runs WHERE name = $1 AND finished_at IS NULL) AS unfinished,
            (SELECT count(*)::int FROM organisations) AS orgs`,
    { bind: [name], type: QueryTypes.SELECT },
  );
  if (row!.finished > 0) return 'seeded';
  if (row!.unfinished > 0) return 'interrupted';
  return row!.orgs > 0 ? 'other data' : 'empty';
}

/** Empties every data table (the schema and the migration records stay), for a seed to start over. */
export async function wipeData() {
  await sequelize.query(`
    DO $$ DECLARE t text; BEGIN
      FOR t IN SELECT tablename FROM pg_tables WHERE schemaname = 'public'
               AND tablename NOT IN ('sequelize_meta', 'sequelize_data') LOOP
        EXECUTE format('TRUNCATE TABLE %I RESTART IDENTITY CASCADE', t);
      END LOOP;
    END $$;`);
}

/** Marks a seed as started (committed at once, so an interruption leaves it unfinished). */
export async function startSeedRun(name = 'demo'): Promise<number> {
  const [row] = await sequelize.query<{ id: number }>('INSERT INTO seed_runs (name) VALUES ($1) RETURNING id', { bind: [name], type: QueryTypes.SELECT });
  return row!.id;
}

/** Marks it finished, inside the transaction that writes the seed's last rows. */
export async function finishSeedRun(id: number, summary: Record<string, unknown>, t: Transaction) {
  await sequelize.query('UPDATE seed_runs SET finished_at = clock_timestamp(), summary = $2 WHERE id = $1', { bind: [id, JSON.stringify(summary)], transaction: t });
}

/** A test hook: LOOPFOLD_SEED_STALL=<step> makes the seed stop and wait at that step, so a test can kill it there. */
export async function stallPoint(step: string) {
  if (process.env.LOOPFOLD_SEED_STALL !== step) return;
  console.log(`[seed] stalled before ${step} (LOOPFOLD_SEED_STALL)`);
  await new Promise(() => {});
}
