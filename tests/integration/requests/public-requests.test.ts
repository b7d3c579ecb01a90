// Story 4 on the server: someone without an account reports empties ready for
// collection, or damage with a photo, through the public bin page's forms;
// planners get a mail each and move the request on with optimistic locking.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import type { APIContext } from 'astro';
import { randomUUID } from 'node:crypto';
import { PNG } from 'pngjs';
import { resetDatabase, sequelize } from '../support/db';
import { poolWorld, newBin, makeUser } from '../support/fixtures';
import { startSmtpCapture } from '../support/smtp';
import { recordScan } from '@/lib/scans/scan-service.server';
import { createCollectionRequest, listCollectionRequests, listDamageReports } from '@/lib/requests/requests.server';
import { receivePublicReport } from '@/lib/requests/public-reports.server';
import { Attachment, AuditEntry, CollectionRequest, DamageReport, MailMessage, User } from '@/models';
import { POST as publicPost } from '@/pages/api/public/bins/[grai]/[form]';
import { PATCH as statusPatch } from '@/pages/api/requests/[kind]/[id]';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { HONEYPOT_FIELD } from '@/lib/requests/report-forms';
import { appUrl } from '@/lib/app-url.server';

let w: Awaited<ReturnType<typeof poolWorld>>;
let smtp: Awaited<ReturnType<typeof startSmtpCapture>>;
let plannerUser: SessionUser;
let secondPlannerEmail: string;

beforeAll(async () => {
  process.env.AUTH_SECRET ??= 'test-secret';
  await resetDatabase();
  smtp = await startSmtpCapture();
  w = await poolWorld();
  plannerUser = {
    id: w.planner.id!,
    email: 'p@test.example',
    name: 'Test planner',
    role: 'planner',
    organisationId: w.operator.id,
    organisationName: 'Test Pool',
    homeSiteId: null,
    qualifiedInspector: false,
  };
  secondPlannerEmail = (await makeUser('planner', w.operator.id, { email: 'second-planner@test.example' })).email;
  await makeUser('planner', w.operator.id, { email: 'former-planner@test.example', active: false });
  await makeUser('admin', w.operator.id, { email: 'admin@test.example' });
});
/** Mail to planners goes out after the answer: let the last of it finish before the server and pool close. */
async function mailSettled() {
  let last = -1;
  for (let i = 0; i < 50; i += 1) {
    const [total, queued] = await Promise.all([MailMessage.count(), MailMessage.count({ where: { status: 'queued' } })]);
    if (queued === 0 && total === last) return;
    last = total;
    await new Promise((r) => setTimeout(r, 300));
  }
}

afterAll(async () => {
  await mailSettled();
  await smtp?.stop();
  await sequelize.close();
});

/** A bin delivered to the customer's site and folded there: awaiting collection, on the customer's hire. */
async function binAwaitingCollection() {
  const bin = await newBin(w);
  const steps = [
    [w.yard, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id }],
    [w.yard, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id }],
    [w.yard, { action: 'dispatch', hireOrderId: w.order.id, siteId: w.depot.id }],
    [w.yard, { action: 'deliver', siteId: w.customerSite.id }],
    [w.customerUser, { action: 'fold', siteId: w.customerSite.id }],
  ] as const;
  for (const [actor, input] of steps) await recordScan(actor, { clientEventId: randomUUID(), assetId: bin.id, ...input } as Parameters<typeof recordScan>[1]);
  return bin;
}

function png(width = 4, height = 3): Buffer {
  const image = new PNG({ width, height });
  image.data.fill(200);
  return PNG.sync.write(image);
}

function multipart(fields: Record<string, string>, files: Record<string, { bytes: Uint8Array; name: string; type: string }> = {}): FormData {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  for (const [k, f] of Object.entries(files)) form.append(k, new File([f.bytes as BlobPart], f.name, { type: f.type }));
  return form;
}

async function submit(grai: string, form: 'collection-request' | 'damage-report', body: FormData, ip: string): Promise<Response> {
  const request = new Request(`http://pool.test/api/public/bins/${grai}/${form}`, { method: 'POST', body });
  return publicPost({ request, url: new URL(request.url), params: { grai, form }, locals: { user: null, clientAddress: ip } } as unknown as APIContext) as Promise<Response>;
}

