// HTTPS for phones on the yard LAN (`HTTPS=1 npm start`). Phones need a
// secure context for the live camera and for offline work (service workers).
//
// With SERVER_CERT_PATH and SERVER_KEY_PATH set, the operator's own
// certificate is used as it is (@astrojs/node's standalone server reads those
// two variables). Otherwise Loopfold makes a small local certificate authority
// once (.loopfold/tls/, ignored by git) and, signed by it, a server
// certificate for localhost, this machine's name and its LAN addresses; the
// server certificate is renewed by itself when the addresses change or it
// nears expiry, so phones trust the CA once and keep working. While
// `npm start` runs, the CA certificate can be downloaded over plain HTTP on
// the next port (HTTPS_CA_PORT, default PORT + 1), for phones to install.
//
// Runs before dependencies may be installed: `selfsigned` is imported lazily.
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:http';
import { request } from 'node:https';
import { hostname as osHostname, networkInterfaces } from 'node:os';
import { join } from 'node:path';

const DAY_MS = 86_400_000;
/** Apple platforms and browsers refuse TLS server certificates valid for longer (398 days; Apple, from memory). */
export const SERVER_CERT_DAYS = 397;
const CA_YEARS = 10;
const RENEW_WITHIN_DAYS = 30;
const CA_FILE = 'loopfold-local-ca.crt';

/** IPv4 addresses of this machine that a phone on the same network can reach (no loopback, no link-local). */
export function lanAddresses(ifaces = networkInterfaces()) {
  const out = [];
  for (const list of Object.values(ifaces)) {
    for (const a of list ?? []) {
      if (a.internal || a.family !== 'IPv4' || a.address.startsWith('169.254.')) continue;
      out.push(a.address);
    }
  }
  return [...new Set(out)].sort();
}

/** The names the server certificate must cover: localhost, the machine's name (also as .local), loopback and LAN addresses. */
export function certificateNames({ host = osHostname(), addresses = lanAddresses() } = {}) {
  const short = host.toLowerCase().replace(/\.local$/, '');
  const dns = [...new Set(['localhost', short, `${short}.local`].filter((n) => /^[a-z0-9.-]+$/.test(n)))];
  const ips = [...new Set(['127.0.0.1', '::1', ...addresses])];
  return { dns, ips };
}

const sameNames = (a, b) => JSON.stringify(a) === JSON.stringify(b);

/**
 * Makes (or reuses) the local CA and a server certificate covering `names`.
 * Returns the file paths and whether anything new was made.
 */
export async function ensureLocalCertificate(dir, names, now = new Date()) {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  const paths = {
    caKey: join(dir, 'ca-key.pem'),
    caCert: join(dir, CA_FILE),
    key: join(dir, 'server-key.pem'),
    cert: join(dir, 'server-cert.pem'),
    meta: join(dir, 'server.json'),
  };
  const { generate } = (await import('selfsigned')).default;
  let made = false;

  if (!existsSync(paths.caKey) || !existsSync(paths.caCert)) {
    const ca = await generate(
      [
        { name: 'commonName', value: 'Loopfold local CA' },
        { name: 'organizationName', value: 'Loopfold (this installation)' },
      ],
      {
        keySize: 2048,
        algorithm: 'sha256',
        notBeforeDate: new Date(now.getTime() - DAY_MS),
        notAfterDate: new Date(now.getTime() + CA_YEARS * 365 * DAY_MS),
        extensions: [
          { name: 'basicConstraints', cA: true, pathLenConstraint: 0, critical: true },
          { name: 'keyUsage', keyCertSign: true, cRLSign: true, critical: true },
        ],
      },
    );
    writeFileSync(paths.caKey, ca.private, { mode: 0o600 });
    writeFileSync(paths.caCert, ca.cert);
    made = true;
  }

  const meta = existsSync(paths.meta) ? JSON.parse(readFileSync(paths.meta, 'utf8')) : null;
  const fresh =
    !made &&
    meta &&
    existsSync(paths.key) &&
    existsSync(paths.cert) &&
    sameNames(meta.names, names) &&
    new Date(meta.notAfter).getTime() - now.getTime() > RENEW_WITHIN_DAYS * DAY_MS;
  if (!fresh) {
    const notAfter = new Date(now.getTime() + SERVER_CERT_DAYS * DAY_MS);
    const server = await generate([{ name: 'commonName', value: names.dns.find((n) => n !== 'localhost') ?? 'localhost' }], {
      keySize: 2048,
      algorithm: 'sha256',
      notBeforeDate: new Date(now.getTime() - DAY_MS),
      notAfterDate: notAfter,
      ca: { key: readFileSync(paths.caKey, 'utf8'), cert: readFileSync(paths.caCert, 'utf8') },
      extensions: [
        { name: 'basicConstraints', cA: false, critical: true },
        { name: 'keyUsage', digitalSignature: true, keyEncipherment: true, critical: true },
        { name: 'extKeyUsage', serverAuth: true },
        { name: 'subjectAltName', altNames: [...names.dns.map((value) => ({ type: 2, value })), ...names.ips.map((ip) => ({ type: 7, ip }))] },
      ],
    });
    writeFileSync(paths.key, server.private, { mode: 0o600 });
    writeFileSync(paths.cert, server.cert);
    writeFileSync(paths.meta, JSON.stringify({ names, notAfter: notAfter.toISOString() }, null, 2));
    made = true;
  }
  return { keyPath: paths.key, certPath: paths.cert, caPath: paths.caCert, made };
}

