// `HTTPS=1 npm start` hands the built server a certificate through
// SERVER_CERT_PATH / SERVER_KEY_PATH. Here the server runs with the local
// certificate src/cli/https.mjs makes, and Node's TLS client, trusting only
// that local CA, must accept it for localhost and 127.0.0.1.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { request } from 'node:https';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ROOT } from '../support/app';
import { certificateNames, ensureLocalCertificate, waitForHttps } from '@/cli/https.mjs';

let child: ChildProcess;
let port: number;
let ca: Buffer;

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer();
    s.listen(0, '127.0.0.1', () => {
      const p = (s.address() as { port: number }).port;
      s.close(() => resolve(p));
    });
  });
}

function get(host: string, path: string, at = { port, ca }): Promise<{ status: number; type: string; body: string; hsts: string | undefined; cache: string | undefined }> {
  return new Promise((resolve, reject) => {
    const req = request({ host, port: at.port, path, ca: at.ca, servername: host === '127.0.0.1' ? undefined : host }, (res) => {
      let body = '';
      res.on('data', (c) => (body += c));
      res.on('end', () =>
        resolve({
          status: res.statusCode ?? 0,
          type: String(res.headers['content-type']),
          body,
          hsts: res.headers['strict-transport-security'] as string | undefined,
          cache: res.headers['cache-control'] as string | undefined,
        }),
      );
    });
    req.on('error', reject);
    req.end();
  });
}

beforeAll(async () => {
  const tls = await ensureLocalCertificate(mkdtempSync(join(tmpdir(), 'loopfold-https-')), certificateNames({ addresses: [] }));
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
  if (child && child.exitCode === null) {
    await new Promise<void>((resolve) => {
      child.once('exit', () => resolve());
      child.kill('SIGTERM');
    });
  }
});

describe('HTTPS on the yard LAN', () => {
  test('the server speaks TLS with the local certificate, trusted through the local CA only', async () => {
    for (const host of ['localhost', '127.0.0.1']) {
      const r = await get(host, '/api/health');
      expect(r.status).toBe(200);
    }
  });
  test('the sign-in page and the service worker are served over it', async () => {
    const login = await get('localhost', '/login');
    expect(login.status).toBe(200);
    expect(login.body).toContain('Sign in');
    const sw = await get('localhost', '/sw.js');
    expect(sw.status).toBe(200);
    expect(sw.type).toMatch(/javascript/);
    expect(sw.body).toContain('loopfold-yard-pages');
    // The worker must be revalidated on every use, or phones keep an old one.
    expect(sw.cache).toBe('no-cache');
    const asset = /"\/(_astro\/[^"]+\.js)"/.exec(sw.body)?.[1] ?? /\b(_astro\/[\w.-]+\.js)\b/.exec(sw.body)?.[1];
    expect(asset, 'the worker precaches the hashed scripts').toBeTruthy();
    const script = await get('localhost', `/${asset}`);
    expect(script.status).toBe(200);
    expect(script.cache).toBe('public, max-age=31536000, immutable');
  });
  test('no HSTS with the locally made CA: phones must still click through and fetch the CA over plain HTTP', async () => {
    const login = await get('localhost', '/login');
    expect(login.status).toBe(200);
    expect(login.hsts).toBeUndefined();
  });
});

describe("HTTPS with the operator's own certificate", () => {
  let own: ChildProcess;
  let ownPort: number;
  let ownCert: Buffer;
  beforeAll(async () => {
    // A certificate not made by Loopfold's local CA stands in for the operator's (self-signed here).
    const { generate } = (await import('selfsigned')).default;
    const made = await generate([{ name: 'commonName', value: 'localhost' }], {
      keySize: 2048,
      algorithm: 'sha256',
      extensions: [
        {
          name: 'subjectAltName',
          altNames: [
            { type: 2, value: 'localhost' },
            { type: 7, ip: '127.0.0.1' },
          ],
        },
      ],
    });
    const dir = mkdtempSync(join(tmpdir(), 'loopfold-own-cert-'));
    writeFileSync(join(dir, 'cert.pem'), made.cert);
    writeFileSync(join(dir, 'key.pem'), made.private);
    ownCert = Buffer.from(made.cert);
    ownPort = await freePort();
    own = spawn(process.execPath, ['src/cli/serve.mjs'], {
      cwd: ROOT,
      env: { ...process.env, HOST: '127.0.0.1', PORT: String(ownPort), SERVER_CERT_PATH: join(dir, 'cert.pem'), SERVER_KEY_PATH: join(dir, 'key.pem') },
      stdio: ['ignore', 'ignore', 'inherit'],
    });
    await waitForHttps(`https://127.0.0.1:${ownPort}/api/health`, 30_000);
  }, 60_000);
  afterAll(async () => {
    if (own && own.exitCode === null) {
      await new Promise<void>((resolve) => {
        own.once('exit', () => resolve());
        own.kill('SIGTERM');
      });
    }
  });
  test('pages carry Strict-Transport-Security (RFC 6797 §6.1: max-age in seconds)', async () => {
    const login = await get('localhost', '/login', { port: ownPort, ca: ownCert });
    expect(login.status).toBe(200);
    expect(login.hsts).toMatch(/^max-age=\d{7,}$/);
  });
});
