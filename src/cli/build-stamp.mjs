// The build's completion stamp. `astro build` writes the server bundle first and
// the yard's service worker last; a build stopped in between left a server
// bundle newer than every source, which file times took as a finished build.
// So: the stamp is removed before a build starts and written only after the
// build exited cleanly with every expected output present; it records a
// digest of the sources' contents (not their times, which a fresh clone or a
// checkout resets), and a build is fresh only when the stamp and the outputs
// are there and the digest still matches.
//
// Node built-ins only: runs before dependencies are installed.
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync, mkdirSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';

export const BUILD_SOURCES = ['src', 'public', 'astro.config.mjs', 'tailwind.config.mjs', 'auth.config.ts', 'tsconfig.json', 'package-lock.json'];
/** The last thing the build writes is the service worker (src/integrations/yard-service-worker.mjs). */
export const BUILD_OUTPUTS = ['dist/server/entry.mjs', 'dist/client/sw.js'];
export const STAMP = 'dist/.loopfold-build.json';

function files(path) {
  if (!existsSync(path)) return [];
  if (!statSync(path).isDirectory()) return [path];
  return readdirSync(path)
    .sort()
    .flatMap((entry) => files(join(path, entry)));
}

/** SHA-256 over every source file's path and content, in a fixed order. */
export function sourceDigest(root, sources = BUILD_SOURCES) {
  const hash = createHash('sha256');
  for (const file of sources.flatMap((s) => files(join(root, s)))) {
    hash.update(relative(root, file)).update('\0').update(readFileSync(file)).update('\0');
  }
  return hash.digest('hex');
}

/** Whether the last build finished for the sources as they are now, and if not, why. */
export function buildState(root, { sources = BUILD_SOURCES, outputs = BUILD_OUTPUTS } = {}) {
  const stampFile = join(root, STAMP);
  if (!existsSync(stampFile)) return { fresh: false, reason: 'no finished build' };
  let stamp;
  try {
    stamp = JSON.parse(readFileSync(stampFile, 'utf8'));
  } catch {
    return { fresh: false, reason: 'unreadable build stamp' };
  }
  const missing = outputs.filter((o) => !existsSync(join(root, o)));
  if (missing.length) return { fresh: false, reason: `build output missing: ${missing.join(', ')}` };
  if (stamp.digest !== sourceDigest(root, sources)) return { fresh: false, reason: 'sources changed since the last build' };
  return { fresh: true, reason: 'up to date' };
}

/**
 * Runs the build when it is not fresh (or `force`); resolves with what happened.
 * `command`/`args` default to astro's build; tests pass a stand-in.
 */
export function buildIfStale(root, { command, args = [], env = {}, force = false, sources = BUILD_SOURCES, outputs = BUILD_OUTPUTS, say = () => {} } = {}) {
  const state = buildState(root, { sources, outputs });
  if (state.fresh && !force) return Promise.resolve({ built: false, reason: state.reason });
  say(`building the app (${state.reason}) …`);
  const digest = sourceDigest(root, sources); // the sources this build starts from
  rmSync(join(root, STAMP), { force: true });
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { cwd: root, stdio: 'inherit', env: { ...process.env, ...env } });
    child.on('error', reject);
    child.on('exit', (code, signal) => {
      if (code !== 0) return reject(new Error(`build failed (${signal ?? `exit ${code}`})`));
      const missing = outputs.filter((o) => !existsSync(join(root, o)));
      if (missing.length) return reject(new Error(`build finished without ${missing.join(', ')}`));
      mkdirSync(dirname(join(root, STAMP)), { recursive: true });
      writeFileSync(join(root, STAMP), `${JSON.stringify({ digest, finishedAt: new Date().toISOString() })}\n`);
      resolve({ built: true, reason: state.reason });
    });
  });
}
