import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import type { APIContext } from 'astro';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld, newBin, appErrorOf } from '../support/fixtures';
import { Asset, AuditEntry, Attachment, BinType, ScanEvent } from '@/models';
import { makeGrai } from '@/lib/gs1';
import { IMPORT_COLUMNS } from '@/lib/bins/register-csv';
import { registerBody, registerFromForm } from '@/lib/bins/bin-forms.server';
import { editBody, updateBin, editableBin } from '@/lib/bins/bin-edit.server';
import { commitImport, previewImport, readUpload } from '@/lib/bins/register-import.server';
import { registerCsvStream } from '@/lib/bins/register-export.server';
import { PATCH } from '@/pages/api/bins/[grai]/edit';
import { createHash } from 'node:crypto';

let w: Awaited<ReturnType<typeof poolWorld>>;
let plainType: BinType;
beforeAll(async () => {
  await resetDatabase();
  w = await poolWorld();
  plainType = await BinType.create({
    code: 'T1250',
    name: 'Test bin 1250 L',
    graiAssetType: '12510',
    nominalCapacityL: 1250,
    tareKg: '98',
    maxGrossKg: '1500',
    footprintLengthMm: 1200,
    footprintWidthMm: 1000,
    heightErectedMm: 1330,
    heightFoldedMm: 420,
    unCode: null,
    policyKind: 'own',
    intermediateMonths: 24,
    fullMonths: 48,
  });
});
afterAll(async () => {
  await sequelize.close();
});

const PREFIX = '9529999';
const grai = (serial: string, assetType = '10010') => makeGrai(PREFIX, assetType, serial);
// A mark shaped like the published examples (UN Model Regulations 6.5.2.1.2), of the test bin type's code 31HA2.
const MARK = '31HA2/Y/05 24/NL/Maker 7/2313/1285';
const HEADER = IMPORT_COLUMNS.map((c) => c.name).join(',');
const bytes = (s: string) => new TextEncoder().encode(s);
const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

describe('registering one bin from the form', () => {
  test('a bin with a UN mark gets its month of manufacture from the mark, due dates from its type, a register event and an audit entry', async () => {
    const body = registerBody.parse({ grai: grai('F0001'), binTypeId: w.binType.id, siteId: w.depot.id, unMarking: MARK });
    const out = await registerFromForm(w.planner, body, '10.0.0.9');
    expect(out.groupedGrai).toBe(`0 ${PREFIX} 10010 ${grai('F0001').charAt(13)} · F0001`);
    const asset = (await Asset.findByPk(out.id))!;
    expect(asset.manufactureMonth).toBe('2024-05-01');
    // 30 / 60 months from May 2024, end of month (ADR 6.5.4.4; policy in inspection-due.ts)
    expect([asset.nextIntermediateDue, asset.nextFullDue, asset.nextDue]).toEqual(['2026-11-30', '2029-05-31', '2026-11-30']);
    expect(await ScanEvent.count({ where: { assetId: asset.id, action: 'register' } })).toBe(1);
    const audit = await AuditEntry.findOne({ where: { action: 'bin.register', entityId: String(asset.id) } });
    expect(audit?.userId).toBe(w.planner.id);
    expect(audit?.ip).toBe('10.0.0.9');
    expect(audit?.after).toMatchObject({ grai: grai('F0001'), binType: 'T1000', depot: 'DEP-T1' });
  });

  test("the GRAI can be built from the serial with the operator prefix and the bin type's asset type", async () => {
    const body = registerBody.parse({ graiMode: 'serial', serial: 'S-77', binTypeId: plainType.id, siteId: w.depot2.id, manufactureMonth: '2025-01' });
    const out = await registerFromForm(w.planner, body, null);
    expect(out.grai).toBe(grai('S-77', '12510'));
  });

  test('every problem comes back at once, per field, and nothing is written', async () => {
    const before = await Asset.count();
    const wrongCheck = `${grai('F0002').slice(0, 13) + String((Number(grai('F0002').charAt(13)) + 1) % 10)}F0002`;
    const body = registerBody.parse({
      grai: wrongCheck,
      binTypeId: w.binType.id,
      siteId: w.customerSite.id,
      unMarking: '31HA1/Y/05 24/NL/Maker 7/2313/1285',
      lastFullInspectionMonth: '2019-01',
    });
    const err = await appErrorOf(registerFromForm(w.planner, body, null));
    expect(err.code).toBe('validation_failed');
    const paths = (err.details as Array<{ path: string }>).map((d) => d.path).sort();
    expect(paths).toEqual(['grai', 'lastFullInspectionMonth', 'siteId', 'unMarking']);
    expect(await Asset.count()).toBe(before);
  });

  test('a GRAI already registered is refused on the field the user typed it in', async () => {
    const body = registerBody.parse({ graiMode: 'serial', serial: 'F0001', binTypeId: w.binType.id, siteId: w.depot.id, manufactureMonth: '2024-05' });
    const err = await appErrorOf(registerFromForm(w.planner, body, null));
    expect(err.details).toEqual([{ path: 'serial', message: expect.stringContaining('is already registered') }]);
  });
});

