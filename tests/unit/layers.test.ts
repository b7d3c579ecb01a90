// Layers point down only (DEVELOPERS.md): pages and routes reach the database through services, never by
// importing the Sequelize instance or a model; models import only the Sequelize instance, their siblings and
// types from pure modules. Read from the source files, so a new page or model that breaks the rule fails here.
import { describe, expect, test } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

const ROOT = join(__dirname, '..', '..');
function filesUnder(dir: string, ext: RegExp): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? filesUnder(p, ext) : ext.test(name) ? [p] : [];
  });
}
function importsOf(file: string): Array<{ from: string; typeOnly: boolean }> {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(/^\s*import\s+(type\s+)?[^'"]*?from\s+['"]([^'"]+)['"]/gm)].map((m) => ({ from: m[2]!, typeOnly: Boolean(m[1]) }));
}

describe('layers', () => {
  test('no page, route, component or layout imports models, the db or sequelize', () => {
    const offenders = ['src/pages', 'src/components', 'src/layouts']
      .flatMap((d) => filesUnder(join(ROOT, d), /\.(astro|ts|tsx)$/))
      .flatMap((f) =>
        importsOf(f)
          .filter((i) => !i.typeOnly && (i.from === '@/models' || i.from.startsWith('@/db') || i.from === 'sequelize'))
          .map((i) => `${relative(ROOT, f)} → ${i.from}`),
      );
    expect(offenders).toEqual([]);
  });

  test('models import only sequelize, the one instance, their siblings, and types', () => {
    const offenders = filesUnder(join(ROOT, 'src/models'), /\.ts$/).flatMap((f) =>
      importsOf(f)
        .filter((i) => !(i.from === 'sequelize' || i.from === '@/db/sequelize' || i.from.startsWith('./') || (i.typeOnly && !i.from.includes('.server'))))
        .map((i) => `${relative(ROOT, f)} → ${i.from}`),
    );
    expect(offenders).toEqual([]);
  });

  test('the check sees imports at all (it would catch a model import in a page)', () => {
    expect(importsOf(join(ROOT, 'src/lib/health.server.ts')).some((i) => i.from === '@/db/sequelize')).toBe(true);
  });
});
