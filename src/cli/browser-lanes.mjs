// The browser suite in lanes: its files split over N vitest processes that run side by side, each lane with its
// own copy of the e2e database (made from the seeded one as a template) and its own local mail server, so no
// lane sees another's writes. Most of a browser test is waiting (page loads, the server's answers, a reload the
// page announces), so two lanes keep both cores of this machine busy where one left one idle.
// Files are dealt out longest first to the lane with the least work so far (LPT scheduling); the weights are
// the seconds each file added to its lane (laneWallTimes) in the last run here (.loopfold/browser-timings.json,
// written after every run), else in the run recorded in tests/browser/timings.json, else the median of those.
// Node built-ins only: it runs before dependencies may exist.
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync, mkdirSync } from 'node:fs';
import { join, relative } from 'node:path';

/** Every browser test file, relative to the project, in path order; `filters` keep those containing one of them. */
export function browserFiles(root, filters = []) {
  const out = [];
  const walk = (dir) => {
    for (const e of readdirSync(dir)) {
      const p = join(dir, e);
      if (statSync(p).isDirectory()) walk(p);
      else if (e.endsWith('.test.ts')) out.push(relative(root, p));
    }
  };
  walk(join(root, 'tests', 'browser'));
  out.sort();
  return filters.length ? out.filter((f) => filters.some((w) => f.includes(w))) : out;
}

function readTimings(path) {
  try {
    return existsSync(path) ? JSON.parse(readFileSync(path, 'utf8')) : {};
  } catch {
    return {};
  }
}

/** Seconds per file: this machine's last run over the recorded one. */
export function knownTimings(root) {
  return { ...readTimings(join(root, 'tests', 'browser', 'timings.json')), ...readTimings(join(root, '.loopfold', 'browser-timings.json')) };
}

/**
 * Longest processing time first: each file, heaviest first, to the lane with the least work so far. Within a
 * lane the files keep path order. Pure, so the unit test checks it by hand-worked cases.
 */
export function dealFiles(files, lanes, timings) {
  const known = files
    .map((f) => timings[f])
    .filter((s) => typeof s === 'number')
    .sort((a, b) => a - b);
  const median = known.length ? known[Math.floor(known.length / 2)] : 10;
  const weight = (f) => (typeof timings[f] === 'number' ? timings[f] : median);
  const out = Array.from({ length: Math.max(1, Math.min(lanes, files.length)) }, () => ({ files: [], seconds: 0 }));
  for (const f of [...files].sort((a, b) => weight(b) - weight(a) || a.localeCompare(b))) {
    const lane = out.reduce((best, l) => (l.seconds < best.seconds ? l : best), out[0]);
    lane.files.push(f);
    lane.seconds += weight(f);
  }
  for (const l of out) l.files.sort();
  return out;
}

/** Runs a command with every line of its output prefixed (`[lane 1] `), so lanes side by side stay readable. */
function runPrefixed(prefix, cmd, args, env, root) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] });
    for (const stream of [child.stdout, child.stderr]) {
      let rest = '';
      stream.on('data', (chunk) => {
        const text = rest + chunk.toString();
        const lines = text.split('\n');
        rest = lines.pop() ?? '';
        for (const line of lines) process.stdout.write(`${prefix} ${line}\n`);
      });
      stream.on('end', () => rest && process.stdout.write(`${prefix} ${rest}\n`));
    }
    child.on('exit', (code) => resolve(code ?? 1));
  });
}

/**
 * The wall time each file added to its lane, in seconds, from one lane's vitest JSON results. A lane runs its files
 * one after another, and a file's own start and end leave out what came before its start: the fork, importing
 * and collecting its modules (over 90 s for the bad-input sweep on a fresh clone, which imports every route). So a
 * file is weighed from the end of the one before it (the first from its own start). Pure, for the unit test.
 */
export function laneWallTimes(root, testResults) {
  const out = {};
  const runs = testResults.filter((r) => typeof r.startTime === 'number' && typeof r.endTime === 'number').sort((a, b) => a.startTime - b.startTime);
  let previousEnd = runs[0]?.startTime ?? 0;
  for (const r of runs) {
    out[relative(root, r.name)] = Math.round((r.endTime - Math.min(previousEnd, r.startTime)) / 100) / 10;
    previousEnd = r.endTime;
  }
  return out;
}

/** Seconds per file from vitest's JSON reports of the lanes. */
function timingsFromReports(root, paths) {
  const out = {};
  for (const p of paths) Object.assign(out, laneWallTimes(root, readTimings(p).testResults ?? []));
  return out;
}

/**
 * Runs the lanes side by side. `lanes` is a list of { env } (database and mail server per lane); the files go to
 * them by dealFiles(). Resolves true when every lane passed.
 */
export async function runBrowserLanes({ root, vitestBin, files, lanes, flags, baseEnv }) {
  const plan = dealFiles(files, lanes.length, knownTimings(root));
  const reports = plan.map((_, i) => join(root, '.loopfold', `browser-lane-${i + 1}.json`));
  mkdirSync(join(root, '.loopfold'), { recursive: true });
  plan.forEach((lane, i) => process.stdout.write(`[lane ${i + 1}] ${lane.files.length} files, about ${Math.round(lane.seconds)} s by the last timings\n`));
  const codes = await Promise.all(
    plan.map((lane, i) =>
      runPrefixed(
        `[lane ${i + 1}]`,
        vitestBin,
        ['run', '--project', 'browser', '--no-file-parallelism', '--reporter=default', '--reporter=json', `--outputFile.json=${reports[i]}`, ...flags, ...lane.files],
        { ...process.env, ...baseEnv, ...lanes[i].env },
        root,
      ),
    ),
  );
  const measured = timingsFromReports(root, reports);
  if (Object.keys(measured).length)
    writeFileSync(join(root, '.loopfold', 'browser-timings.json'), JSON.stringify({ ...readTimings(join(root, '.loopfold', 'browser-timings.json')), ...measured }, null, 1));
  return codes.every((c) => c === 0);
}
