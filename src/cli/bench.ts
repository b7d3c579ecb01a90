// `npm run bench`: the benchmarks' one home. Not part of `npm test`.
//
//   npm run bench                       the HTTP benchmark below
//   npm run bench -- http --duration 10 seconds per measurement (default 10) · --reuse keeps/reuses the database
//   npm run bench -- grid [--keep|--reuse|--runs N]   the fleet grid at 100,000 bins (src/cli/bench-grid.ts)
//
// The HTTP benchmark seeds the demo scenario (600 bins) into `loopfold_bench_http` on the worktree's cluster,
// builds the app when stale, starts it and measures with autocannon, at 1, 8 and 32 connections, side by side
// in one run: an unauthenticated trivial endpoint (GET /api/health), a signed-in trivial GET
// (GET /api/fleet/views as the demo planner), and scan ingest with real state changes (POST /api/scan-events,
// each connection cycling its own bins through prep check → quarantine → release, every scan an allowed step
// that changes the bin). It prints requests per second, p50 and p99, the ratios against the goals, and what
// PostgreSQL sessions were waiting on during the 32-connection scan run.
import { spawnSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { cpus, loadavg } from 'node:os';
import autocannon from 'autocannon';
import pg from 'pg';
import { freePort } from './free-port.mjs';
import { startPostgres, ensureDatabase, databaseUrl, projectRoot } from './postgres.mjs';
import { migrate, seed, buildIfStale, say } from './setup.mjs';
import { startServer, signIn } from './bench-support';
import { DEMO_LOGINS, DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const argv = process.argv.slice(2);
const sub = argv[0] && !argv[0].startsWith('-') ? argv[0] : 'http';
const rest = sub === argv[0] ? argv.slice(1) : argv;

if (sub === 'grid') {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/bench-grid.ts', ...rest], { cwd: projectRoot, stdio: 'inherit' });
  process.exit(r.status ?? 1);
}
if (sub !== 'http') {
  console.error(`unknown benchmark "${sub}": use http (default) or grid`);
  process.exit(2);
}

const DB = 'loopfold_bench_http';
const durArg = rest.indexOf('--duration');
const DURATION = durArg >= 0 ? Number(rest[durArg + 1]) : 10;
const reuse = rest.includes('--reuse');
const CONNECTIONS = [1, 8, 32];

interface Row {
  name: string;
  connections: number;
  rps: number;
  p50: number;
  p99: number;
  ok: number;
  bad: number;
}

type BinState = { id: number; siteId: number; step: 0 | 1 | 2 };
const CYCLE = ['prep_check', 'quarantine', 'release'] as const;

async function main() {
  const pgBin = startPostgres();
  const url = databaseUrl(DB);
  if (!reuse) ensureDatabase(pgBin, DB, { fresh: true });
  else ensureDatabase(pgBin, DB);
  migrate(url);
  say(`seeding the demo scenario into ${DB} (skipped when seeded) …`);
  seed(url);
  await buildIfStale();

  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = await startServer(url, port);
  const db = new pg.Pool({ connectionString: url, max: 2, application_name: 'loopfold-bench' });
  try {
    const planner = DEMO_LOGINS.find((l) => l.role === 'planner')!;
    const cookie = await signIn(base, planner.email, DEMO_PASSWORD);
    // Bins waiting at a depot whose periodic test is well in date: prep check, quarantine and release all apply.
    const { rows } = await db.query<{ id: number; site_id: number }>(
      `SELECT a.id, a.site_id FROM assets a JOIN sites s ON s.id = a.site_id
        WHERE a.status = 'available' AND NOT a.prep_checked AND s.kind = 'depot' AND (a.next_due IS NULL OR a.next_due > current_date + 60)
        ORDER BY a.id LIMIT 64`,
    );
    if (rows.length < Math.max(...CONNECTIONS)) throw new Error(`only ${rows.length} bins to cycle; need ${Math.max(...CONNECTIONS)}`);
    const bins: BinState[] = rows.map((r) => ({ id: r.id, siteId: r.site_id, step: 0 }));

    const results: Row[] = [];
    const record = (name: string, connections: number, r: autocannon.Result) => {
      const row = { name, connections, rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, ok: r['2xx'], bad: r.non2xx + r.errors + r.timeouts };
      results.push(row);
      // What the failures were: answers by status (other than 2xx), connection errors, timeouts.
      const statuses = Object.entries(r.statusCodeStats ?? {})
        .filter(([code]) => !code.startsWith('2'))
        .map(([code, v]) => `${code}×${v.count}`);
      const why = [...statuses, r.errors ? `errors×${r.errors}` : '', r.timeouts ? `timeouts×${r.timeouts}` : ''].filter(Boolean).join(' ');
      say(
        `  ${name.padEnd(26)} ${String(connections).padStart(2)} conn  ${row.rps.toFixed(0).padStart(5)} req/s  p50 ${row.p50} ms  p99 ${row.p99} ms  ${row.bad ? `${row.bad} failed (${why})` : ''}`,
      );
    };
    const run = (opts: autocannon.Options) => autocannon({ duration: DURATION, ...opts });

    // One short warm-up of each, so the first measurement does not pay for JIT and connection set-up.
    await run({ url: `${base}/api/health`, connections: 4, duration: 2 });
    await run({ url: `${base}/api/fleet/views`, connections: 4, duration: 2, headers: { cookie } });

    let waits = { counts: new Map<string, number>(), samples: 0 };
    for (const connections of CONNECTIONS) {
      record('GET /api/health', connections, await run({ url: `${base}/api/health`, connections }));
      record('GET /api/fleet/views', connections, await run({ url: `${base}/api/fleet/views`, connections, headers: { cookie } }));

      // Each connection takes bins of its own (no two connections scan the same bin). Each bin's step is read
      // back from the database first: a scan still in flight when the last run stopped changed its bin without
      // its answer reaching onResponse, and a stale step would be refused (422) on every later try.
      const { rows: now } = await db.query<{ id: number; status: string }>('SELECT id, status FROM assets WHERE id = ANY($1)', [bins.map((b) => b.id)]);
      const statusOf = new Map(now.map((r) => [r.id, r.status]));
      for (const b of bins) b.step = statusOf.get(b.id) === 'prepared' ? 1 : statusOf.get(b.id) === 'quarantine' ? 2 : 0;
      let next = 0;
      const stop = connections === 32 ? sampleWaits(db) : null;
      const scans = await run({
        url: base,
        connections,
        requests: [
          {
            method: 'POST',
            path: '/api/scan-events',
            headers: { cookie, 'content-type': 'application/json' },
            setupRequest: (req, context) => {
              const ctx = context as { bin?: BinState };
              ctx.bin ??= bins[next++ % bins.length];
              const bin = ctx.bin!;
              const action = CYCLE[bin.step];
              const body = { clientEventId: randomUUID(), assetId: bin.id, action, siteId: bin.siteId, ...(action === 'prep_check' ? { prepResult: 'pass' } : {}) };
              return { ...req, body: JSON.stringify(body) };
            },
            onResponse: (status, _body, context) => {
              const bin = (context as { bin?: BinState }).bin!;
              if (status === 201) bin.step = ((bin.step + 1) % CYCLE.length) as BinState['step'];
            },
          },
        ],
      });
      if (stop) waits = await stop();
      record('POST /api/scan-events', connections, scans);
    }

    const at = (name: string, c: number) => results.find((r) => r.name === name && r.connections === c)!;
    const pct = (a: number, b: number) => `${((a / b) * 100).toFixed(0)} %`;
    console.log(
      `\nHTTP benchmark: ${DURATION} s per row, autocannon; ${cpus().length} CPUs, load average ${loadavg()
        .map((l) => l.toFixed(2))
        .join(' ')}`,
    );
    console.log(
      `${'request'.padEnd(24)} ${'conn'.padStart(4)} ${'req/s'.padStart(7)} ${'p50 ms'.padStart(7)} ${'p99 ms'.padStart(7)} ${'2xx'.padStart(7)} ${'failed'.padStart(7)}`,
    );
    for (const r of results) {
      console.log(
        `${r.name.padEnd(24)} ${String(r.connections).padStart(4)} ${r.rps.toFixed(0).padStart(7)} ${String(r.p50).padStart(7)} ${String(r.p99).padStart(7)} ${String(r.ok).padStart(7)} ${String(r.bad).padStart(7)}`,
      );
    }
    console.log('\nratios against the goals:');
    for (const c of CONNECTIONS) {
      const h = at('GET /api/health', c),
        v = at('GET /api/fleet/views', c),
        s = at('POST /api/scan-events', c);
      console.log(
        `  ${String(c).padStart(2)} conn: signed-in GET / health ${pct(v.rps, h.rps).padStart(5)} (goal ≥ 50 %)   scans / signed-in GET ${pct(s.rps, v.rps).padStart(5)} (goal ≥ 30 %)`,
      );
    }
    const s8 = at('POST /api/scan-events', 8),
      s32 = at('POST /api/scan-events', 32);
    console.log(`  scans p99 at 8 connections ${s8.p99} ms (goal < 100 ms)`);
    console.log(`  scans at 32 / at 8 connections ${pct(s32.rps, s8.rps)} (goal ≥ 100 %)`);
    if (waits.samples) {
      const total = [...waits.counts.values()].reduce((a, b) => a + b, 0);
      console.log(
        `\nthe app's PostgreSQL sessions during the 32-connection scan run: ${(total / waits.samples).toFixed(1)} on average (${waits.samples} samples, every 50 ms), by state and wait:`,
      );
      for (const [k, n] of [...waits.counts].sort((a, b) => b[1] - a[1]).slice(0, 8)) console.log(`  ${(n / waits.samples).toFixed(1).padStart(5)}  ${k}`);
    }
  } finally {
    await db.end();
    server.kill('SIGTERM');
  }
}

/** Samples what the app's PostgreSQL sessions are doing until the returned function is called. */
function sampleWaits(db: pg.Pool): () => Promise<{ counts: Map<string, number>; samples: number }> {
  const counts = new Map<string, number>();
  let running = true;
  let samples = 0;
  const loop = (async () => {
    while (running) {
      const { rows } = await db.query<{ state: string; wait: string | null }>(
        `SELECT state, wait_event_type || ':' || wait_event AS wait FROM pg_stat_activity
          WHERE datname = current_database() AND pid <> pg_backend_pid() AND backend_type = 'client backend' AND application_name <> 'loopfold-bench'`,
      );
      samples += 1;
      for (const r of rows) {
        const key = `${r.state}${r.wait ? ` · ${r.wait}` : ''}`;
        counts.set(key, (counts.get(key) ?? 0) + 1);
      }
      await new Promise((r) => setTimeout(r, 50));
    }
  })();
  return async () => {
    running = false;
    await loop;
    return { counts, samples };
  };
}

main().catch((err) => {
  console.error(`[bench] ${err instanceof Error ? err.stack : err}`);
  process.exit(1);
});