describe('importing the register from CSV', () => {
  const good = (from: number, count: number) => Array.from({ length: count }, (_, i) => `${grai(`I${from + i}`)},T1000,DEP-T1,,${MARK},,`).join('\n');

  test('one bad line: the preview names it, and the commit registers nothing at all', async () => {
    const before = await Asset.count();
    const file = bytes(`${HEADER}\n${good(1, 3)}\n${grai('I9')},T1000,DEP-NOPE,2024-05,,,\n${good(4, 2)}\n`);
    const preview = await previewImport(file);
    expect(preview.counts).toEqual({ total: 6, ready: 5, withProblems: 1 });
    expect(preview.lines.map((l) => l.line)).toEqual([2, 3, 4, 5, 6, 7]);
    expect(preview.lines[3]).toMatchObject({ line: 5, issues: [{ column: 'depot', message: 'Unknown depot "DEP-NOPE".' }] });
    const err = await appErrorOf(commitImport(w.planner, file, { expectedSha256: preview.sha256, filename: 'bins.csv', ip: null }));
    expect(err.code).toBe('unprocessable');
    expect(err.message).toMatch(/1 of 6 lines have problems, so nothing was registered/);
    expect(await Asset.count()).toBe(before);
    expect(await Attachment.count({ where: { purpose: 'import' } })).toBe(0);
  });

  test('the fixed file registers every bin in one go, with its events, the stored file and one audit entry', async () => {
    const before = await Asset.count();
    const file = bytes(`${HEADER}\r\n${good(1, 6)}\r\n${grai('P1', '12510')},t1250,dep-t2,2023-11,,2025-10,\r\n`);
    const preview = await previewImport(file);
    expect(preview.counts).toEqual({ total: 7, ready: 7, withProblems: 0 });
    const out = await commitImport(w.planner, file, { expectedSha256: preview.sha256, filename: 'bins.csv', ip: '10.0.0.7' });
    expect(out.registered).toBe(7);
    expect(await Asset.count()).toBe(before + 7);
    const plain = (await Asset.findOne({ where: { grai: grai('P1', '12510') } }))!;
    expect(plain.siteId).toBe(w.depot2.id);
    // Own policy 24 months from the intermediate test in Oct 2025; 48 from manufacture Nov 2023.
    expect([plain.lastInspectionOn, plain.nextIntermediateDue, plain.nextFullDue]).toEqual(['2025-10-01', '2027-10-31', '2027-11-30']);
    const ids = (await Asset.findAll({ where: { grai: [grai('I1'), grai('I6')] } })).map((a) => a.id);
    expect(await ScanEvent.count({ where: { assetId: ids, action: 'register' } })).toBe(2);
    const stored = (await Attachment.scope('withContent').findByPk(out.attachmentId))!;
    expect(Buffer.from(stored.content).equals(Buffer.from(file))).toBe(true);
    const audit = (await AuditEntry.findOne({ where: { action: 'bins.import', entityId: String(out.attachmentId) } }))!;
    expect(audit.after).toMatchObject({ registered: 7, filename: 'bins.csv', firstGrai: grai('I1') });
  });

  test('GRAIs already in the register refuse the file with their line numbers', async () => {
    const before = await Asset.count();
    const file = bytes(`${HEADER}\n${grai('NEW1')},T1000,DEP-T1,2024-05,,,\n${grai('I3')},T1000,DEP-T1,2024-05,,,\n${grai('NEW1')},T1000,DEP-T1,2024-05,,,\n`);
    const preview = await previewImport(file);
    expect(preview.lines.map((l) => [l.line, l.issues.map((i) => i.message)])).toEqual([
      [2, ['The same GRAI is also on line 4.']],
      [3, ['A bin with this GRAI is already registered.']],
      [4, ['The same GRAI is also on line 2.']],
    ]);
    await appErrorOf(commitImport(w.planner, file, { expectedSha256: preview.sha256, filename: null, ip: null }));
    expect(await Asset.count()).toBe(before);
  });

  test('the commit checks again: a bin registered between preview and commit refuses the whole file', async () => {
    const file = bytes(`${HEADER}\n${grai('R1')},T1000,DEP-T1,2024-05,,,\n${grai('R2')},T1000,DEP-T1,2024-05,,,\n`);
    const preview = await previewImport(file);
    expect(preview.counts.withProblems).toBe(0);
    await registerFromForm(w.planner, registerBody.parse({ grai: grai('R2'), binTypeId: w.binType.id, siteId: w.depot.id, manufactureMonth: '2024-05' }), null);
    const err = await appErrorOf(commitImport(w.planner, file, { expectedSha256: preview.sha256, filename: null, ip: null }));
    const lines = (err.details as { preview: { lines: Array<{ line: number; issues: unknown[] }> } }).preview.lines;
    expect(lines.filter((l) => l.issues.length).map((l) => l.line)).toEqual([3]);
    expect(await Asset.count({ where: { grai: grai('R1') } })).toBe(0);
  });

  test('a file other than the one previewed is refused', async () => {
    const file = bytes(`${HEADER}\n${grai('Q1')},T1000,DEP-T1,2024-05,,,\n`);
    const err = await appErrorOf(commitImport(w.planner, file, { expectedSha256: sha(bytes('something else')), filename: null, ip: null }));
    expect(err.code).toBe('conflict');
    expect(await Asset.count({ where: { grai: grai('Q1') } })).toBe(0);
  });

  test('missing columns, binary content and oversize uploads change nothing', async () => {
    const before = await Asset.count();
    const missing = await appErrorOf(previewImport(bytes(`grai,bin_type\n${grai('M1')},T1000\n`)));
    expect(missing.code).toBe('unprocessable');
    expect(missing.details).toMatchObject({ fileProblem: 'missing_columns', missingColumns: ['depot', 'manufacture_month'] });
    const binary = await appErrorOf(
      commitImport(w.planner, new Uint8Array([0x50, 0x4b, 3, 4, 0, 0]), { expectedSha256: sha(new Uint8Array([0x50, 0x4b, 3, 4, 0, 0])), filename: null, ip: null }),
    );
    expect(binary.code).toBe('unsupported_media_type');
    const declared = await appErrorOf(
      readUpload(new Request('http://x/', { method: 'POST', headers: { 'content-length': String(20 * 1024 * 1024) }, body: 'x' }), 5 * 1024 * 1024),
    );
    expect(declared.code).toBe('payload_too_large');
    expect(declared.message).toMatch(/^The file is 20 MB; the limit is 5 MB/);
    // No Content-Length: the bytes are counted as they arrive.
    const chunk = new Uint8Array(64 * 1024);
    let sent = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(c) {
        if (sent >= 100) return c.close();
        sent += 1;
        c.enqueue(chunk);
      },
    });
    const streamed = await appErrorOf(readUpload(new Request('http://x/', { method: 'POST', body: stream, duplex: 'half' } as RequestInit), 1024 * 1024));
    expect(streamed.code).toBe('payload_too_large');
    expect(sent).toBeLessThan(100);
    expect(await Asset.count()).toBe(before);
  });
});