async function patch(kind: string, id: number, body: unknown, user: SessionUser | null = plannerUser): Promise<Response> {
  const request = new Request(`http://pool.test/api/requests/${kind}/${id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return statusPatch({
    request,
    url: new URL(request.url),
    params: { kind, id: String(id) },
    locals: { user, clientAddress: '192.0.2.9' },
  } as unknown as APIContext) as Promise<Response>;
}

const errorOf = async (res: Response) => ((await res.json()) as { error: { code: string; message: string; details?: Array<{ path: string; message: string }> } }).error;
const collectionFields = { quantity: '6', locationNote: 'Gate 3, beside the weighbridge', contactName: 'Mila de Boer', contactPhone: '+31 6 1234 5678' };
const counts = async () => ({
  collections: await CollectionRequest.count(),
  damages: await DamageReport.count(),
  attachments: await Attachment.count(),
});

describe('public collection request', () => {
  test('creates the row linked to the bin, its current site and customer, and mails every active planner once', async () => {
    const bin = await binAwaitingCollection();
    expect(bin.grai).toBeTruthy();
    const outboxBefore = await MailMessage.count({ where: { kind: 'collection_request' } });
    const res = await submit(bin.grai, 'collection-request', multipart(collectionFields), '198.51.100.1');
    expect(res.status).toBe(201);
    expect(await res.json()).toEqual({ data: { received: true } }); // nothing about the bin or its customer comes back

    const row = await CollectionRequest.findOne({ where: { assetId: bin.id } });
    expect(row).toMatchObject({
      source: 'public',
      siteId: w.customerSite.id,
      customerId: w.customer.id,
      quantity: 6,
      locationNote: 'Gate 3, beside the weighbridge',
      contactName: 'Mila de Boer',
      contactPhone: '+31 6 1234 5678',
      contactEmail: null,
      status: 'open',
      requesterIp: '198.51.100.1',
      requestedBy: null,
    });

    // the mail goes out after the answer: one message per active planner, none to the inactive one or the admin
    await expect.poll(async () => MailMessage.count({ where: { kind: 'collection_request' } }), { timeout: 10_000 }).toBe(outboxBefore + 2);
    const outbox = await MailMessage.findAll({ where: { kind: 'collection_request' }, order: [['id', 'ASC']] });
    const firstPlanner = (await User.findByPk(w.planner.id!))!.email;
    expect(outbox.map((m) => m.toAddress).sort()).toEqual([secondPlannerEmail, firstPlanner].sort());
    await expect.poll(() => MailMessage.count({ where: { kind: 'collection_request', status: 'sent' } }), { timeout: 10_000 }).toBe(2);
    const received = smtp.lastTo(secondPlannerEmail)!;
    expect(received.parsed.subject).toBe('Collection request: 6 folded bins at Customer site');
    expect(received.parsed.text).toContain('Where: Customer site (Test Customer)');
    expect(received.parsed.text).toContain(`${appUrl()}/requests`);
    expect(smtp.received.some((m) => m.to.includes('former-planner@test.example') || m.to.includes('admin@test.example'))).toBe(false);
  });

  test('bad input gets a clear message per field and changes nothing', async () => {
    const bin = await binAwaitingCollection();
    const before = await counts();
    const res = await submit(bin.grai, 'collection-request', multipart({ quantity: '0', contactName: 'M' }), '198.51.100.2');
    expect(res.status).toBe(400);
    const error = await errorOf(res);
    expect(error.code).toBe('validation_failed');
    const byField = Object.fromEntries(error.details!.map((d) => [d.path, d.message]));
    expect(byField.quantity).toMatch(/at least one bin/i);
    expect(byField.contactName).toMatch(/your name/i);
    expect(byField.contactPhone).toMatch(/phone number or an e-mail/);
    expect(await counts()).toEqual(before);
    // refused input did not use up the sender's allowance
    expect((await submit(bin.grai, 'collection-request', multipart(collectionFields), '198.51.100.2')).status).toBe(201);
  });

  test('an unknown bin and a label that is not a GRAI are 404, a body that is not multipart is 415', async () => {
    expect((await submit('09521234000019NOPE', 'collection-request', multipart(collectionFields), '198.51.100.3')).status).toBe(404);
    expect((await errorOf(await submit('12345', 'collection-request', multipart(collectionFields), '198.51.100.3'))).message).toMatch(/not a valid bin identity/);
    const bin = await binAwaitingCollection();
    const request = new Request(`http://pool.test/x`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(collectionFields) });
    const res = (await publicPost({
      request,
      url: new URL(request.url),
      params: { grai: bin.grai, form: 'collection-request' },
      locals: { user: null, clientAddress: '198.51.100.3' },
    } as unknown as APIContext)) as Response;
    expect(res.status).toBe(415);
  });

  test('a filled honeypot is thanked like a person but stores nothing and mails nobody', async () => {
    const bin = await binAwaitingCollection();
    // Mail for earlier requests is sent after their answer: let it land before counting.
    const settledMailCount = async () => {
      // Bounded: two equal counts 400 ms apart, or give up after 20 s.
      for (let last = -1, i = 0; i < 50; i += 1) {
        const n = await MailMessage.count();
        if (n === last) return n;
        last = n;
        await new Promise((r) => setTimeout(r, 400));
      }
      throw new Error('mail kept arriving for 20 s');
    };
    const before = { ...(await counts()), mail: await settledMailCount() };
    const res = await submit(bin.grai, 'collection-request', multipart({ ...collectionFields, [HONEYPOT_FIELD]: 'http://spam.example' }), '198.51.100.4');
    expect(res.status).toBe(201);
    // Nothing is sent after the answer either: the count is still the settled one once mail has settled again.
    expect({ ...(await counts()), mail: await settledMailCount() }).toEqual(before);
  });
});

