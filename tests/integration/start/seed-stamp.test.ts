// A demo seed killed half-way is detected and redone on the next run, not taken
// as seeded (src/db/seed/run-demo.ts with the seed_runs stamp). The seeder runs
// as `npm start` runs it, in a child process, and is killed at two points: after
// the people and places committed, and inside the history's transaction.
import { describe, test, expect, beforeEach, afterAll } from 'vitest';
import { spawn } from 'node:child_process';
import { QueryTypes } from 'sequelize';
import { resetDatabase, sequelize } from '../support/db';
import { seedState } from '@/db/seed/seed-run';
import { DEMO_LOGINS } from '@/db/seed/demo-logins.mjs';
import { CUSTOMERS, EXTRA_STAFF } from '@/db/seed/scenario';

const BINS = 12;

function runSeeder(stallAt?: string): Promise<{ out: string; code: number | null; signal: NodeJS.Signals | null }> {
  const env: NodeJS.ProcessEnv = { ...process.env, DEMO_BINS: String(BINS) };
  if (stallAt) env.LOOPFOLD_SEED_STALL = stallAt;
  else delete env.LOOPFOLD_SEED_STALL;
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/db/seed/run-demo.ts'], { env });
  let out = '';
  return new Promise((done) => {
    const take = (d: Buffer) => {
      out += d.toString();
      if (stallAt && out.includes(`stalled before ${stallAt}`)) child.kill('SIGKILL');
    };
    child.stdout.on('data', take);
    child.stderr.on('data', take);
    child.on('exit', (code, signal) => done({ out, code, signal }));
  });
}

async function counts() {
  const [row] = await sequelize.query<{ orgs: number; users: number; bins: number; events: number; runs: number; finished: number }>(
    `SELECT (SELECT count(*)::int FROM organisations) orgs, (SELECT count(*)::int FROM users) users, (SELECT count(*)::int FROM assets) bins,
            (SELECT count(*)::int FROM scan_events) events, (SELECT count(*)::int FROM seed_runs) runs,
            (SELECT count(*)::int FROM seed_runs WHERE finished_at IS NOT NULL) finished`,
    { type: QueryTypes.SELECT },
  );
  return row!;
}

beforeEach(async () => {
  await resetDatabase();
});
afterAll(async () => {
  await sequelize.close();
});

describe('the seed completion stamp', () => {
  for (const step of ['history', 'finish']) {
    test(`a seed killed before the ${step} step is detected and redone in full`, async () => {
      const killed = await runSeeder(step);
      expect(killed.signal).toBe('SIGKILL');
      const half = await counts();
      // People and places were committed, the history was not (killed before it, or inside its transaction).
      expect(half.orgs).toBe(CUSTOMERS.length + 1);
      expect(half.bins).toBe(0);
      expect(half.finished).toBe(0);
      expect(await seedState()).toBe('interrupted');

      const again = await runSeeder();
      expect(again.code).toBe(0);
      expect(again.out).toContain('interrupted half-way');
      const full = await counts();
      expect(full).toMatchObject({
        orgs: CUSTOMERS.length + 1,
        users: DEMO_LOGINS.length + 1 + EXTRA_STAFF.length /* + the second customer's login */,
        bins: BINS,
        runs: 1,
        finished: 1,
      });
      expect(full.events).toBeGreaterThan(BINS * 5);
      expect(await seedState()).toBe('seeded');

      // A third run leaves the finished seed alone.
      const third = await runSeeder();
      expect(third.out).toContain('already seeded');
      expect(await counts()).toEqual(full);
    }, 120_000);
  }

  test('data that no seed wrote is left alone', async () => {
    await sequelize.query(`INSERT INTO organisations (name, kind, contact_email) VALUES ('Own data', 'operator', 'own@example.test')`);
    expect(await seedState()).toBe('other data');
    const run = await runSeeder();
    expect(run.out).toContain('not seeded');
    expect((await counts()).orgs).toBe(1);
  }, 60_000);
});
