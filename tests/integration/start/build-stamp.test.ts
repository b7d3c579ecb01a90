// A build stopped half-way is never taken as finished (issue: the server bundle
// was written, the service worker not, and the next run skipped the build).
// The real steps of src/cli/build-stamp.mjs run against a throw-away project
// whose "build" writes the server bundle, then waits, then the service worker.
import { describe, test, expect, beforeEach, afterEach } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, mkdirSync, writeFileSync, existsSync, rmSync, utimesSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { buildState, STAMP } from '@/cli/build-stamp.mjs';

const stampModule = resolve('src/cli/build-stamp.mjs');
const FAKE_BUILD = `
import { mkdirSync, writeFileSync } from 'node:fs';
mkdirSync('dist/server', { recursive: true });
writeFileSync('dist/server/entry.mjs', 'export {};');
console.log('SERVER-BUNDLE-WRITTEN');
await new Promise((r) => setTimeout(r, Number(process.env.FAKE_BUILD_PAUSE ?? 0)));
mkdirSync('dist/client', { recursive: true });
writeFileSync('dist/client/sw.js', '// service worker');
`;
const opts = { sources: ['src'] };

let root: string;
beforeEach(() => {
  root = mkdtempSync(join(tmpdir(), 'loopfold-build-'));
  mkdirSync(join(root, 'src'));
  writeFileSync(join(root, 'src', 'page.ts'), 'export const a = 1;');
  writeFileSync(join(root, 'fake-build.mjs'), FAKE_BUILD);
});
afterEach(() => rmSync(root, { recursive: true, force: true }));

/** Runs buildIfStale() in a child of its own process group; resolves with its output. */
function runBuild(pauseMs: number, killAfter?: string): Promise<{ out: string; code: number | null }> {
  const script = `import(${JSON.stringify(stampModule)}).then((m) => m.buildIfStale(${JSON.stringify(root)}, { command: process.execPath, args: ['fake-build.mjs'], sources: ['src'], say: console.log }))
    .then((r) => console.log('RESULT', JSON.stringify(r)), (e) => { console.log('FAILED', e.message); process.exit(1); });`;
  const child = spawn(process.execPath, ['--input-type=module', '-e', script], { cwd: root, detached: true, env: { ...process.env, FAKE_BUILD_PAUSE: String(pauseMs) } });
  let out = '';
  return new Promise((done) => {
    child.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      // Kill the whole group (the build tool with it), as Ctrl-C or a closed terminal would.
      if (killAfter && out.includes(killAfter)) process.kill(-child.pid!, 'SIGKILL');
    });
    child.on('exit', (code) => done({ out, code }));
  });
}

describe('the build completion stamp', () => {
  test('a build killed after the server bundle and before the service worker is stale, and the next run builds again', async () => {
    const killed = await runBuild(30_000, 'SERVER-BUNDLE-WRITTEN');
    expect(killed.out).not.toContain('RESULT');
    expect(existsSync(join(root, 'dist/server/entry.mjs'))).toBe(true);
    expect(existsSync(join(root, 'dist/client/sw.js'))).toBe(false);
    // The old check: a server bundle newer than every source. It would have said "built".
    const old = new Date(Date.now() - 3_600_000);
    utimesSync(join(root, 'src', 'page.ts'), old, old);
    expect(existsSync(join(root, STAMP))).toBe(false);
    expect(buildState(root, opts)).toEqual({ fresh: false, reason: 'no finished build' });

    const again = await runBuild(0);
    expect(again.out).toContain('building the app (no finished build)');
    expect(again.out).toContain('RESULT {"built":true');
    expect(existsSync(join(root, 'dist/client/sw.js'))).toBe(true);
    expect(buildState(root, opts).fresh).toBe(true);

    const third = await runBuild(0);
    expect(third.out).toContain('RESULT {"built":false');
  });

  test('a changed source, a missing output or a build that fails leaves no fresh stamp', async () => {
    await runBuild(0);
    expect(buildState(root, opts).fresh).toBe(true);
    writeFileSync(join(root, 'src', 'page.ts'), 'export const a = 2;');
    expect(buildState(root, opts)).toEqual({ fresh: false, reason: 'sources changed since the last build' });
    await runBuild(0);
    rmSync(join(root, 'dist/client/sw.js'));
    expect(buildState(root, opts)).toEqual({ fresh: false, reason: 'build output missing: dist/client/sw.js' });
    // A build that exits non-zero writes no stamp.
    writeFileSync(join(root, 'fake-build.mjs'), 'process.exit(3);');
    const failed = await runBuild(0);
    expect(failed.out).toContain('FAILED build failed (exit 3)');
    expect(existsSync(join(root, STAMP))).toBe(false);
  });

  test('the stamp follows content, not file times: touching every source leaves a finished build fresh', async () => {
    await runBuild(0);
    const later = new Date(Date.now() + 60_000);
    utimesSync(join(root, 'src', 'page.ts'), later, later);
    expect(buildState(root, opts).fresh).toBe(true);
  });
});
