// Deny by default: every page and route under src/pages must be named by a path
// rule (src/lib/permissions.ts). The list comes from the files, so a new page
// without a rule fails here before it can be open to the wrong role.
import { describe, test, expect } from 'vitest';
import { readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { accessFor, PATH_RULES } from '@/lib/permissions';

const PAGES = new URL('../../src/pages/', import.meta.url).pathname;

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? files(join(dir, e.name)) : [join(dir, e.name)]));
}

/** The URL path a page file answers, with a sample value in each parameter. */
export function routeOf(file: string): string {
  const rel = relative(PAGES, file).replace(/\\/g, '/');
  const withoutExt = rel.replace(/\.(astro|ts|js|mjs|md|mdx|html)$/, '');
  const segments = withoutExt
    .split('/')
    .map((s) => s.replace(/^\[\.\.\.[^\]]+\]$/, 'sample/rest').replace(/\[[^\]]+\]/g, 'sample1'))
    .filter((s, i, all) => !(s === 'index' && i === all.length - 1));
  return `/${segments.join('/')}`;
}

const routes = files(PAGES)
  .filter((f) => /\.(astro|ts|js|mjs|md|mdx|html)$/.test(f))
  .map((f) => ({ file: relative(PAGES, f), path: routeOf(f) }));

describe('every page and route has declared access', () => {
  test('the walk finds the pages (a sanity floor, not a list)', () => {
    expect(routes.length).toBeGreaterThan(40);
    expect(routes.map((r) => r.path)).toContain('/');
    expect(routes.map((r) => r.path)).toContain('/api/fleet/views/sample1');
  });
  test.each(routes.map((r) => [r.file, r.path]))('%s (%s) is named by a rule', (_file, path) => {
    expect(accessFor(path)).not.toBe('denied');
  });
});

describe('deny by default', () => {
  test.each(['/purchasing', '/invoicing', '/api/purchasing', '/api/invoicing/runs', '/x', '/account/other'])('%s, named by no rule, is denied', (path) => {
    expect(accessFor(path)).toBe('denied');
  });
  test('the root is an exact rule: it opens nothing below it', () => {
    expect(accessFor('/')).toBe('signed-in');
    expect(PATH_RULES.find(([p]) => p === '/')?.[2]).toBe('exact');
  });
  test('parameter samples: the route helper', () => {
    expect(routeOf(join(PAGES, 'bins/[grai]/edit.astro'))).toBe('/bins/sample1/edit');
    expect(routeOf(join(PAGES, '8003/[...value].astro'))).toBe('/8003/sample/rest');
    expect(routeOf(join(PAGES, 'api/fleet/bins/export.csv.ts'))).toBe('/api/fleet/bins/export.csv');
    expect(routeOf(join(PAGES, 'fleet/index.astro'))).toBe('/fleet');
  });
});

describe('collection runs', () => {
  test.each([
    ['/planning/runs', 'orders.view'],
    ['/planning/runs/7/sheet', 'orders.view'],
    ['/api/planning/runs/7/status', 'orders.view'], // its POST checks orders.edit itself
    ['/yard/runs/7', 'home.yard'],
    ['/api/yard/runs/7', 'home.yard'],
    ['/api/planning/repositioning/approve', 'orders.edit'],
    ['/api/planning/repositioning/plans/3/withdraw', 'orders.edit'],
  ])('%s needs %s', (path, access) => {
    expect(accessFor(path)).toBe(access);
  });
});