describe('public damage report', () => {
  test('a photo is stored with the type sniffed from its bytes, not the one the phone claimed', async () => {
    const bin = await binAwaitingCollection();
    const bytes = png();
    const res = await submit(
      bin.grai,
      'damage-report',
      multipart(
        { description: 'Cracked floor panel near the valve', contactEmail: 'driver@haulier.example' },
        {
          photo: { bytes, name: 'IMG_0042.jpg', type: 'image/jpeg' },
        },
      ),
      '198.51.100.10',
    );
    expect(res.status).toBe(201);
    const report = await DamageReport.findOne({ where: { assetId: bin.id } });
    expect(report).toMatchObject({
      source: 'public',
      siteId: w.customerSite.id,
      customerId: w.customer.id,
      description: 'Cracked floor panel near the valve',
      contactEmail: 'driver@haulier.example',
      status: 'open',
    });
    const photo = await Attachment.scope('withContent').findByPk(report!.photoId!);
    expect(photo).toMatchObject({ contentType: 'image/png', byteSize: bytes.byteLength, purpose: 'photo', organisationId: null, filename: 'IMG_0042.jpg' });
    expect(Buffer.compare(photo!.content, bytes)).toBe(0);
    await expect.poll(() => MailMessage.count({ where: { kind: 'damage_report' } }), { timeout: 10_000 }).toBe(2);
    const [listed] = (await listDamageReports()).rows;
    expect(listed).toMatchObject({ id: report!.id, photoId: photo!.id, bin: { grai: bin.grai }, site: { name: 'Customer site' }, customer: { name: 'Test Customer' } });
  });

  test('a file that is not an image is refused (415), and neither the report nor the file is stored', async () => {
    const bin = await binAwaitingCollection();
    const before = await counts();
    const fake = new TextEncoder().encode('#!/bin/sh\necho this is not a photo\n');
    const res = await submit(
      bin.grai,
      'damage-report',
      multipart({ description: 'Leaking valve' }, { photo: { bytes: fake, name: 'photo.png', type: 'image/png' } }),
      '198.51.100.11',
    );
    expect(res.status).toBe(415);
    const error = await errorOf(res);
    expect(error.message).toMatch(/not a photo/);
    expect(error.details).toEqual([{ path: 'photo', message: expect.stringMatching(/not a photo/) }]);
    // a PDF is a real file type, but not a photo
    const pdf = new TextEncoder().encode('%PDF-1.4\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n');
    expect(
      (await submit(bin.grai, 'damage-report', multipart({ description: 'Leaking valve' }, { photo: { bytes: pdf, name: 'a.jpg', type: 'image/jpeg' } }), '198.51.100.11')).status,
    ).toBe(415);
    expect(await counts()).toEqual(before);
  });

  test('a photo over 10 MB is refused (413) whether or not the body announces its length', async () => {
    const bin = await binAwaitingCollection();
    const before = await counts();
    const big = new Uint8Array(10 * 1024 * 1024 + 1);
    big.set(png(), 0); // a real PNG header, so only the size is wrong
    const res = await submit(bin.grai, 'damage-report', multipart({ description: 'Large photo' }, { photo: { bytes: big, name: 'big.png', type: 'image/png' } }), '198.51.100.13');
    expect(res.status).toBe(413);
    expect((await errorOf(res)).message).toMatch(/at most 10 MB/);
    const announced = new Request(`http://pool.test/api/public/bins/${bin.grai}/damage-report`, {
      method: 'POST',
      headers: { 'content-type': 'multipart/form-data; boundary=x', 'content-length': String(20 * 1024 * 1024) },
      body: 'ignored',
    });
    const early = (await publicPost({
      request: announced,
      url: new URL(announced.url),
      params: { grai: bin.grai, form: 'damage-report' },
      locals: { user: null, clientAddress: '198.51.100.13' },
    } as unknown as APIContext)) as Response;
    expect(early.status).toBe(413);
    expect(await counts()).toEqual(before);
  });

  test('a damage report without a description is refused', async () => {
    const bin = await binAwaitingCollection();
    const res = await submit(bin.grai, 'damage-report', multipart({ description: ' ' }, { photo: { bytes: png(), name: 'p.png', type: 'image/png' } }), '198.51.100.12');
    expect(res.status).toBe(400);
    expect((await errorOf(res)).details).toEqual([{ path: 'description', message: expect.stringMatching(/what is wrong/i) }]);
    expect(await Attachment.count({ where: { filename: 'p.png' } })).toBe(0);
  });
});

