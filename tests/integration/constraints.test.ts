import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { resetDatabase, sqlErrorCode, sequelize } from './support/db';
import { baseWorld } from './support/fixtures';
import { Organisation, Site, User } from '@/models';

// PostgreSQL error codes: 23514 check_violation, 23505 unique_violation,
// 23503 foreign_key_violation, 23502 not_null_violation.
let world: Awaited<ReturnType<typeof baseWorld>>;
beforeAll(async () => {
  await resetDatabase();
  world = await baseWorld();
});
afterAll(async () => {
  await sequelize.close();
});

describe('the database itself refuses bad rows', () => {
  test('organisation kind and currency are checked', async () => {
    expect(await sqlErrorCode(`INSERT INTO organisations (name, kind) VALUES ('X', 'supplier')`)).toBe('23514');
    expect(await sqlErrorCode(`INSERT INTO organisations (name, kind, currency) VALUES ('Y', 'customer', 'eu')`)).toBe('23514');
    expect(await sqlErrorCode(`INSERT INTO organisations (name, kind, free_days) VALUES ('Z', 'customer', -1)`)).toBe('23514');
  });
  test('only one operator organisation may exist', async () => {
    expect(await sqlErrorCode(`INSERT INTO organisations (name, kind) VALUES ('Another operator', 'operator')`)).toBe('23505');
  });
  test('site coordinates stay on the globe and come in pairs', async () => {
    const org = world.operator.id;
    expect(await sqlErrorCode(`INSERT INTO sites (organisation_id, code, name, kind, latitude, longitude) VALUES ($1, 'BAD-1', 'x', 'depot', 91, 4)`, [org])).toBe('23514');
    expect(await sqlErrorCode(`INSERT INTO sites (organisation_id, code, name, kind, latitude) VALUES ($1, 'BAD-2', 'x', 'depot', 51)`, [org])).toBe('23514');
    expect(await sqlErrorCode(`INSERT INTO sites (organisation_id, code, name, kind) VALUES ($1, 'BAD-3', 'x', 'warehouse')`, [org])).toBe('23514');
    expect(await sqlErrorCode(`INSERT INTO sites (organisation_id, code, name, kind) VALUES (999999, 'BAD-4', 'x', 'depot')`)).toBe('23503');
  });
  test('users: role, lower-case unique e-mail, organisation required', async () => {
    const org = world.operator.id;
    expect(await sqlErrorCode(`INSERT INTO users (email, name, role, organisation_id) VALUES ('a@b.example', 'A', 'driver', $1)`, [org])).toBe('23514');
    expect(await sqlErrorCode(`INSERT INTO users (email, name, role, organisation_id) VALUES ('Upper@b.example', 'A', 'yard', $1)`, [org])).toBe('23514');
    expect(await sqlErrorCode(`INSERT INTO users (email, name, role) VALUES ('n@b.example', 'A', 'yard')`)).toBe('23502');
    await User.create({ email: 'dup@b.example', name: 'D', role: 'yard', organisationId: org, passwordHash: null, homeSiteId: null, lastSignInAt: null });
    expect(await sqlErrorCode(`INSERT INTO users (email, name, role, organisation_id) VALUES ('dup@b.example', 'E', 'yard', $1)`, [org])).toBe('23505');
  });
  test('settings are a single row and the GS1 prefix matches its length', async () => {
    expect(
      await sqlErrorCode(
        `INSERT INTO settings (id, operator_name, gs1_company_prefix, gs1_prefix_length, digital_link_base, time_zone, currency, tax_rate, mail_sender) VALUES (2, 'x', '9521234', 7, 'http://x', 'UTC', 'EUR', 0.2, 'a@b.example')`,
      ),
    ).toBe('23514');
    expect(await sqlErrorCode(`UPDATE settings SET gs1_prefix_length = 8`)).toBe('23514');
    expect(await sqlErrorCode(`UPDATE settings SET tax_rate = 1.5`)).toBe('23514');
  });
});

describe('optimistic locking through the models', () => {
  test('two stale copies of a site: the second save is refused', async () => {
    const a = await Site.findByPk(world.depot.id);
    const b = await Site.findByPk(world.depot.id);
    a!.name = 'Renamed by A';
    await a!.save();
    b!.name = 'Renamed by B';
    await expect(b!.save()).rejects.toThrow(/Attempting to update a stale model instance/);
    const fresh = await Site.findByPk(world.depot.id);
    expect(fresh!.name).toBe('Renamed by A');
    expect(fresh!.version).toBe(1);
  });
  test('organisation version starts at 0 and goes up by one per save', async () => {
    const o = await Organisation.findByPk(world.customer.id);
    expect(o!.version).toBe(0);
    o!.freeDays = 20;
    await o!.save();
    expect(o!.version).toBe(1);
  });
});
