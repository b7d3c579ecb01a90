// Integration tests run against the real test database (never a mock):
// `npm test` migrates a fresh `loopfold_test` (and a copy per further worker, support/worker-database.ts); each
// file starts from empty tables.
import { sequelize } from '@/db/sequelize';

export async function resetDatabase() {
  await sequelize.query(`
    DO $$ DECLARE t text; BEGIN
      FOR t IN SELECT tablename FROM pg_tables WHERE schemaname = 'public'
               AND tablename NOT IN ('sequelize_meta', 'sequelize_data') LOOP
        EXECUTE format('TRUNCATE TABLE %I RESTART IDENTITY CASCADE', t);
      END LOOP;
    END $$;`);
}

/** Runs raw SQL and returns the PostgreSQL error code it failed with (or null). */
export async function sqlErrorCode(sql: string, bind: unknown[] = []): Promise<string | null> {
  try {
    await sequelize.query(sql, { bind });
    return null;
  } catch (e) {
    return (e as { parent?: { code?: string } }).parent?.code ?? 'unknown';
  }
}

export { sequelize };