describe('flood protection', () => {
  test('the 6th report within an hour from one address gets 429 with a clear message, and nothing is stored', async () => {
    const bins = [await binAwaitingCollection(), await binAwaitingCollection(), await binAwaitingCollection()];
    const ip = '203.0.113.50';
    for (let i = 0; i < 5; i += 1) {
      const res =
        i % 2 === 0
          ? await submit(bins[i % 3]!.grai, 'collection-request', multipart(collectionFields), ip)
          : await submit(bins[i % 3]!.grai, 'damage-report', multipart({ description: `Dent number ${i}` }), ip);
      expect(res.status).toBe(201);
    }
    const before = await counts();
    const sixth = await submit(bins[2]!.grai, 'damage-report', multipart({ description: 'One too many' }, { photo: { bytes: png(), name: 'flood.png', type: 'image/png' } }), ip);
    expect(sixth.status).toBe(429);
    expect(Number(sixth.headers.get('Retry-After'))).toBeGreaterThan(0);
    expect(Number(sixth.headers.get('Retry-After'))).toBeLessThanOrEqual(3600);
    const error = await errorOf(sixth);
    expect(error.code).toBe('rate_limited');
    expect(error.message).toMatch(/Too many reports from your connection within an hour\. Nothing was sent; try again in about \d+ minutes?/);
    // and again: now refused before the body is even read
    expect((await submit(bins[0]!.grai, 'collection-request', multipart(collectionFields), ip)).status).toBe(429);
    expect(await counts()).toEqual(before);
    // another address is not affected
    expect((await submit(bins[0]!.grai, 'collection-request', multipart(collectionFields), '203.0.113.51')).status).toBe(201);
  });

  test('one bin takes at most 10 public reports a day, from however many addresses', async () => {
    const bin = await binAwaitingCollection();
    for (let i = 0; i < 10; i += 1) {
      expect((await submit(bin.grai, 'collection-request', multipart(collectionFields), `203.0.113.${100 + i}`)).status).toBe(201);
    }
    const before = await counts();
    const res = await submit(bin.grai, 'collection-request', multipart(collectionFields), '203.0.113.200');
    expect(res.status).toBe(429);
    expect((await errorOf(res)).message).toMatch(/This bin has had many reports today/);
    expect(await counts()).toEqual(before);
  });

  test('the page and the API share the same intake (the form named in the body)', async () => {
    const bin = await binAwaitingCollection();
    const request = new Request('http://pool.test/8003/x', { method: 'POST', body: multipart({ form: 'damage', description: 'Lid missing' }) });
    const result = await receivePublicReport({
      bin: { id: bin.id, grai: bin.grai, serial: bin.serial, customerId: w.customer.id, status: 'awaiting_collection' },
      request,
      clientAddress: '198.51.100.77',
      userId: null,
    });
    expect(result.ok).toBe(true);
    if (result.ok) expect(await result.delivery).toHaveLength(2);
    expect(await DamageReport.count({ where: { assetId: bin.id, description: 'Lid missing' } })).toBe(1);
  });
});

