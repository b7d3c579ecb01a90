import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';

const started = Date.now();

/** Liveness and database reachability, for load balancers and the start script; `unavailable` when the database is not. */
export async function health() {
  const t0 = performance.now();
  let migrations: number;
  try {
    const [rows] = await sequelize.query('SELECT (SELECT count(*) FROM sequelize_meta)::int AS migrations');
    migrations = (rows as Array<{ migrations: number }>)[0]?.migrations ?? 0;
  } catch {
    throw new AppError('unavailable', 'The database is not reachable.', { app: 'ok', database: 'down' });
  }
  return {
    app: 'ok',
    database: 'ok',
    databaseLatencyMs: Math.round((performance.now() - t0) * 10) / 10,
    migrations,
    uptimeSeconds: Math.round((Date.now() - started) / 1000),
  };
}
