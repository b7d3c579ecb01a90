// `HTTPS=1 npm start` hands the built server a certificate through
// SERVER_CERT_PATH / SERVER_KEY_PATH. Here the server runs with the local
// certificate src/cli/https.mjs makes, and Node's TLS client, trusting only
// that local CA, must accept it for localhost and 127.0.0.1.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
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

function get(host: string, path: string): Promise<{ status: number; type: string; body: string }> {
  return new Promise((resolve, reject) => {
    const req = request({ host, port, path, ca, servername: host === '127.0.0.1' ? undefined : host }, (res) => {
      let body = '';
      res.on('data', (c) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, type: String(res.headers['content-type']), body }));
    });
    req.on('error', reject);
    req.end();
  });
}

beforeAll(async () => {
  const tls = await ensureLocalCertificate(mkdtempSync(join(tmpdir(), 'loopfold-https-')), certificateNames({ addresses: [] }));
  ca = readFileSync(tls.caPath);
  port = await freePort();
  child = spawn(process.execPath, ['dist/server/entry.mjs'], {
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
  });
});