describe('planners move requests on', () => {
  test('a status step bumps the version and is audited; a stale version gets 409 and changes nothing', async () => {
    const bin = await binAwaitingCollection();
    const { id, delivery } = await createCollectionRequest({
      source: 'planner',
      assetId: bin.id,
      quantity: 3,
      locationNote: null,
      contactName: 'Desk',
      contactPhone: null,
      contactEmail: null,
      note: null,
      requestedBy: w.planner.id!,
      requesterIp: null,
    });
    await delivery;
    const loaded = (await CollectionRequest.findByPk(id))!;
    const ok = await patch('collection', id, { status: 'scheduled', version: loaded.version });
    expect(ok.status).toBe(200);
    const { data } = (await ok.json()) as { data: { status: string; version: number } };
    expect(data).toEqual({ id, status: 'scheduled', version: loaded.version + 1 });
    const audit = await AuditEntry.findOne({ where: { entityType: 'collection_request', entityId: String(id) } });
    expect(audit).toMatchObject({ action: 'collection_request.status', userId: w.planner.id, ip: '192.0.2.9', before: { status: 'open' }, after: { status: 'scheduled' } });

    const stale = await patch('collection', id, { status: 'cancelled', version: loaded.version });
    expect(stale.status).toBe(409);
    const error = await errorOf(stale);
    expect(error.code).toBe('changed_meanwhile');
    expect(error.message).toMatch(/it is now scheduled/);
    expect((await CollectionRequest.findByPk(id))!.status).toBe('scheduled');
    expect(await AuditEntry.count({ where: { entityType: 'collection_request', entityId: String(id) } })).toBe(1);

    // done is final
    expect((await patch('collection', id, { status: 'done', version: data.version })).status).toBe(200);
    const refused = await patch('collection', id, { status: 'open', version: data.version + 1 });
    expect(refused.status).toBe(422);
    expect((await errorOf(refused)).message).toBe('It is collected and cannot change any more.');
  });

  test('damage reports step open → triaged → closed; words of the other kind are refused', async () => {
    const bin = await binAwaitingCollection();
    await submit(bin.grai, 'damage-report', multipart({ description: 'Bent corner post' }), '198.51.100.90');
    const report = (await DamageReport.findOne({ where: { assetId: bin.id } }))!;
    expect((await patch('damage', report.id, { status: 'scheduled', version: report.version })).status).toBe(400);
    expect((await patch('damage', report.id, { status: 'triaged', version: report.version })).status).toBe(200);
    expect((await patch('damage', report.id, { status: 'closed', version: report.version + 1 })).status).toBe(200);
    expect((await DamageReport.findByPk(report.id))!.status).toBe('closed');
    expect((await patch('damage', 999999, { status: 'closed', version: 0 })).status).toBe(404);
  });

  test('only planners and admins may change a status', async () => {
    const bin = await binAwaitingCollection();
    const { id, delivery } = await createCollectionRequest({
      source: 'portal',
      assetId: bin.id,
      quantity: 1,
      locationNote: null,
      contactName: 'Buyer',
      contactPhone: null,
      contactEmail: 'b@test.example',
      note: null,
      requestedBy: w.customerUser.id!,
      requesterIp: null,
    });
    await delivery;
    const customer: SessionUser = { ...plannerUser, id: w.customerUser.id!, role: 'customer', organisationId: w.customer.id };
    const yard: SessionUser = { ...plannerUser, id: w.yard.id!, role: 'yard' };
    expect((await patch('collection', id, { status: 'cancelled', version: 0 }, customer)).status).toBe(403);
    expect((await patch('collection', id, { status: 'cancelled', version: 0 }, yard)).status).toBe(403);
    expect((await patch('collection', id, { status: 'cancelled', version: 0 }, null)).status).toBe(401);
    expect((await CollectionRequest.findByPk(id))!.status).toBe('open');
  });

  test("the planners' lists are newest first and hide finished requests unless asked for all", async () => {
    const all = await listCollectionRequests({ filter: 'all' });
    const times = all.rows.map((r) => r.createdAt);
    expect([...times].sort().reverse()).toEqual(times);
    const unfinished = await listCollectionRequests();
    expect(unfinished.rows.every((r) => r.status === 'open' || r.status === 'scheduled')).toBe(true);
    expect(all.total).toBeGreaterThan(unfinished.total);
    expect(all.rows[0]).toMatchObject({
      kind: 'collection',
      bin: { grai: expect.any(String), serial: expect.any(String) },
      site: { name: 'Customer site' },
      customer: { name: 'Test Customer' },
    });
  });
});
