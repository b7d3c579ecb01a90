// Under HTTPS Auth.js names the session cookie `__Secure-authjs.session-token`
// (and salts its key with that name); the middleware must read that one, mark
// renewals Secure, and accept it in chunks. Server started as `HTTPS=1 npm start`
// starts it: the local certificate through SERVER_CERT_PATH / SERVER_KEY_PATH.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { request } from 'node:https';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ROOT } from '../support/app';
import { freePort } from '@/cli/free-port.mjs';
import { certificateNames, ensureLocalCertificate, waitForHttps } from '@/cli/https.mjs';
import { createStaff, freshEmail, closeDb } from '../support/accounts';

let child: ChildProcess;
let port: number;
let ca: Buffer;
const PASSWORD = 'https-session-password';

interface Answer {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}
function call(path: string, opts: { method?: string; headers?: Record<string, string>; body?: string } = {}): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = request({ host: 'localhost', port, path, method: opts.method ?? 'GET', headers: opts.headers, ca, servername: 'localhost' }, (res) => {
      let body = '';
      res.on('data', (c) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body }));
    });
    req.on('error', reject);
    if (opts.body) req.write(opts.body);
    req.end();
  });
}
const jar = new Map<string, string>();
const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
function take(a: Answer) {
  for (const c of (a.headers['set-cookie'] as string[] | undefined) ?? []) {
    const [pair] = c.split(';');
    const eq = pair!.indexOf('=');
    jar.set(pair!.slice(0, eq), pair!.slice(eq + 1));
  }
}

beforeAll(async () => {
  const tls = await ensureLocalCertificate(mkdtempSync(join(tmpdir(), 'loopfold-https-session-')), certificateNames({ addresses: [] }));
  ca = readFileSync(tls.caPath);
  port = await freePort();
  child = spawn(process.execPath, ['src/cli/serve.mjs'], {
    cwd: ROOT,
    env: { ...process.env, HOST: '127.0.0.1', PORT: String(port), SERVER_CERT_PATH: tls.certPath, SERVER_KEY_PATH: tls.keyPath },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  await waitForHttps(`https://127.0.0.1:${port}/api/health`, 30_000);
}, 60_000);
afterAll(async () => {
  await closeDb();
  if (child && child.exitCode === null) {
    await new Promise<void>((resolve) => {
      child.once('exit', () => resolve());
      child.kill('SIGTERM');
    });
  }
});

describe('the session cookie under HTTPS', () => {
  test('sign-in sets __Secure-authjs.session-token (Secure); a signed-in request with it works, also chunked', async () => {
    const email = freshEmail('https-session');
    await createStaff(email, 'HTTPS Session', PASSWORD);
    const base = `https://localhost:${port}`;
    const csrf = await call('/api/auth/csrf');
    take(csrf);
    const { csrfToken } = JSON.parse(csrf.body) as { csrfToken: string };
    const body = new URLSearchParams({ csrfToken, email, password: PASSWORD, callbackUrl: `${base}/` }).toString();
    const signIn = await call('/api/auth/callback/credentials', {
      method: 'POST',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: base, Cookie: cookie(), 'Content-Length': String(Buffer.byteLength(body)) },
      body,
    });
    take(signIn);
    const setCookies = (signIn.headers['set-cookie'] as string[]).filter((c) => c.includes('session-token'));
    expect(setCookies).toHaveLength(1);
    expect(setCookies[0]).toMatch(/^__Secure-authjs\.session-token=/);
    expect(setCookies[0]).toMatch(/;\s*Secure/i);

    const token = jar.get('__Secure-authjs.session-token')!;
    const views = await call('/api/fleet/views', { headers: { Cookie: `__Secure-authjs.session-token=${token}` } });
    expect(views.status).toBe(200);
    const chunked = await call('/api/fleet/views', {
      headers: { Cookie: `__Secure-authjs.session-token.0=${token.slice(0, 50)}; __Secure-authjs.session-token.1=${token.slice(50)}` },
    });
    expect(chunked.status).toBe(200);
    // the plain name carries a token sealed with another salt: no session
    const plain = await call('/api/fleet/views', { headers: { Cookie: `authjs.session-token=${token}` } });
    expect(plain.status).toBe(401);
  });
});