/** The host part of a Host header, only if it looks like a name or an IPv4 address (it is echoed into HTML). */
function hostOnly(header) {
  const host = String(header ?? '').split(':')[0];
  return /^[A-Za-z0-9.-]{1,253}$/.test(host) ? host : 'this-computer';
}

/** Serves the CA certificate over plain HTTP so a phone can install it (it cannot trust the HTTPS site yet). */
function serveCaCertificate(caPath, port, httpsPort) {
  const server = createServer((req, res) => {
    if (req.url === `/${CA_FILE}`) {
      res.writeHead(200, { 'Content-Type': 'application/x-x509-ca-cert', 'Content-Disposition': `attachment; filename="${CA_FILE}"` });
      res.end(readFileSync(caPath));
      return;
    }
    res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8' });
    res.end(`<!doctype html><meta name="viewport" content="width=device-width"><title>Loopfold certificate</title>
<body style="font-family:sans-serif;max-width:32em;margin:2em auto;padding:0 1em;line-height:1.5">
<h1>Trust Loopfold on this phone</h1><p><a href="/${CA_FILE}" style="font-size:1.3em">Download the Loopfold local CA certificate</a></p>
<p>Then install it as a CA certificate (Android: Settings → Security → Encryption &amp; credentials → Install a certificate → CA certificate;
iPhone: Settings → Profile Downloaded → Install, then Settings → General → About → Certificate Trust Settings → turn on “Loopfold local CA”).</p>
<p>Afterwards open Loopfold at <b>https://${hostOnly(req.headers.host)}:${httpsPort}</b>.</p></body>`);
  });
  server.on('error', () => undefined); // port taken: the README's copy-the-file route still works
  server.listen(port, '0.0.0.0');
  server.unref();
  return server;
}

/** Waits until the HTTPS server answers its health check (the local certificate is not verified here). */
export function waitForHttps(url, timeoutMs = 60_000) {
  const t0 = Date.now();
  return new Promise((resolve, reject) => {
    const attempt = () => {
      const req = request(url, { rejectUnauthorized: false, timeout: 2_000 }, (res) => {
        res.resume();
        if (res.statusCode === 200) resolve();
        else retry();
      });
      req.on('error', retry);
      req.on('timeout', () => req.destroy());
      req.end();
    };
    const retry = () => (Date.now() - t0 > timeoutMs ? reject(new Error(`${url} did not answer within ${timeoutMs / 1000} s`)) : setTimeout(attempt, 300));
    attempt();
  });
}

/**
 * Everything `npm start` needs for HTTPS: the environment for the server, the
 * addresses to print, and the CA download for phones (generated certificate only).
 */
export async function prepareHttps({ projectRoot, port }) {
  const addresses = lanAddresses();
  const urls = [`https://localhost:${port}`, ...addresses.map((a) => `https://${a}:${port}`)];
  const own = process.env.SERVER_CERT_PATH && process.env.SERVER_KEY_PATH;
  if (own) {
    return { env: { SERVER_CERT_PATH: process.env.SERVER_CERT_PATH, SERVER_KEY_PATH: process.env.SERVER_KEY_PATH }, urls, caUrls: [], made: false };
  }
  const tls = await ensureLocalCertificate(join(projectRoot, '.loopfold', 'tls'), certificateNames({ addresses }));
  const caPort = Number(process.env.HTTPS_CA_PORT ?? Number(port) + 1);
  serveCaCertificate(tls.caPath, caPort, port);
  return {
    env: { SERVER_CERT_PATH: tls.certPath, SERVER_KEY_PATH: tls.keyPath },
    urls,
    caUrls: addresses.map((a) => `http://${a}:${caPort}/`),
    caPath: tls.caPath,
    made: tls.made,
  };
}
