import pg from 'pg';
import { Sequelize } from 'sequelize';

// BIGINT ids (events, audit entries) arrive as strings unless told otherwise;
// they stay far below 2^53, so read them as numbers.
pg.types.setTypeParser(20, (v) => Number(v));
// DATE columns are calendar days in the operator's zone: keep them as 'YYYY-MM-DD'.
pg.types.setTypeParser(1082, (v) => v);

declare global {
  // eslint-disable-next-line no-var
  var __loopfoldSequelize: Sequelize | undefined;
}

function create(): Sequelize {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set (the start and test scripts set it; see README).');
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: process.env.SQL_LOG === '1' ? console.log : false,
    define: { underscored: true, timestamps: true },
    pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, idle: 10_000, acquire: 30_000 },
  });
}

/** One Sequelize instance per process (cached on globalThis so dev reloads reuse it). */
export const sequelize: Sequelize = (globalThis.__loopfoldSequelize ??= create());
