// Every CSV route of the app, found from the files under src/pages (names
// ending .csv.ts), fetched over HTTP from the built server with a bin whose
// serial is a spreadsheet formula. No cell may run as a formula when opened
// (OWASP, "CSV Injection": cells starting with = + - @ tab CR), and numeric
// cells must stay numbers. Read with the tests' own RFC 4180 reader.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import type { APIRequestContext, BrowserContext } from 'playwright-core';
import { newContext, signIn, useApp, ROOT } from './support/app';
import { one, closeDb } from './support/db';
import { readCsv, runsAsFormula } from '../unit/support/rfc4180';
import { DEMO_PASSWORD } from '@/db/seed/demo-logins.mjs';

const FORMULA_SERIAL = '=HYPERLINK("a")';

function csvRoutes(dir = join(ROOT, 'src', 'pages')): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...csvRoutes(path));
    else if (name.endsWith('.csv.ts')) out.push(`/${relative(join(ROOT, 'src', 'pages'), path).replace(/\.ts$/, '')}`);
  }
  return out.sort();
}

/**
 * What each route is asked and which of its columns hold the test bin's serial
 * and numbers. A new CSV route fails the sweep until it is described here.
 */
interface RouteSpec {
  path?: string | (() => string);
  query?: string | (() => string);
  serialColumn?: string;
  numberColumns?: string[];
  /** Who asks (default the planner): billing is the admin's, a customer's own statement the customer's. */
  as?: 'admin' | 'customer';
}
/** The demo's first issued statement of the demo customer (the seed issues the month before last). */
let statement: { id: number; month: string };
const ROUTES: Record<string, RouteSpec> = {
  '/api/fleet/reuse.csv': { serialColumn: 'serial', numberColumns: ['rotations_in_period', 'rotations_since_commissioning', 'years_in_service'] },
  '/api/fleet/bins/export.csv': {
    query: `?columns=grai,serial,tripCount,daysAtSite&filterModel=${encodeURIComponent(JSON.stringify({ serial: { filterType: 'text', type: 'equals', filter: FORMULA_SERIAL } }))}`,
    serialColumn: 'Serial',
    numberColumns: ['Trips', 'Days at site'],
  },
  '/bins/export.csv': { serialColumn: 'serial', numberColumns: ['trip_count'] },
  '/bins/import/template.csv': {},
  '/api/liners/moves.csv': { query: '?depot=1' },
  '/api/liners/lots/[id]/trace.csv': { path: '/api/liners/lots/1/trace.csv' }, // the demo's first lot: used up by the first bins
  // Statement amounts are plain decimals, credits and corrections negative ("-7.50"): numbers, never formulas.
  '/api/billing/accounting.csv': { query: () => `?month=${statement.month}`, as: 'admin' },
  '/api/billing/statements/[id].csv': { path: () => `/api/billing/statements/${statement.id}.csv`, as: 'admin' },
  '/api/portal/statements/[id].csv': { path: () => `/api/portal/statements/${statement.id}.csv`, as: 'customer' },
};

let ctx: BrowserContext;
let api: APIRequestContext;
const others: BrowserContext[] = [];
const asWho: Partial<Record<'admin' | 'customer', APIRequestContext>> = {};
const t = useApp();

async function signedIn(email: string): Promise<BrowserContext> {
  const c = await newContext(t.browser, t.app);
  const page = await c.newPage();
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/login'));
  return c;
}

beforeAll(async () => {
  ctx = await signedIn('planner@northmere.example');
  api = ctx.request;
  for (const [who, email] of [
    ['admin', 'admin@northmere.example'],
    ['customer', 'buyer@haldenoils.example'],
  ] as const) {
    const c = await signedIn(email);
    others.push(c);
    asWho[who] = c.request;
  }
  statement = await one<{ id: number; month: string }>(
    `SELECT s.id, to_char(s.period_from, 'YYYY-MM') AS month FROM statements s JOIN users u ON u.organisation_id = s.customer_id WHERE u.email = 'buyer@haldenoils.example' ORDER BY s.id LIMIT 1`,
  );
  const existing = await one<{ id: number } | undefined>('SELECT id FROM assets WHERE serial = $1', [FORMULA_SERIAL]);
  if (!existing) {
    const type = await one<{ id: number }>(`SELECT id FROM bin_types ORDER BY id LIMIT 1`);
    const depot = await one<{ id: number }>(`SELECT id FROM sites WHERE kind = 'depot' ORDER BY id LIMIT 1`);
    const res = await api.post('/api/bins/register', {
      data: {
        graiMode: 'serial',
        serial: FORMULA_SERIAL,
        binTypeId: type.id,
        siteId: depot.id,
        manufactureMonth: '2024-05',
        unMarking: '',
        lastIntermediateTestMonth: '',
        lastFullInspectionMonth: '',
      },
    });
    expect(res.status(), await res.text()).toBe(201);
  }
});
afterAll(async () => {
  for (const c of others) await c.close();
  await ctx?.close();
  await closeDb();
});

describe('CSV exports', () => {
  test('the sweep covers every CSV route under src/pages', () => {
    expect(csvRoutes()).toEqual(Object.keys(ROUTES).sort());
  });

  for (const route of csvRoutes()) {
    test(`${route}: no cell runs as a formula, the formula serial is neutralised, numbers stay numbers`, async () => {
      const spec = ROUTES[route] ?? {};
      const value = (v: string | (() => string) | undefined) => (typeof v === 'function' ? v() : v);
      const res = await (spec.as ? asWho[spec.as]! : api).get((value(spec.path) ?? route) + (value(spec.query) ?? ''));
      expect(res.status(), await res.text()).toBe(200);
      expect(res.headers()['content-type']).toBe('text/csv; charset=utf-8');
      expect(res.headers()['content-disposition']).toMatch(/^attachment; filename="[A-Za-z0-9._-]+\.csv"$/);
      const bytes = await res.body();
      expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]); // UTF-8 byte-order mark
      const rows = readCsv(bytes.toString('utf8'));
      expect(rows.length).toBeGreaterThan(1);
      for (const row of rows) for (const cell of row) expect(runsAsFormula(cell.text), JSON.stringify(cell.text)).toBe(false);
      if (!spec.serialColumn) return;
      const header = rows[0]!.map((c) => c.text);
      const serialAt = header.indexOf(spec.serialColumn);
      expect(serialAt).toBeGreaterThanOrEqual(0);
      const ours = rows.filter((r) => r[serialAt]?.text === `'${FORMULA_SERIAL}`);
      expect(ours.length, 'the bin with the formula serial is in the file, neutralised').toBe(1);
      for (const name of spec.numberColumns ?? []) {
        const at = header.indexOf(name);
        expect(at, name).toBeGreaterThanOrEqual(0);
        const cell = ours[0]![at]!;
        expect(cell.quoted, `${name} is not quoted text`).toBe(false);
        expect(cell.text, name).toMatch(/^-?\d+(\.\d+)?$/);
      }
    });
  }
});
