// Shared steps of `npm start` and `npm test`. Node built-ins only at the top
// level: this runs before dependencies are installed.
import { spawn, spawnSync, execFileSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { randomBytes, createHash } from 'node:crypto';
import { join } from 'node:path';
import { projectRoot } from './postgres.mjs';
import { buildIfStale as buildWhenStale } from './build-stamp.mjs';

export function say(msg) {
  process.stdout.write(`\x1b[1m[loopfold]\x1b[0m ${msg}\n`);
}

/**
 * Installs dependencies when node_modules is missing or was installed from a
 * different lock file (compared by content, so a fresh checkout's new file
 * times do not trigger a reinstall).
 */
export function ensureDependencies() {
  const lock = join(projectRoot, 'package-lock.json');
  const stamp = join(projectRoot, 'node_modules', '.loopfold-lock-sha1');
  const want = createHash('sha1').update(readFileSync(lock)).digest('hex');
  const have = existsSync(stamp) ? readFileSync(stamp, 'utf8').trim() : '';
  if (have === want && existsSync(join(projectRoot, 'node_modules', '.bin', 'astro'))) return;
  say('installing dependencies (npm ci) …');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: projectRoot, stdio: 'inherit' });
  if (r.status !== 0) throw new Error('npm ci failed');
  writeFileSync(stamp, want);
}

/** Installs Debian packages that are missing (needs root; otherwise says what to install). */
export function ensureDebianPackages(pkgs) {
  const missing = pkgs.filter(({ binary }) => !existsSync(binary));
  if (!missing.length) return;
  const names = missing.map((p) => p.name);
  if (process.getuid?.() !== 0) throw new Error(`missing system packages: ${names.join(', ')} (install them with apt-get as root)`);
  say(`installing Debian packages: ${names.join(', ')} …`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...names], { stdio: 'inherit', env });
}

/** A development AUTH_SECRET kept in .loopfold/ so sessions survive restarts. */
export function authSecret() {
  if (process.env.AUTH_SECRET) return process.env.AUTH_SECRET;
  const dir = join(projectRoot, '.loopfold');
  mkdirSync(dir, { recursive: true });
  const file = join(dir, 'auth-secret');
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString('base64url'), { mode: 0o600 });
  return readFileSync(file, 'utf8').trim();
}

export function bin(name) {
  return join(projectRoot, 'node_modules', '.bin', name);
}

/** Runs a command to completion with inherited output; throws on failure. */
export function run(cmd, args, env = {}) {
  const r = spawnSync(cmd, args, { cwd: projectRoot, stdio: 'inherit', env: { ...process.env, ...env } });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed (exit ${r.status})`);
}

export function migrate(databaseUrl) {
  run(bin('sequelize-cli'), ['db:migrate'], { DATABASE_URL: databaseUrl });
}

export function seed(databaseUrl) {
  run(bin('sequelize-cli'), ['db:seed:all'], { DATABASE_URL: databaseUrl });
}

/**
 * Builds the server unless the last build finished for these very sources
 * (a completion stamp, see build-stamp.mjs). Resolves when the build is done,
 * so callers may do other work meanwhile.
 */
export function buildIfStale({ force = false } = {}) {
  return buildWhenStale(projectRoot, { command: bin('astro'), args: ['build'], env: { ASTRO_TELEMETRY_DISABLED: '1' }, force, say });
}

/** Runs `fn` and records how long it took under `name` in `phases` (sync or async). */
export async function timedPhase(phases, name, fn) {
  const t0 = Date.now();
  try {
    return await fn();
  } finally {
    phases.push([name, (Date.now() - t0) / 1000]);
  }
}

/** Starts a long-running child that dies with this process. */
export function startChild(name, cmd, args, env) {
  const child = spawn(cmd, args, { cwd: projectRoot, stdio: ['ignore', 'inherit', 'inherit'], env: { ...process.env, ...env } });
  child.on('exit', (code, signal) => {
    if (!shuttingDown) {
      say(`${name} stopped (${signal ?? code}); shutting down`);
      shutdown(code ?? 1);
    }
  });
  children.push(child);
  return child;
}

const children = [];
let shuttingDown = false;
export function shutdown(code = 0) {
  shuttingDown = true;
  for (const c of children) c.kill('SIGTERM');
  setTimeout(() => process.exit(code), 500);
}
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => shutdown(0));

export async function waitForHttp(url, timeoutMs = 30_000) {
  const t0 = Date.now();
  while (Date.now() - t0 < timeoutMs) {
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}
