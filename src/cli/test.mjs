// `npm test`: sets up everything the tests need on this machine, then runs the
// suites in order (lint, unit, integration, browser) and prints how long each took.
//   npm test                       all suites (lint, unit, integration, browser)
//   npm test -- unit integration   only the named suites
//   npm test -- browser -- login   extra arguments after a second -- go to vitest (e.g. a file filter)
import { say, ensureDependencies, ensureDebianPackages, authSecret, migrate, seed, buildIfStale, bin, run, startChild, shutdown } from './setup.mjs';
import { startPostgres, ensureDatabase, databaseUrl, projectRoot } from './postgres.mjs';
import { spawnSync } from 'node:child_process';
import { browserFiles, runBrowserLanes } from './browser-lanes.mjs';
import { workerDatabaseName } from './worker-database.mjs';

const SUITES = ['lint', 'unit', 'integration', 'browser'];
const argv = process.argv.slice(2);
const sep = argv.indexOf('--');
const chosen = (sep >= 0 ? argv.slice(0, sep) : argv).filter((a) => SUITES.includes(a));
const vitestExtra = sep >= 0 ? argv.slice(sep + 1) : [];
const suites = chosen.length ? chosen : SUITES;

// The browser suite runs in lanes side by side (src/cli/browser-lanes.mjs), each with its own database copy and
// mail server; LOOPFOLD_BROWSER_LANES=1 runs it as one.
const browserFilters = vitestExtra.filter((a) => !a.startsWith('-'));
const laneCount =
  suites.includes('browser') && !process.env.TEST_DATABASE_URL
    ? Math.max(1, Math.min(Number(process.env.LOOPFOLD_BROWSER_LANES ?? 2) || 1, browserFiles(projectRoot, browserFilters).length))
    : 1;
const laneDb = (i) => (i === 0 ? 'loopfold_e2e' : `loopfold_e2e_${i + 1}`);
// Integration files run this many at a time, each worker on its own copy of the migrated test database
// (tests/integration/support/worker-database.ts); LOOPFOLD_INTEGRATION_WORKERS=1 runs them one by one.
const integrationWorkers = process.env.TEST_DATABASE_URL ? 1 : Math.max(1, Number(process.env.LOOPFOLD_INTEGRATION_WORKERS ?? 2) || 1);

const timings = [];
function timed(name, fn) {
  const t0 = Date.now();
  try {
    return fn();
  } finally {
    timings.push([name, (Date.now() - t0) / 1000]);
  }
}

/** The vitest arguments for one folder: the project, how many files at a time, the filters and flags after `--`. */
function vitestArgs(folder) {
  // Words after `--` narrow the run to matching files of the folder; flags pass through.
  const filters = vitestExtra.filter((a) => !a.startsWith('-')); // matched anywhere in the path, inside the project
  const flags = vitestExtra.filter((a) => a.startsWith('-'));
  // A browser lane's files share one database: one file at a time (vitest ignores fileParallelism set inside a
  // project, so it is said here). Integration workers each have their own database.
  const serial = folder === 'unit' ? [] : folder === 'integration' && integrationWorkers > 1 ? [`--maxWorkers=${integrationWorkers}`, '--minWorkers=1'] : ['--no-file-parallelism'];
  return ['run', '--project', folder, ...serial, ...filters, ...flags];
}

function vitest(folder, env) {
  const r = spawnSync(bin('vitest'), vitestArgs(folder), { stdio: 'inherit', env: { ...process.env, ...env } });
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
  let testDb, e2eDb, pgBin;
  timed('databases', () => {
    if (process.env.TEST_DATABASE_URL) {
      testDb = process.env.TEST_DATABASE_URL;
      e2eDb = process.env.E2E_DATABASE_URL ?? testDb;
    } else {
      pgBin = startPostgres();
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
      for (let w = 2; w <= integrationWorkers; w += 1) ensureDatabase(pgBin, workerDatabaseName('loopfold_test', w), { fresh: true, template: 'loopfold_test' });
    }
    if (suites.includes('browser')) {
      migrate(e2eDb);
      // A smaller pool than `npm start` seeds (600 bins): the same generator and
      // rules, fewer bins, so the browser suite's set-up stays quick.
      process.env.DEMO_BINS ??= '200';
      seed(e2eDb);
      // Each further lane gets a copy of the seeded database (a template copy takes a second, a seed many).
      for (let i = 1; i < laneCount; i += 1) ensureDatabase(pgBin, laneDb(i), { fresh: true, template: laneDb(0) });
    }
  });

  // Every suite runs even when an earlier one failed (`failed ||= …` would skip the rest), so one run shows all.
  if (suites.includes('lint')) {
    failed = !timed('lint', lint) || failed;
  }
  if (suites.includes('unit')) {
    failed = !timed('unit', () => vitest('unit', env)) || failed;
  }
  // Integration runs before the browser lanes, not beside them: tried side by side on this 2-core machine, both
  // slowed to a crawl (integration 839 s, browser 920 s, against 144 s and 498 s one after the other).
  if (suites.includes('integration')) {
    failed = !timed('integration', () => vitest('integration', { ...env, DATABASE_URL: testDb })) || failed;
  }
  if (suites.includes('browser')) {
    const t0 = Date.now();
    const buildError = await building;
    timings.push(['build (wait)', (Date.now() - t0) / 1000]);
    if (buildError) throw buildError;
    // One local mail server per lane (ports 100 apart), storing into that lane's database.
    const smtpBase = Number(process.env.LOOPFOLD_TEST_SMTP_PORT ?? '2526');
    const lanes = Array.from({ length: laneCount }, (_, i) => {
      const smtpPort = String(smtpBase + i * 100);
      const database = i === 0 ? e2eDb : databaseUrl(laneDb(i));
      startChild(`test mail server ${i + 1}`, process.execPath, ['src/cli/mail-fake.mjs'], { LOOPFOLD_SMTP_PORT: smtpPort, DATABASE_URL: database });
      return { env: { DATABASE_URL: database, SMTP_HOST: '127.0.0.1', SMTP_PORT: smtpPort, MAIL_DEV_INBOX: '1' } };
    });
    await new Promise((r) => setTimeout(r, 800));
    const started = Date.now();
    const passed =
      laneCount === 1
        ? vitest('browser', { ...env, ...lanes[0].env })
        : await runBrowserLanes({
            root: projectRoot,
            vitestBin: bin('vitest'),
            files: browserFiles(projectRoot, browserFilters),
            lanes,
            flags: vitestExtra.filter((a) => a.startsWith('-')),
            baseEnv: env,
          });
    timings.push([laneCount === 1 ? 'browser' : `browser (${laneCount} lanes)`, (Date.now() - started) / 1000]);
    failed = !passed || failed;
  }
} catch (err) {
  console.error(`\n[loopfold] test set-up failed: ${err.message}`);
  failed = true;
}

say('time per suite:');
for (const [name, s] of timings) say(`  ${name.padEnd(18)} ${s.toFixed(1)} s`);
say(failed ? 'FAILED' : 'all suites passed');
// Stops the mail server child, then leaves with the suites' verdict.
shutdown(failed ? 1 : 0);
