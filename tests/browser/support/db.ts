// Direct reads of the e2e database, to check what the app recorded.
import pg from 'pg';

let pool: pg.Pool | null = null;
export function db(): pg.Pool {
  pool ??= new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 2 });
  return pool;
}
export async function closeDb() {
  await pool?.end();
  pool = null;
}
export async function one<T>(sql: string, params: unknown[] = []): Promise<T> {
  const r = await db().query(sql, params);
  return r.rows[0] as T;
}
export async function rows<T>(sql: string, params: unknown[] = []): Promise<T[]> {
  return (await db().query(sql, params)).rows as T[];
}
