// What a hostile client can do over raw HTTP against the built server
// (src/cli/serve.mjs + the app): forge X-Forwarded-For, stream a huge chunked
// upload, claim HTTPS with X-Forwarded-Proto. Each request goes out from its
// own loopback address (127.0.0.0/8 all reach the server on Linux), so the
// per-address limits here never touch the other browser tests' 127.0.0.1.
import { describe, test, expect, afterAll, beforeAll } from 'vitest';
import { request as httpRequest, type IncomingMessage } from 'node:http';
import { readFileSync } from 'node:fs';
import { startApp, type RunningApp } from './support/app';
import { db, one, closeDb } from './support/db';

let trusting: RunningApp | null = null;
let plain: RunningApp;

beforeAll(async () => {
  plain = await startApp();
  trusting = await startApp({ TRUST_PROXY: '1' });
});
afterAll(async () => {
  await plain?.dispose();
  await trusting?.dispose();
  await closeDb();
});

let nextHost = 10 + Math.floor(Math.random() * 200);
/** A loopback address of its own for each test. */
function ownAddress(): string {
  nextHost = (nextHost % 250) + 2;
  return `127.0.${Math.floor(Math.random() * 250) + 1}.${nextHost}`;
}

interface Answer {
  status: number;
  headers: IncomingMessage['headers'];
  body: string;
}

function send(app: RunningApp, path: string, opts: { method?: string; headers?: Record<string, string>; body?: Buffer | string; from: string }): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = httpRequest(
      { host: '127.0.0.1', port: app.port, path, method: opts.method ?? 'GET', headers: { Origin: `http://127.0.0.1:${app.port}`, ...opts.headers }, localAddress: opts.from },
      (res) => {
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (c) => (body += c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body }));
      },
    );
    req.on('error', reject);
    req.end(opts.body);
  });
}

