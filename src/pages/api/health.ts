import type { APIRoute } from 'astro';
import { sequelize } from '@/db/sequelize';
import { dataResponse, errorResponse } from '@/lib/respond.server';

const started = Date.now();

/** Liveness and database reachability, for load balancers and the start script. */
export const GET: APIRoute = async () => {
  const t0 = performance.now();
  try {
    const [rows] = await sequelize.query('SELECT (SELECT count(*) FROM sequelize_meta)::int AS migrations');
    const migrations = (rows as Array<{ migrations: number }>)[0]?.migrations ?? 0;
    return dataResponse({
      app: 'ok',
      database: 'ok',
      databaseLatencyMs: Math.round((performance.now() - t0) * 10) / 10,
      migrations,
      uptimeSeconds: Math.round((Date.now() - started) / 1000),
    });
  } catch {
    return errorResponse('unavailable', 'The database is not reachable.', { app: 'ok', database: 'down' });
  }
};
