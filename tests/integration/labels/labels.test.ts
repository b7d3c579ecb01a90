import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld } from '../support/fixtures';
import { Asset, BinType } from '@/models';
import { registerBin } from '@/lib/bins/bin-register.server';
import { markLabelsPrinted, selectLabelBins } from '@/lib/labels/label-run.server';
import { parseLabelQuery, type LabelSelection } from '@/lib/labels/label-selection';

// Label runs against the real test database. The test world's company prefix is 9529999 (GS1 prefix 952 is
// reserved for demonstrations [memory]). The GRAIs' check digits are written out here, worked by hand with the
// GS1 mod-10 rule (GS1 General Specifications; weights 3,1,3,… from the rightmost digit), so the fixtures do
// not lean on the code under test:
//   952999910010 → 0·3+1·1+0·3+0·1+1·3+9·1+9·3+9·1+9·3+2·1+5·3+9·1 = 102 → check digit 8
//   952999912510 → 0·3+1·1+5·3+2·1+1·3+9·1+9·3+9·1+9·3+2·1+5·3+9·1 = 119 → check digit 1
const TYPE_A = '09529999100108';
const TYPE_B = '09529999125101';
const BASE = 'http://localhost:4321'; // the test world's Digital Link base

let w: Awaited<ReturnType<typeof poolWorld>>;
let typeB: BinType;
const byGrai = new Map<string, Asset>();

async function bin(fixed: string, serial: string, binTypeId: number, siteId: number) {
  const a = await registerBin(w.planner, { grai: fixed + serial, binTypeId, siteId, manufactureMonth: '2026-01' }, { now: new Date('2026-11-01T08:00:00Z') });
  byGrai.set(a.grai, a);
  return a;
}
const serialsOf = (bins: Array<{ serial: string }>) => bins.map((b) => b.serial);
const run = (selection: LabelSelection, limit?: number) => selectLabelBins(selection, { limit });
function selection(input: Record<string, string>): LabelSelection {
  const r = parseLabelQuery(input);
  if (!r.ok || !r.query.selection) throw new Error(`bad test input ${JSON.stringify(r)}`);
  return r.query.selection;
}

beforeAll(async () => {
  await resetDatabase();
  w = await poolWorld();
  typeB = await BinType.create({
    code: 'T1250',
    name: 'Test bin 1250 L',
    graiAssetType: '12510',
    nominalCapacityL: 1250,
    tareKg: '98',
    maxGrossKg: '1500',
    footprintLengthMm: 1200,
    footprintWidthMm: 1000,
    heightErectedMm: 1300,
    heightFoldedMm: 400,
    unCode: null,
  });
  // Type A: serials 95…110 at the first depot, registered out of order; one letter serial.
  for (const s of [103, 95, 110, 99, 100, 101, 102, 96, 97, 98, 104, 105, 106, 107, 108, 109]) await bin(TYPE_A, String(s), w.binType.id, w.depot.id);
  await bin(TYPE_A, 'A0007', w.binType.id, w.depot.id);
  // Type B: serials 100…104 at the second depot (serials repeat across asset types).
  for (const s of [100, 101, 102, 103, 104]) await bin(TYPE_B, String(s), typeB.id, w.depot2.id);
  // One retired, one in quarantine (state set directly: the label query only reads these columns).
  await Asset.update({ status: 'retired' }, { where: { grai: `${TYPE_A}110` } });
  await Asset.update({ status: 'quarantine' }, { where: { grai: `${TYPE_B}104` } });
});
afterAll(async () => {
  await sequelize.close();
});

describe('a range of serials or GRAIs', () => {
  test('digit serials run in numeric order (99 before 100), across bin types when given as serials', async () => {
    const r = await run(selection({ by: 'range', from: '98', to: '101' }));
    expect(r.issues).toEqual([]);
    expect(serialsOf(r.bins)).toEqual(['98', '99', '100', '100', '101', '101']);
    // equal serials: ordered by GRAI, so type A (…10010…) before type B (…12510…)
    expect(r.bins.slice(2, 4).map((b) => b.grai)).toEqual([`${TYPE_A}100`, `${TYPE_B}100`]);
    expect(r.total).toBe(6);
  });

  test('a GRAI at either end keeps the range to that prefix and asset type', async () => {
    const r = await run(selection({ by: 'range', from: `${TYPE_B}101`, to: '103' }));
    expect(r.bins.map((b) => b.grai)).toEqual([`${TYPE_B}101`, `${TYPE_B}102`, `${TYPE_B}103`]);
  });

  test('a Digital Link and a grouped GRAI work as range ends', async () => {
    const r = await run(selection({ by: 'range', from: `${BASE}/8003/${TYPE_A}95`, to: '0 9529999 10010 8 · 97' }));
    expect(serialsOf(r.bins)).toEqual(['95', '96', '97']);
  });

  test('ends given high to low are read low to high, with a note', async () => {
    const r = await run(selection({ by: 'range', from: '110', to: '108' }));
    expect(serialsOf(r.bins)).toEqual(['108', '109', '110']);
    expect(r.notes[0]).toMatch(/from 108 to 110/);
  });

  test('a letter serial range compares text and leaves digit serials out', async () => {
    const r = await run(selection({ by: 'range', from: 'A0000', to: 'A9999' }));
    expect(serialsOf(r.bins)).toEqual(['A0007']);
  });

  test('a wrong GRAI at an end is reported, nothing selected', async () => {
    const r = await run(selection({ by: 'range', from: `${TYPE_A.slice(0, 13)}3100`, to: '105' }));
    expect(r.bins).toEqual([]);
    expect(r.issues).toEqual([{ field: 'from', message: expect.stringMatching(/check digit: 3 given, 8 expected/) }]);
  });
});