function multipart(fields: Record<string, string>): { body: Buffer; type: string } {
  const boundary = `----loopfold${Date.now().toString(36)}`;
  const parts = Object.entries(fields).map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`);
  return { body: Buffer.from(`${parts.join('')}--${boundary}--\r\n`), type: `multipart/form-data; boundary=${boundary}` };
}

/** A bin no other test reports on (the per-bin limit is 10 a day). */
async function quietBin(offset: number): Promise<{ id: number; grai: string }> {
  // Out with a customer (a bin in our depot has nothing to collect), no report about it in the last day, so reruns
  // against the same database start from a fresh per-bin count.
  const bin = await one<{ id: number; grai: string; site_id: number | null }>(
    `SELECT a.id, a.grai, a.site_id FROM assets a
      WHERE a.status IN ('on_hire', 'awaiting_collection')
        AND NOT EXISTS (SELECT 1 FROM collection_requests c WHERE c.asset_id = a.id AND c.created_at > now() - interval '1 day')
        AND NOT EXISTS (SELECT 1 FROM damage_reports d WHERE d.asset_id = a.id AND d.created_at > now() - interval '1 day')
      ORDER BY a.id DESC LIMIT 1 OFFSET $1`,
    [offset],
  );
  // Nothing open at its site that its reports would join (merged requests): they make their own request.
  await db().query(`UPDATE collection_requests SET status = 'cancelled' WHERE site_id = $1 AND status IN ('open', 'scheduled')`, [bin.site_id]);
  return bin;
}

describe('the client address is the socket, not X-Forwarded-For (TRUST_PROXY unset)', () => {
  test('a forged X-Forwarded-For no longer escapes the public form limit, and requester_ip is the socket', async () => {
    const bin = await quietBin(3);
    const from = ownAddress();
    const since = new Date(Date.now() - 1000);
    const statuses: number[] = [];
    for (let n = 1; n <= 7; n++) {
      const form = multipart({ quantity: '2', contactName: 'Probe Tester', contactPhone: '+44 1632 960000' });
      const res = await send(plain, `/api/public/bins/${bin.grai}/collection-request`, {
        method: 'POST',
        from,
        body: form.body,
        headers: { 'Content-Type': form.type, 'X-Forwarded-For': `203.0.113.${n}` },
      });
      statuses.push(res.status);
    }
    // 5 reports per address an hour (src/lib/server/rate-limits.ts): the sixth and seventh are refused.
    expect(statuses).toEqual([201, 201, 201, 201, 201, 429, 429]);
    // The five accepted reports for one bin are one request holding five reports (merged), from the socket address.
    const stored = await db().query<{ requester_ip: string; report_count: number }>(
      `SELECT requester_ip, report_count FROM collection_requests WHERE asset_id = $1 AND created_at >= $2`,
      [bin.id, since],
    );
    expect(stored.rows).toEqual([{ requester_ip: from, report_count: 5 }]);
  });

  test('X-Forwarded-Proto from a client does not make the answer HTTPS (no HSTS over plain HTTP)', async () => {
    const res = await send(plain, '/login', { from: ownAddress(), headers: { 'X-Forwarded-Proto': 'https' } });
    expect(res.status).toBe(200);
    expect(res.headers['strict-transport-security']).toBeUndefined();
  });
});

describe('a failed sign-in posted as a plain form (no X-Auth-Return-Redirect)', () => {
  test('answers with a redirect back to the sign-in page, not a 500 (the middleware copies immutable headers)', async () => {
    const from = ownAddress();
    const csrf = await send(plain, '/api/auth/csrf', { from });
    const token = (JSON.parse(csrf.body) as { csrfToken: string }).csrfToken;
    const cookie = ([] as string[])
      .concat(csrf.headers['set-cookie'] ?? [])
      .map((c) => c.split(';')[0])
      .join('; ');
    const res = await send(plain, '/api/auth/callback/credentials', {
      method: 'POST',
      from,
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: cookie },
      body: new URLSearchParams({ csrfToken: token, email: 'nobody@example.org', password: 'wrong-password-1' }).toString(),
    });
    expect(res.status).toBeGreaterThanOrEqual(300);
    expect(res.status).toBeLessThan(400);
    expect(res.headers.location).toMatch(/\/login|error=/);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
  });
});

describe('behind one trusted proxy (TRUST_PROXY=1)', () => {
  test('the rightmost X-Forwarded-For entry is the client; the leftmost (client-written) one is never used', async () => {
    const bin = await quietBin(4);
    const form = multipart({ quantity: '1', contactName: 'Proxy Tester', contactEmail: 'proxy@example.org' });
    const res = await send(trusting!, `/api/public/bins/${bin.grai}/collection-request`, {
      method: 'POST',
      from: ownAddress(),
      body: form.body,
      headers: { 'Content-Type': form.type, 'X-Forwarded-For': '203.0.113.66, 198.51.100.23' },
    });
    expect(res.status).toBe(201);
    const row = await one<{ requester_ip: string }>(`SELECT requester_ip FROM collection_requests WHERE asset_id = $1 ORDER BY id DESC LIMIT 1`, [bin.id]);
    expect(row.requester_ip).toBe('198.51.100.23');
  });

  test('HSTS when the trusted proxy says it terminated TLS, not when it says plain HTTP', async () => {
    const tlsEdge = await send(trusting!, '/login', { from: ownAddress(), headers: { 'X-Forwarded-Proto': 'https', 'X-Forwarded-For': '198.51.100.24' } });
    expect(tlsEdge.status).toBe(200);
    // RFC 6797 §6.1: max-age in seconds.
    expect(tlsEdge.headers['strict-transport-security']).toMatch(/^max-age=\d{7,}$/);
    const plainEdge = await send(trusting!, '/login', { from: ownAddress(), headers: { 'X-Forwarded-Proto': 'http', 'X-Forwarded-For': '198.51.100.24' } });
    expect(plainEdge.headers['strict-transport-security']).toBeUndefined();
  });
});

function rssBytes(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  return Number(m![1]) * 1024;
}

/**
 * Streams up to `total` bytes of a multipart "photo" with chunked encoding (no
 * Content-Length) and counts what was written before the answer came.
 */
function streamUpload(app: RunningApp, path: string, from: string, total: number): Promise<{ status: number; body: string; writtenBeforeAnswer: number }> {
  const boundary = '----loopfoldhuge';
  const head = Buffer.from(
    `--${boundary}\r\nContent-Disposition: form-data; name="description"\r\n\r\nDented side wall\r\n--${boundary}\r\nContent-Disposition: form-data; name="photo"; filename="huge.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`,
  );
  const chunk = Buffer.alloc(64 * 1024, 0xff);
  return new Promise((resolve, reject) => {
    let written = 0;
    let answered = false;
    let writtenBeforeAnswer = -1;
    const req = httpRequest(
      {
        host: '127.0.0.1',
        port: app.port,
        path,
        method: 'POST',
        localAddress: from,
        headers: { 'Content-Type': `multipart/form-data; boundary=${boundary}`, 'Transfer-Encoding': 'chunked', Origin: `http://127.0.0.1:${app.port}` },
      },
      (res) => {
        answered = true;
        writtenBeforeAnswer = written;
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (c) => (body += c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, body, writtenBeforeAnswer }));
        res.on('error', () => resolve({ status: res.statusCode ?? 0, body, writtenBeforeAnswer }));
      },
    );
    req.on('error', (err) => (answered ? undefined : reject(err)));
    req.write(head);
    written += head.length;
    const pump = () => {
      while (!answered && written < total) {
        written += chunk.length;
        if (!req.write(chunk)) return void req.once('drain', pump);
      }
      if (!answered) req.end();
    };
    pump();
  });
}

