// `npm run bench:grid`: the fleet grid at the scale the design asks for — 100,000 bins and 5,000,000 scan
// events — measured through HTTP (built server, signed-in planner) and as bare SQL through `pg`.
//
//   npm run bench:grid                 seed a fresh `loopfold_bench` database, measure, drop it
//   npm run bench:grid -- --keep       keep the database afterwards (the next run with --reuse skips seeding)
//   npm run bench:grid -- --reuse      measure an already seeded `loopfold_bench`
//   npm run bench:grid -- --runs 100   samples per scenario (default 50, after 5 warm-up runs)
//
// Not part of `npm test`. Uses the worktree's own cluster (LOOPFOLD_PG_PORT) and builds the app when stale.
import { freePort } from './free-port.mjs';
import { randomBytes } from 'node:crypto';
import { performance } from 'node:perf_hooks';
import { loadavg, cpus } from 'node:os';
import pg from 'pg';
import bcrypt from 'bcryptjs';
import { startPostgres, ensureDatabase, databaseUrl } from './postgres.mjs';
import { migrate, buildIfStale, say } from './setup.mjs';
import { startServer, signIn } from './bench-support';
import { binsCountQuery, binsPageQuery, parseGridRequest, type GridRequest, type QueryContext } from '@/lib/fleet/grid-query';
import { makeGrai } from '@/lib/gs1';
import { localDate } from '@/lib/calendar';
import { OPERATOR, BIN_TYPES } from '@/db/seed/scenario';

const BINS = 100_000;
const EVENTS = 5_000_000;
const DB = 'loopfold_bench';
const args = process.argv.slice(2);
const keep = args.includes('--keep');
const reuse = args.includes('--reuse');
const runsArg = args.indexOf('--runs');
const RUNS = runsArg >= 0 ? Number(args[runsArg + 1]) : 50;
const WARMUP = 5;
const PASSWORD = randomBytes(12).toString('base64url');
const PLANNER = 'bench.planner@bench.example';

// ---------------------------------------------------------------------------------------------------
// Seeding in bulk: rows are generated inside PostgreSQL (generate_series), secondary indexes and the event
// log's foreign keys are dropped for the load and rebuilt afterwards, then the planner statistics are
// refreshed (ANALYZE) and the visibility map set (VACUUM) so index-only scans are possible.