describe('a filter', () => {
  test('a site: only bins there, in serial order; retired left out by default', async () => {
    const r = await run(selection({ by: 'filter', site: String(w.depot2.id) }));
    expect(r.bins.map((b) => b.grai)).toEqual(['100', '101', '102', '103', '104'].map((s) => TYPE_B + s));
    expect(r.bins[0]).toMatchObject({ binTypeCode: 'T1250', siteName: 'Second depot', status: 'available', labelPrintedAt: null });
  });

  test('status: in service (default) skips the retired bin; "any" and "retired" take it', async () => {
    const inService = await run(selection({ by: 'filter', type: String(w.binType.id) }));
    expect(inService.total).toBe(16);
    expect(serialsOf(inService.bins)).not.toContain('110');
    expect((await run(selection({ by: 'filter', type: String(w.binType.id), status: 'any' }))).total).toBe(17);
    expect(serialsOf((await run(selection({ by: 'filter', status: 'retired' }))).bins)).toEqual(['110']);
    expect((await run(selection({ by: 'filter', status: 'quarantine' }))).bins.map((b) => b.grai)).toEqual([`${TYPE_B}104`]);
  });

  test('site and bin type together', async () => {
    const r = await run(selection({ by: 'filter', site: String(w.depot.id), type: String(typeB.id) }));
    expect(r.bins).toEqual([]);
    expect(r.total).toBe(0);
  });

  test('more bins than the run limit: nothing laid out, the count reported', async () => {
    const r = await run(selection({ by: 'filter', status: 'any' }), 10);
    expect(r).toMatchObject({ tooMany: true, total: 22, limit: 10, bins: [] });
  });
});

describe('an explicit selection', () => {
  test('ids keep their order; an id that names no bin is reported', async () => {
    const ids = [`${TYPE_B}103`, `${TYPE_A}95`, `${TYPE_A}A0007`].map((g) => byGrai.get(g)!.id);
    const r = await run(selection({ ids: `${ids.join(',')},999999` }));
    expect(r.bins.map((b) => b.id)).toEqual(ids);
    expect(r.unknown).toEqual([{ entry: '999999', reason: 'No bin has id 999999.' }]);
    expect(r.total).toBe(3);
  });

  test('a pasted list in any written form keeps its order; unknown and unreadable entries are reported, repeats counted once', async () => {
    const unregistered = `${TYPE_A}4242`;
    const pasted = [
      `${TYPE_A}102`,
      `${BASE}/8003/${TYPE_B}101`, // as scanned from a label
      '0 9529999 10010 8 · 99', // as read off a label
      `(8003)${TYPE_A}100`,
      unregistered,
      `${TYPE_A.slice(0, 13)}3100`, // wrong check digit
      `${TYPE_A}102`, // pasted twice
    ].join('\n');
    const r = await run(selection({ by: 'list', grais: pasted }));
    expect(r.bins.map((b) => b.grai)).toEqual([`${TYPE_A}102`, `${TYPE_B}101`, `${TYPE_A}99`, `${TYPE_A}100`]);
    expect(r.unknown).toEqual([
      { entry: `${TYPE_A.slice(0, 13)}3100`, reason: expect.stringMatching(/Wrong check digit: 3 given, 8 expected/) },
      { entry: unregistered, reason: `No bin with GRAI ${unregistered} is registered.` },
    ]);
    expect(r.duplicates).toBe(1);
  });

  test('a pasted list longer than the limit is refused with its count', async () => {
    const r = await run(selection({ by: 'list', grais: ['95', '96', '97', '98'].map((s) => TYPE_A + s).join('\n') }), 3);
    expect(r).toMatchObject({ tooMany: true, total: 4, bins: [] });
  });
});

describe('marking labels printed', () => {
  test('sets the print time of exactly those bins, leaves their version alone, reports ids that name no bin', async () => {
    const ids = [`${TYPE_A}95`, `${TYPE_A}96`].map((g) => byGrai.get(g)!.id);
    const before = await Asset.findByPk(ids[0]!);
    const at = new Date('2026-12-02T09:30:00Z');
    const result = await markLabelsPrinted([...ids, ids[0]!, 999999], at);
    expect(result).toEqual({ marked: 2, missing: [999999], printedAt: at });
    const rows = await Asset.findAll({ where: { labelPrintedAt: at }, order: [['id', 'ASC']] });
    expect(rows.map((r) => r.id)).toEqual([...ids].sort((a, b) => a - b));
    const after = await Asset.findByPk(ids[0]!);
    expect(after!.version).toBe(before!.version);
    expect(await Asset.count({ where: { labelPrintedAt: null } })).toBe(20);
  });

  test('"never printed" then leaves them out', async () => {
    const r = await run(selection({ by: 'filter', type: String(w.binType.id), unprinted: '1' }));
    expect(serialsOf(r.bins)).not.toContain('95');
    expect(serialsOf(r.bins)).not.toContain('96');
    expect(r.total).toBe(14);
    expect(r.bins.find((b) => b.serial === '97')?.labelPrintedAt).toBeNull();
  });
});