describe('request bodies stop at their limit', () => {
  test('a chunked 60 MB "photo" to the public damage form: 413 early, memory flat, counted against the sender', async () => {
    const bin = await quietBin(5);
    const from = ownAddress();
    const pid = plain.pid!;
    const before = rssBytes(pid);
    const r = await streamUpload(plain, `/api/public/bins/${bin.grai}/damage-report`, from, 60 * 1024 * 1024);
    const after = rssBytes(pid);
    console.info(
      `[measured] chunked 60 MB upload: ${(r.writtenBeforeAnswer / 2 ** 20).toFixed(1)} MB sent before the 413; server RSS ${(before / 2 ** 20).toFixed(0)} → ${(after / 2 ** 20).toFixed(0)} MB`,
    );
    expect(r.status).toBe(413);
    const body = JSON.parse(r.body) as { error: { code: string; message: string } };
    expect(body.error.code).toBe('payload_too_large');
    // The limit is 10 MB of photo plus 64 KiB of form; what the server took before answering stays near it
    // (socket buffers on both sides add a few MB), far from the 60 MB sent.
    expect(r.writtenBeforeAnswer).toBeGreaterThan(10 * 1024 * 1024);
    expect(r.writtenBeforeAnswer).toBeLessThan(20 * 1024 * 1024);
    expect(after - before, `RSS grew from ${(before / 2 ** 20).toFixed(0)} to ${(after / 2 ** 20).toFixed(0)} MB`).toBeLessThan(40 * 1024 * 1024);
    // The refused upload cost one of the sender's 5 reports an hour.
    const used = await one<{ points: number } | undefined>(`SELECT points FROM rate_limits WHERE key = $1`, [`public_form:report:${from}`]);
    expect(used?.points).toBe(1);
    const reports = await one<{ n: number }>(`SELECT count(*)::int AS n FROM damage_reports WHERE asset_id = $1 AND requester_ip = $2`, [bin.id, from]);
    expect(reports.n).toBe(0);
  });

  test('a chunked JSON body over 1 MB is refused with the envelope before it is all read', async () => {
    const r = await new Promise<{ status: number; body: string }>((resolve, reject) => {
      const req = httpRequest(
        {
          host: '127.0.0.1',
          port: plain.port,
          path: '/api/account/reset',
          method: 'POST',
          localAddress: ownAddress(),
          headers: { 'Content-Type': 'application/json', 'Transfer-Encoding': 'chunked', Origin: `http://127.0.0.1:${plain.port}` },
        },
        (res) => {
          let body = '';
          res.on('data', (c) => (body += c));
          res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
        },
      );
      req.on('error', reject);
      req.write('{"email":"');
      for (let i = 0; i < 40; i++) req.write('a'.repeat(64 * 1024));
      req.end('@example.org"}');
    }).catch((err) => ({ status: -1, body: String(err) }));
    expect(r.status).toBe(413);
    expect(JSON.parse(r.body).error.code).toBe('payload_too_large');
  });
});
