// `npm start`: from a fresh clone to a seeded, running Loopfold.
// Installs what is missing, starts PostgreSQL (unless DATABASE_URL points
// elsewhere) and the local mail server (unless SMTP_HOST does), migrates,
// seeds the demo scenario when the database is empty (building the app
// meanwhile), serves, and prints how long each phase took.
import { say, ensureDependencies, authSecret, migrate, seed, buildIfStale, startChild, waitForHttp, shutdown, timedPhase } from './setup.mjs';
import { startPostgres, ensureDatabase, databaseUrl, projectRoot } from './postgres.mjs';
import { prepareHttps, waitForHttps } from './https.mjs';
import { LOCAL_FAKE_KEYS } from './pay-fake-keys.mjs';

const phases = [];
const started = Date.now();
try {
  await timedPhase(phases, 'dependencies', ensureDependencies);
  // The build needs no database: it runs while PostgreSQL starts, migrates and seeds.
  const buildStarted = Date.now();
  const building = buildIfStale().then(
    (r) => ({ ...r, seconds: (Date.now() - buildStarted) / 1000 }),
    (err) => ({ err }),
  );

  const env = { AUTH_SECRET: authSecret(), ASTRO_TELEMETRY_DISABLED: '1' };
  if (process.env.DATABASE_URL) {
    say('using the PostgreSQL server in DATABASE_URL');
    env.DATABASE_URL = process.env.DATABASE_URL;
  } else {
    await timedPhase(phases, 'database server', () => {
      const pgBin = startPostgres();
      ensureDatabase(pgBin, 'loopfold');
    });
    env.DATABASE_URL = databaseUrl('loopfold');
  }
  Object.assign(process.env, env);

  if (!process.env.SMTP_HOST) {
    const smtpPort = process.env.LOOPFOLD_SMTP_PORT ?? '2525';
    env.SMTP_HOST = '127.0.0.1';
    env.SMTP_PORT = smtpPort;
    env.MAIL_DEV_INBOX = '1';
    startChild('mail server', process.execPath, ['src/cli/mail-fake.mjs'], { LOOPFOLD_SMTP_PORT: smtpPort });
  }

  say('migrating the database …');
  await timedPhase(phases, 'migrations', () => migrate(env.DATABASE_URL));
  say('seeding the demo scenario (skipped when seeded; redone when an earlier seed was interrupted) …');
  await timedPhase(phases, 'demo seed', () => seed(env.DATABASE_URL));
  const build = await timedPhase(phases, 'build (wait after seed)', () => building);
  if (build.err) throw build.err;
  phases.push([build.built ? 'build (in parallel, whole)' : 'build (up to date, skipped)', build.seconds]);

  const port = process.env.PORT ?? '4321';
  // HTTPS=1: phones on the yard LAN get a secure context (camera, offline); see src/cli/https.mjs.
  const tls = process.env.HTTPS === '1' ? await prepareHttps({ projectRoot, port }) : null;
  const host = process.env.HOST ?? (tls ? '0.0.0.0' : 'localhost');
  const scheme = tls ? 'https' : 'http';
  const appUrl = process.env.APP_URL ?? `${scheme}://${host === '0.0.0.0' ? 'localhost' : host}:${port}`;
  env.APP_URL = appUrl;
  // Online payment: the provider's SDK pointed at the local fake, unless a provider key is configured.
  if (!process.env.PAYMENTS_SECRET_KEY) {
    const payPort = process.env.LOOPFOLD_PAY_FAKE_PORT ?? '4410';
    Object.assign(env, {
      PAYMENTS_SECRET_KEY: LOCAL_FAKE_KEYS.secretKey,
      PAYMENTS_WEBHOOK_SECRET: LOCAL_FAKE_KEYS.webhookSecret,
      PAYMENTS_API_HOST: '127.0.0.1',
      PAYMENTS_API_PORT: payPort,
      PAYMENTS_API_PROTOCOL: 'http',
    });
    startChild('payment provider (local fake)', process.execPath, ['src/cli/pay-fake.mjs'], {
      ...env,
      LOOPFOLD_PAY_FAKE_PORT: payPort,
      PAY_FAKE_WEBHOOK_URL: `http://127.0.0.1:${port}/api/payments/webhook`,
    });
  }
  startChild('job worker', process.execPath, ['--import', 'tsx', 'src/cli/worker.ts'], env);
  startChild('app server', process.execPath, ['src/cli/serve.mjs'], { ...env, ...tls?.env, HOST: host, PORT: port });
  const waitUp = tls ? waitForHttps : waitForHttp;
  await timedPhase(phases, 'server up', () => waitUp(`${scheme}://127.0.0.1:${port}/api/health`, 60_000).catch(() => waitUp(`${appUrl}/api/health`, 5_000)));

  const { DEMO_LOGINS, DEMO_PASSWORD, SECOND_CUSTOMER_LOGIN } = await import('../db/seed/demo-logins.mjs');
  say(`Loopfold is running at ${appUrl}`);
  if (tls) {
    say(`Phones on this network: ${tls.urls.slice(1).join('  ') || '(no LAN address found)'}`);
    if (tls.caUrls.length) say(`Trust the local certificate on each phone once: open ${tls.caUrls.join('  ')} (README: "Phones on the yard: HTTPS")`);
  }
  say(`Sign in with one of these demo accounts (password "${DEMO_PASSWORD}"):`);
  for (const l of DEMO_LOGINS) say(`  ${l.role.padEnd(9)} ${l.email}`);
  say(`  ${'customer'.padEnd(9)} ${SECOND_CUSTOMER_LOGIN.email} (another customer organisation: ${SECOND_CUSTOMER_LOGIN.organisation})`);
  if (env.MAIL_DEV_INBOX) say('Mail goes to the local mailbox: sign in as admin and open "Sent mail".');
  say('Stop with Ctrl-C; stop PostgreSQL too with `npm run db:stop`.');
  say('time per phase:');
  for (const [name, sec] of phases) say(`  ${name.padEnd(28)} ${sec.toFixed(1)} s`);
  say(`  ${'serving after'.padEnd(28)} ${((Date.now() - started) / 1000).toFixed(1)} s`);
} catch (err) {
  console.error(`\n[loopfold] start failed: ${err.message}`);
  shutdown(1);
}