async function timed<T>(label: string, fn: () => Promise<T>): Promise<T> {
  const t0 = performance.now();
  const out = await fn();
  say(`  ${label.padEnd(44)} ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  return out;
}

async function seed(c: pg.Client) {
  await c.query(`SET synchronous_commit = off; SET maintenance_work_mem = '512MB'; SET max_parallel_maintenance_workers = 2; SET work_mem = '64MB'`);
  await c.query('SELECT setseed(0.4242)');
  await timed('people, places, types, liner lots', async () => {
    await c.query(
      `INSERT INTO settings (operator_name, gs1_company_prefix, gs1_prefix_length, digital_link_base, time_zone, currency, tax_rate, mail_sender)
       VALUES ('Bench Pool', $1, $2, 'http://localhost:4321', $3, 'EUR', 0.21, 'pool@bench.example')`,
      [OPERATOR.gs1CompanyPrefix, OPERATOR.gs1PrefixLength, OPERATOR.timeZone],
    );
    await c.query(`INSERT INTO organisations (name, kind) VALUES ('Bench Pool', 'operator')`);
    await c.query(
      `INSERT INTO organisations (name, kind, free_days) SELECT 'Bench customer ' || lpad(g::text, 2, '0'), 'customer', (ARRAY[7, 14, 21, 30])[1 + g % 4] FROM generate_series(1, 40) g`,
    );
    await c.query(`INSERT INTO sites (organisation_id, code, name, kind) SELECT 1, 'DEP-' || lpad(g::text, 2, '0'), 'Bench depot ' || g, 'depot' FROM generate_series(1, 8) g`);
    await c.query(`INSERT INTO sites (organisation_id, code, name, kind) VALUES (1, 'REP-01', 'Bench repair shop', 'repair')`);
    await c.query(
      `INSERT INTO sites (organisation_id, code, name, kind)
       SELECT o.id, 'CUS-' || lpad(o.id::text, 2, '0') || '-' || s, o.name || ' site ' || s, 'customer'
         FROM organisations o CROSS JOIN generate_series(1, 3) s WHERE o.kind = 'customer'`,
    );
    for (const t of BIN_TYPES) {
      await c.query(
        `INSERT INTO bin_types (code, name, grai_asset_type, nominal_capacity_l, tare_kg, max_gross_kg, footprint_length_mm, footprint_width_mm,
                                height_erected_mm, height_folded_mm, un_code, policy_kind, intermediate_months, full_months)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14)`,
        [
          t.code,
          t.name,
          t.graiAssetType,
          t.nominalCapacityL,
          t.tareKg,
          t.maxGrossKg,
          t.footprintLengthMm,
          t.footprintWidthMm,
          t.heightErectedMm,
          t.heightFoldedMm,
          t.unCode,
          t.policyKind,
          t.intermediateMonths,
          t.fullMonths,
        ],
      );
    }
    await c.query(
      `INSERT INTO liner_lots (supplier, lot_number, spec, quantity_received, received_on, expiry_date, site_id)
       SELECT 'Bench Liners', 'BL' || lpad(g::text, 4, '0'), 'PE bag, 2" valve', 2000, current_date - 200 + g, current_date + 500 + g, 1 + g % 8
         FROM generate_series(1, 200) g`,
    );
    await c.query(`INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at) SELECT id, site_id, 'receipt', quantity_received, received_on FROM liner_lots`);
    const hash = await bcrypt.hash(PASSWORD, 10);
    await c.query(`INSERT INTO users (email, name, password_hash, role, organisation_id) VALUES ($1, 'Bench Planner', $2, 'planner', 1)`, [PLANNER, hash]);
  });

  // Indexes and constraints to rebuild after the load, read from the catalogue so they match the migration.
  const { rows: indexes } = await c.query<{ name: string; def: string }>(
    `SELECT i.indexname AS name, i.indexdef AS def FROM pg_indexes i
      WHERE i.schemaname = 'public' AND i.tablename IN ('assets', 'scan_events')
        AND NOT EXISTS (SELECT 1 FROM pg_constraint k WHERE k.conname = i.indexname)`,
  );
  const { rows: fks } = await c.query<{ name: string; def: string }>(
    `SELECT conname AS name, pg_get_constraintdef(oid) AS def FROM pg_constraint WHERE conrelid = 'scan_events'::regclass AND contype = 'f'`,
  );
  for (const i of indexes) await c.query(`DROP INDEX ${i.name}`);
  for (const f of fks) await c.query(`ALTER TABLE scan_events DROP CONSTRAINT ${f.name}`);

  // filler, company prefix, asset type and check digit; the serial follows
  const graiStem = (t: (typeof BIN_TYPES)[number]) => makeGrai(OPERATOR.gs1CompanyPrefix, t.graiAssetType, 'X').slice(0, -1);
  await timed(`${BINS.toLocaleString('en')} bins`, () =>
    c.query(
      `WITH depots AS (SELECT id, row_number() OVER (ORDER BY id) - 1 AS k FROM sites WHERE kind = 'depot'),
            csites AS (SELECT id, organisation_id, row_number() OVER (ORDER BY id) - 1 AS k FROM sites WHERE kind = 'customer'),
            n AS (SELECT (SELECT count(*) FROM depots) AS nd, (SELECT count(*) FROM csites) AS nc),
            b AS (
              SELECT g, random() AS r, random() AS r2, (random() * 120)::int AS days_here, (random() * 900)::int AS tested_ago
                FROM generate_series(1, $1::int) g
            ),
            s AS (
              SELECT b.*, CASE
                  WHEN r < 0.40 THEN 'available' WHEN r < 0.48 THEN 'prepared' WHEN r < 0.54 THEN 'in_transit'
                  WHEN r < 0.80 THEN 'on_hire' WHEN r < 0.88 THEN 'awaiting_collection' WHEN r < 0.92 THEN 'quarantine'
                  WHEN r < 0.95 THEN 'in_repair' WHEN r < 0.96 THEN 'missing' WHEN r < 0.98 THEN 'retired' ELSE 'available' END AS status
                FROM b
            )
       INSERT INTO assets (grai, serial, bin_type_id, manufacture_month, status, site_id, site_since, customer_id, leg, liner_lot_id,
                           last_scan_at, trip_count, last_inspection_on, last_leak_test_on, last_full_inspection_on, next_intermediate_due, next_full_due, next_due)
       SELECT CASE WHEN g % 5 = 0 THEN $3 ELSE $2 END || lpad(g::text, 7, '0'), lpad(g::text, 7, '0'), 1 + (g % 5 = 0)::int, date_trunc('month', current_date - 400 - (g % 1500))::date, status,
              CASE WHEN status IN ('on_hire', 'awaiting_collection') THEN cs.id WHEN status = 'in_repair' THEN (SELECT id FROM sites WHERE kind = 'repair')
                   WHEN status IN ('in_transit', 'missing') THEN NULL ELSE d.id END,
              CASE WHEN status IN ('in_transit', 'missing') THEN NULL ELSE now() - make_interval(days => days_here, mins => (r2 * 1440)::int) END,
              CASE WHEN status IN ('on_hire', 'awaiting_collection') THEN cs.organisation_id END,
              CASE WHEN status = 'in_transit' THEN 'outbound' END,
              CASE WHEN status IN ('prepared', 'on_hire') THEN 1 + g % 200 END,
              now() - make_interval(days => CASE WHEN status = 'missing' THEN 60 + days_here WHEN status = 'in_transit' THEN 1 ELSE days_here END, mins => (r2 * 1440)::int),
              (r2 * 60)::int,
              current_date - tested_ago, current_date - tested_ago, current_date - tested_ago,
              current_date - tested_ago + interval '30 months', current_date - tested_ago + interval '60 months',
              current_date - tested_ago + interval '30 months'
         FROM s CROSS JOIN n
         JOIN depots d ON d.k = (g / 3) % n.nd
         JOIN csites cs ON cs.k = (g * 7) % n.nc`,
      [BINS, graiStem(BIN_TYPES[0]!), graiStem(BIN_TYPES[1]!)],
    ),
  );

  const {
    rows: [ids],
  } = await c.query(
    `SELECT (SELECT min(id) FROM sites WHERE kind = 'customer') AS "firstCustomerSite", (SELECT count(*)::int FROM sites WHERE kind = 'customer') AS "customerSites",
            (SELECT min(id) FROM sites WHERE kind = 'depot') AS "firstDepot", (SELECT count(*)::int FROM sites WHERE kind = 'depot') AS depots,
            (SELECT id FROM users WHERE email = $1) AS planner`,
    [PLANNER],
  );
  await timed(`${EVENTS.toLocaleString('en')} scan events`, () =>
    c.query(
      `WITH steps(k, action, status_from, status_to) AS (VALUES
          (0, 'prep_check', 'available', 'available'), (1, 'fit_liner', 'available', 'prepared'), (2, 'dispatch', 'prepared', 'in_transit'),
          (3, 'deliver', 'in_transit', 'on_hire'), (4, 'fill_seal', 'on_hire', 'on_hire'), (5, 'discharge', 'on_hire', 'on_hire'),
          (6, 'fold', 'on_hire', 'awaiting_collection'), (7, 'collect', 'awaiting_collection', 'in_transit'), (8, 'receive', 'in_transit', 'available'))
       INSERT INTO scan_events (asset_id, action, occurred_at, recorded_at, site_id, user_id, status_from, status_to)
       SELECT 1 + e % $2::int, st.action, t, t, CASE WHEN st.k IN (3, 4, 5, 6) THEN $3::int + e % $4::int WHEN st.k IN (2, 7) THEN NULL ELSE $5::int + e % $6::int END, $7::int,
              st.status_from, st.status_to
         FROM generate_series(0, $1::int - 1) e
         CROSS JOIN LATERAL (SELECT now() - make_interval(days => 1200 - (e / $2::int) * 24, mins => e % 1440) AS t) tt
         JOIN steps st ON st.k = (e / $2::int) % 9`,
      [EVENTS, BINS, ids.firstCustomerSite, ids.customerSites, ids.firstDepot, ids.depots, ids.planner],
    ),
  );

  await timed('secondary indexes (after the load)', async () => {
    for (const i of indexes) await c.query(i.def);
  });
  await timed('event-log foreign keys (validated once)', async () => {
    for (const f of fks) await c.query(`ALTER TABLE scan_events ADD CONSTRAINT ${f.name} ${f.def}`);
  });
  await timed('VACUUM ANALYZE', async () => {
    await c.query('VACUUM (ANALYZE) assets');
    await c.query('VACUUM (ANALYZE) scan_events');
    await c.query('ANALYZE');
  });
}

// ---------------------------------------------------------------------------------------------------
// Measuring

interface Scenario {
  name: string;
  req: GridRequest;
}

function stats(samples: number[]) {
  const s = [...samples].sort((a, b) => a - b);
  const at = (p: number) => s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)]!;
  return { p50: at(50), p95: at(95), min: s[0]!, max: s[s.length - 1]! };
}

/**
 * Times two ways of doing the same work, alternating run by run, so both meet the same load on the
 * machine (a busy neighbour slows whichever happens to be running, not one of them for a whole series).
 */
async function measurePair(a: () => Promise<unknown>, b: () => Promise<unknown>): Promise<[number[], number[]]> {
  for (let i = 0; i < WARMUP; i++) {
    await a();
    await b();
  }
  const ta: number[] = [];
  const tb: number[] = [];
  const time = async (fn: () => Promise<unknown>, into: number[]) => {
    const t0 = performance.now();
    await fn();
    into.push(performance.now() - t0);
  };
  for (let i = 0; i < RUNS; i++) {
    await time(a, ta);
    await time(b, tb);
  }
  return [ta, tb];
}

async function main() {
  const t0 = performance.now();
  const pgBin = startPostgres();
  const url = databaseUrl(DB);
  const admin = new pg.Client({ connectionString: url.replace(`/${DB}`, '/postgres') });
  await admin.connect();
  const exists = (await admin.query('SELECT 1 FROM pg_database WHERE datname = $1', [DB])).rowCount === 1;
  await admin.end();

  let seeded = false;
  if (reuse && exists) {
    const c = new pg.Client({ connectionString: url });
    await c.connect();
    const n = Number((await c.query('SELECT count(*) AS n FROM assets')).rows[0].n);
    if (n === BINS) {
      // A reused database keeps its bench planner; give it this run's password.
      await c.query('UPDATE users SET password_hash = $1 WHERE email = $2', [await bcrypt.hash(PASSWORD, 10), PLANNER]);
      seeded = true;
      say(`reusing ${DB} (${n.toLocaleString('en')} bins)`);
    }
    await c.end();
  }
  if (!seeded) {
    ensureDatabase(pgBin, DB, { fresh: true });
    say(`migrating ${DB} …`);
    migrate(url);
    say(`seeding ${BINS.toLocaleString('en')} bins and ${EVENTS.toLocaleString('en')} scan events in bulk …`);
    const c = new pg.Client({ connectionString: url });
    await c.connect();
    const s0 = performance.now();
    await seed(c);
    say(`seeding took ${((performance.now() - s0) / 1000).toFixed(1)} s in all`);
    const sizes = await c.query(
      `SELECT pg_size_pretty(pg_database_size(current_database())) AS db, (SELECT count(*) FROM scan_events) AS events, (SELECT count(*) FROM assets) AS bins`,
    );
    say(`database: ${sizes.rows[0].db}, ${Number(sizes.rows[0].bins).toLocaleString('en')} bins, ${Number(sizes.rows[0].events).toLocaleString('en')} scan events`);
    await c.end();
  }

  await buildIfStale();
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = await startServer(url, port);
  const pool = new pg.Pool({ connectionString: url, max: 4 });
  try {
    const cookie = await signIn(base, PLANNER, PASSWORD);
    const {
      rows: [setting],
    } = await pool.query('SELECT time_zone FROM settings');
    const ctx: QueryContext = { timeZone: setting.time_zone, today: localDate(new Date(), setting.time_zone) };
    const {
      rows: [busy],
    } = await pool.query(`SELECT site_id FROM assets WHERE status = 'on_hire' GROUP BY site_id ORDER BY count(*) DESC LIMIT 1`);

    const scenarios: Scenario[] = [
      { name: 'first page (GRAI order)', req: parseGridRequest({ startRow: 0, endRow: 100 }) },
      { name: 'sorted by next test due', req: parseGridRequest({ startRow: 0, endRow: 100, sortModel: [{ colId: 'nextDue', sort: 'asc' }] }) },
      {
        name: 'filtered: on hire at one site',
        req: parseGridRequest({
          startRow: 0,
          endRow: 100,
          filterModel: { status: { filterType: 'set', values: ['on_hire'] }, site: { filterType: 'set', values: [busy.site_id] } },
        }),
      },
      { name: 'deep page (startRow 90,000)', req: parseGridRequest({ startRow: 90_000, endRow: 90_100 }) },
      { name: 'deep page sorted by next due (90,000)', req: parseGridRequest({ startRow: 90_000, endRow: 90_100, sortModel: [{ colId: 'nextDue', sort: 'asc' }] }) },
    ];

    type Result = { name: string; http: ReturnType<typeof stats>; sql: ReturnType<typeof stats>; note: string };
    const results: Result[] = [];
    const get = async <T>(path: string): Promise<T> => {
      const res = await fetch(base + path, { headers: { Cookie: cookie } });
      if (res.status !== 200) throw new Error(`${path}: HTTP ${res.status} ${await res.text()}`);
      return ((await res.json()) as { data: T }).data;
    };
    const qs = (o: Record<string, unknown>) =>
      new URLSearchParams(Object.fromEntries(Object.entries(o).map(([k, v]) => [k, typeof v === 'string' ? v : JSON.stringify(v)]))).toString();

    for (const s of scenarios) {
      const path = `/api/fleet/bins?${qs({ startRow: String(s.req.startRow), endRow: String(s.req.endRow), sortModel: s.req.sortModel, filterModel: s.req.filterModel })}`;
      let body: { rows: Array<{ id: number }>; lastRow: number | null } | null = null;
      const statement = binsPageQuery(s.req, ctx);
      let bareRows: Array<{ id: number }> = [];
      const [http, sql] = await measurePair(
        async () => {
          body = await get(path);
        },
        async () => {
          bareRows = (await pool.query(statement.text, statement.values)).rows;
        },
      );
      const page = body!;
      if (page.rows.map((r) => r.id).join() !== bareRows.map((r) => r.id).join()) throw new Error(`${s.name}: HTTP and bare SQL returned different rows`);
      results.push({ name: s.name, http: stats(http), sql: stats(sql), note: `${page.rows.length} rows` });
    }
    // The grid asks for the size of the filtered set beside the first page of each filter.
    for (const s of [scenarios[0]!, scenarios[2]!]) {
      const path = `/api/fleet/bins/count?${qs({ filterModel: s.req.filterModel })}`;
      let n: number | null = null;
      const statement = binsCountQuery(s.req.filterModel, ctx);
      const [http, sql] = await measurePair(
        async () => {
          n = (await get<{ count: number | null }>(path)).count;
        },
        () => pool.query(statement.text, statement.values),
      );
      results.push({ name: `count: ${s.name.replace(/ \(.*\)$/, '')}`, http: stats(http), sql: stats(sql), note: `count ${n}` });
    }

    // Reference: what any request costs here — no session (health), and a session with a trivial query.
    const reference: Array<{ name: string; t: ReturnType<typeof stats> }> = [];
    for (const [name, path, auth] of [
      ['GET /api/health (no session)', '/api/health', false],
      ['GET /api/fleet/views (session)', '/api/fleet/views', true],
    ] as const) {
      const [t] = await measurePair(
        async () => {
          const res = await fetch(base + path, { headers: auth ? { Cookie: cookie } : {} });
          await res.arrayBuffer();
        },
        async () => undefined,
      );
      reference.push({ name, t: stats(t) });
    }

    const f = (n: number) => n.toFixed(1).padStart(6);
    const load = loadavg()
      .map((l) => l.toFixed(2))
      .join(' ');
    console.log(
      `\nfleet grid, ${BINS.toLocaleString('en')} bins / ${EVENTS.toLocaleString('en')} scan events, ${RUNS} runs each after ${WARMUP} warm-up, HTTP and SQL alternating (ms); ${cpus().length} CPUs, load average ${load}`,
    );
    console.log(
      `${'scenario'.padEnd(40)} ${'HTTP p50'.padStart(8)} ${'p95'.padStart(6)} ${'SQL p50'.padStart(8)} ${'p95'.padStart(6)}  ${'Δp95'.padStart(6)}  ${'result'.padEnd(12)} verdict`,
    );
    let ok = true;
    for (const r of results) {
      const delta = r.http.p95 - r.sql.p95;
      const pass = r.http.p95 <= 50 && delta <= 15;
      ok &&= pass;
      console.log(
        `${r.name.padEnd(40)} ${f(r.http.p50).padStart(8)} ${f(r.http.p95)} ${f(r.sql.p50).padStart(8)} ${f(r.sql.p95)}  ${f(delta)}  ${r.note.padEnd(12)} ${pass ? 'ok' : 'OVER TARGET'}`,
      );
    }
    console.log(`targets: HTTP p95 ≤ 50 ms and ≤ bare SQL p95 + 15 ms → ${ok ? 'met' : 'NOT met'}`);
    for (const r of reference) console.log(`reference ${r.name.padEnd(30)} p50 ${f(r.t.p50)}  p95 ${f(r.t.p95)}`);

    // How the deep page is served (for the record).
    const deep = binsPageQuery(scenarios[3]!.req, ctx);
    const plan = await pool.query(`EXPLAIN (ANALYZE, BUFFERS, COSTS OFF, TIMING OFF, SUMMARY ON) ${deep.text}`, deep.values);
    console.log('\nplan of the deep page:');
    for (const row of plan.rows) console.log(`  ${row['QUERY PLAN']}`);
    say(`bench finished in ${((performance.now() - t0) / 1000).toFixed(0)} s`);
    process.exitCode = ok ? 0 : 1;
  } finally {
    await pool.end();
    server.kill('SIGTERM');
    if (!keep) {
      const a = new pg.Client({ connectionString: url.replace(`/${DB}`, '/postgres') });
      await a.connect();
      await a.query(`DROP DATABASE IF EXISTS ${DB} WITH (FORCE)`);
      await a.end();
      say(`dropped ${DB} (run with --keep to keep it for --reuse)`);
    }
  }
}

main().catch((err) => {
  console.error(`[bench:grid] ${err instanceof Error ? err.stack : err}`);
  process.exit(1);
});
