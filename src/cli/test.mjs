// `npm test`: sets up everything the tests need on this machine, then runs the
// suites in order and prints how long each took.
//   npm test                       all suites (lint, unit, integration, browser)
//   npm test -- unit integration   only the named suites
//   npm test -- browser -- login   extra arguments after a second -- go to vitest (e.g. a file filter)
import { say, ensureDependencies, ensureDebianPackages, authSecret, migrate, seed, buildIfStale, bin, run, startChild, shutdown } from './setup.mjs';
import { startPostgres, ensureDatabase, databaseUrl } from './postgres.mjs';
import { spawnSync } from 'node:child_process';

const SUITES = ['lint', 'unit', 'integration', 'browser'];
const argv = process.argv.slice(2);
const sep = argv.indexOf('--');
const chosen = (sep >= 0 ? argv.slice(0, sep) : argv).filter((a) => SUITES.includes(a));
const vitestExtra = sep >= 0 ? argv.slice(sep + 1) : [];
const suites = chosen.length ? chosen : SUITES;

const timings = [];
function timed(name, fn) {
  const t0 = Date.now();
  try {
    return fn();
  } finally {
    timings.push([name, (Date.now() - t0) / 1000]);
  }
}

function vitest(folder, env) {
  // Words after `--` narrow the run to matching files of the folder; flags pass through.
  const filters = vitestExtra.filter((a) => !a.startsWith('-')); // matched anywhere in the path, inside the project
  const flags = vitestExtra.filter((a) => a.startsWith('-'));
  // Integration and browser files share one database each: one file at a time (vitest ignores fileParallelism set
  // inside a project, so it is said here).
  const serial = folder === 'unit' ? [] : ['--no-file-parallelism'];
  const r = spawnSync(bin('vitest'), ['run', '--project', folder, ...serial, ...filters, ...flags], {
    stdio: 'inherit',
    env: { ...process.env, ...env },
  });
  return r.status === 0;
}

/** Formatting and lint rules (biome, biome.json) and the type check of every file, .astro included (astro check). */
function lint() {
  const rules = spawnSync(bin('biome'), ['ci', '--reporter=summary', '.'], { stdio: 'inherit' });
  const types = spawnSync(bin('astro'), ['check', '--minimumSeverity', 'error'], { stdio: 'inherit' });
  return rules.status === 0 && types.status === 0;
}

let failed = false;
try {
  timed('set-up', () => {
    ensureDependencies();
    if (suites.includes('browser')) {
      ensureDebianPackages([
        { name: 'chromium', binary: '/usr/bin/chromium' },
        { name: 'poppler-utils', binary: '/usr/bin/pdftoppm' },
      ]);
    }
  });

  // The browser suite needs the built app: build while the databases are set up and the other suites run.
  const building = suites.includes('browser')
    ? buildIfStale().then(
        () => null,
        (err) => err,
      )
    : null;
  const env = { AUTH_SECRET: authSecret(), ASTRO_TELEMETRY_DISABLED: '1', TZ: 'UTC' };
  let testDb, e2eDb;
  timed('databases', () => {
    if (process.env.TEST_DATABASE_URL) {
      testDb = process.env.TEST_DATABASE_URL;
      e2eDb = process.env.E2E_DATABASE_URL ?? testDb;
    } else {
      const pgBin = startPostgres();
      ensureDatabase(pgBin, 'loopfold_test', { fresh: true });
      ensureDatabase(pgBin, 'loopfold_e2e', { fresh: true });
      testDb = databaseUrl('loopfold_test');
      e2eDb = databaseUrl('loopfold_e2e');
    }
    if (suites.includes('integration')) {
      // Migrations must run forward and back cleanly: up, all the way down, up again.
      migrate(testDb);
      run(bin('sequelize-cli'), ['db:migrate:undo:all'], { DATABASE_URL: testDb });
      migrate(testDb);
    }
    if (suites.includes('browser')) {
      migrate(e2eDb);
      // A smaller pool than `npm start` seeds (600 bins): the same generator and
      // rules, fewer bins, so the browser suite's set-up stays quick.
      process.env.DEMO_BINS ??= '200';
      seed(e2eDb);
    }
  });

  // Every suite runs even when an earlier one failed (`failed ||= …` would skip the rest), so one run shows all.
  if (suites.includes('lint')) {
    failed = !timed('lint', lint) || failed;
  }
  if (suites.includes('unit')) {
    failed = !timed('unit', () => vitest('unit', env)) || failed;
  }
  if (suites.includes('integration')) {
    failed = !timed('integration', () => vitest('integration', { ...env, DATABASE_URL: testDb })) || failed;
  }
  if (suites.includes('browser')) {
    const t0 = Date.now();
    const buildError = await building;
    timings.push(['build (wait)', (Date.now() - t0) / 1000]);
    if (buildError) throw buildError;
    const smtpPort = process.env.LOOPFOLD_TEST_SMTP_PORT ?? '2526';
    startChild('test mail server', process.execPath, ['src/cli/mail-fake.mjs'], { LOOPFOLD_SMTP_PORT: smtpPort, DATABASE_URL: e2eDb });
    await new Promise((r) => setTimeout(r, 800));
    failed = !timed('browser', () => vitest('browser', { ...env, DATABASE_URL: e2eDb, SMTP_HOST: '127.0.0.1', SMTP_PORT: smtpPort, MAIL_DEV_INBOX: '1' })) || failed;
  }
} catch (err) {
  console.error(`\n[loopfold] test set-up failed: ${err.message}`);
  failed = true;
}

say('time per suite:');
for (const [name, s] of timings) say(`  ${name.padEnd(12)} ${s.toFixed(1)} s`);
say(failed ? 'FAILED' : 'all suites passed');
// Stops the mail server child, then leaves with the suites' verdict.
shutdown(failed ? 1 : 0);