describe('editing a registered bin', () => {
  test("an edit recomputes the due dates through the bin type's policy and records before and after", async () => {
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const shown = (await editableBin(bin.grai))!;
    const out = await updateBin(
      w.planner,
      bin.grai,
      editBody.parse({
        version: shown.version,
        binTypeId: plainType.id,
        manufactureMonth: '2024-01',
        unMarking: '',
        lastIntermediateTestMonth: '2025-06',
        lastFullInspectionMonth: '',
      }),
      '10.1.1.1',
    );
    expect(out.changed).toBe(true);
    expect(out.version).toBe(shown.version + 1);
    const asset = (await Asset.findByPk(bin.id))!;
    // Own policy of T1250: 24 months from the test in June 2025, 48 from manufacture in January 2024.
    expect([asset.binTypeId, asset.nextIntermediateDue, asset.nextFullDue, asset.nextDue]).toEqual([plainType.id, '2027-06-30', '2028-01-31', '2027-06-30']);
    const audit = (await AuditEntry.findOne({ where: { action: 'bin.update', entityId: String(bin.id) }, order: [['id', 'DESC']] }))!;
    expect(audit.before).toEqual({
      binType: 'T1000',
      lastInspectionOn: null,
      lastLeakTestOn: null,
      nextIntermediateDue: '2026-07-31',
      nextFullDue: '2029-01-31',
      nextDue: '2026-07-31',
    });
    expect(audit.after).toEqual({
      binType: 'T1250',
      lastInspectionOn: '2025-06-01',
      lastLeakTestOn: '2025-06-01',
      nextIntermediateDue: '2027-06-30',
      nextFullDue: '2028-01-31',
      nextDue: '2027-06-30',
    });
    expect(audit.ip).toBe('10.1.1.1');
  });

  test("a form opened before someone else's change is refused as changed meanwhile, and nothing is written", async () => {
    const bin = await newBin(w, { manufactureMonth: '2024-02' });
    const opened = (await editableBin(bin.grai))!;
    await updateBin(w.planner, bin.grai, editBody.parse({ version: opened.version, binTypeId: w.binType.id, manufactureMonth: '2024-03' }), null);
    const audits = await AuditEntry.count();
    const err = await appErrorOf(updateBin(w.planner, bin.grai, editBody.parse({ version: opened.version, binTypeId: w.binType.id, manufactureMonth: '2024-04' }), null));
    expect(err.code).toBe('changed_meanwhile');
    expect(err.status).toBe(409);
    expect((await Asset.findByPk(bin.id))!.manufactureMonth).toBe('2024-03-01');
    expect(await AuditEntry.count()).toBe(audits);
  });

  test('through the endpoint a stale version answers 409 changed_meanwhile', async () => {
    const bin = await newBin(w);
    const { version } = (await editableBin(bin.grai))!;
    const user = {
      id: w.planner.id,
      email: 'p@test.example',
      name: 'P',
      role: 'planner' as const,
      organisationId: w.operator.id,
      organisationName: 'Test Pool',
      homeSiteId: null,
      qualifiedInspector: false,
    };
    const call = (v: number, month: string) => {
      const request = new Request(`http://localhost/api/bins/${bin.grai}/edit`, {
        method: 'PATCH',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({ version: v, binTypeId: w.binType.id, manufactureMonth: month }),
      });
      return PATCH({ request, url: new URL(request.url), params: { grai: bin.grai }, locals: { user, clientAddress: '127.0.0.1' } } as unknown as APIContext);
    };
    expect((await call(version, '2025-12')).status).toBe(200);
    const stale = await call(version, '2025-11');
    expect(stale.status).toBe(409);
    expect(((await stale.json()) as { error: { code: string } }).error.code).toBe('changed_meanwhile');
  });

  test('an edit that changes nothing writes nothing', async () => {
    const bin = await newBin(w, { manufactureMonth: '2024-01' });
    const shown = (await editableBin(bin.grai))!;
    const audits = await AuditEntry.count();
    const out = await updateBin(w.planner, bin.grai, editBody.parse({ version: shown.version, binTypeId: shown.binTypeId, manufactureMonth: shown.manufactureMonth }), null);
    expect(out).toMatchObject({ changed: false, version: shown.version });
    expect(await AuditEntry.count()).toBe(audits);
  });

  test('the GRAI, the status and the site are refused with the reason, before anything is read', () => {
    const r = editBody.safeParse({ version: 0, binTypeId: 1, grai: '0', status: 'retired', siteId: 3 });
    expect(r.success).toBe(false);
    const messages = r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
    expect(messages).toEqual([
      expect.stringMatching(/^grai: The GRAI cannot be edited/),
      expect.stringMatching(/^status: The status cannot be edited: it follows the scan log/),
      expect.stringMatching(/^siteId: The site cannot be edited/),
    ]);
  });
});

describe('exporting the register', () => {
  test('keyset pages: every bin exactly once, in id order, the header once', async () => {
    const reader = registerCsvStream({ pageSize: 4 }).getReader();
    const decoder = new TextDecoder('utf-8', { ignoreBOM: true });
    let text = '';
    let chunks = 0;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks += 1;
      text += decoder.decode(value, { stream: true });
    }
    // The stream is the CSV itself; csvResponse() (src/lib/http/csv-response.ts) puts the byte-order mark before it.
    expect(text.startsWith('grai,serial,bin_type,status,site,customer,')).toBe(true);
    const rows = text.trim().split('\r\n').slice(1);
    const all = await Asset.findAll({ order: [['id', 'ASC']], attributes: ['grai'] });
    expect(rows.map((r) => r.split(',')[0])).toEqual(all.map((a) => a.grai));
    expect(chunks).toBeGreaterThanOrEqual(Math.ceil(all.length / 4));
    const imported = rows.find((r) => r.startsWith(grai('P1', '12510')))!;
    expect(imported).toBe(`${grai('P1', '12510')},P1,T1250,available,DEP-T2,,2023-11,,0,2025-10-01,,2027-10-31,2027-11-30,2027-10-31`);
  });
});
