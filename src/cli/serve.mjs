// The app server: `node src/cli/serve.mjs` after `astro build`. @astrojs/node
// runs in its `middleware` mode (astro.config.mjs); this small node:http /
// node:https server of our own serves dist/client and hands every other
// request to the app, with what only the socket knows in `locals.connection`:
// the peer's address, whether the socket is TLS and whose certificate it uses.
// The app decides the client address and HSTS from that (src/lib/http/forwarded.ts;
// README, "Behind a reverse proxy").
//
//   PORT, HOST                          where to listen (default localhost:4321)
//   SERVER_CERT_PATH, SERVER_KEY_PATH   serve HTTPS with this certificate
//   TRUST_PROXY=N                       N reverse proxies of ours stand in front
//
// Request bodies are read only as the app asks for them, never more than
// HARD_BODY_LIMIT in all; when the app stops reading (a body over its route's
// limit) the rest is not read into memory: after the answer the connection
// lingers briefly, discarding, and is then cut (as nginx's lingering close).
import { createServer as createHttpServer } from 'node:http';
import { createServer as createHttpsServer } from 'node:https';
import { X509Certificate } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { join, normalize, sep } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import send from 'send';

const root = fileURLToPath(new URL('../../', import.meta.url));
const clientDir = join(root, 'dist', 'client');

/** No route reads more than this (the largest upload is 10 MB plus its multipart wrapping). */
export const HARD_BODY_LIMIT = 12 * 1024 * 1024;
// After answering a body it did not read, the server keeps reading and discarding for a while before it closes:
// closing with unread bytes makes the kernel send a reset, and a reset that reaches the sender before it has read
// the answer throws the answer away (the 413 becomes "connection reset"). On loopback a sender still writing puts
// megabytes through in milliseconds, so the allowance is mostly time: 2 s, or 64 MB discarded, whichever first.
const LINGER_MS = 2_000;
const LINGER_BYTES = 64 * 1024 * 1024;
const BODY_LIMIT_CODE = 'LOOPFOLD_BODY_LIMIT';

/** The locally made CA of src/cli/https.mjs signs certificates with this issuer name. */
const LOCAL_CA_NAME = 'CN=Loopfold local CA';

function tlsOptions() {
  const certPath = process.env.SERVER_CERT_PATH;
  const keyPath = process.env.SERVER_KEY_PATH;
  if (!certPath || !keyPath) return null;
  const cert = readFileSync(certPath);
  const issuer = new X509Certificate(cert).issuer;
  return { cert, key: readFileSync(keyPath), source: issuer.split('\n').includes(LOCAL_CA_NAME) ? 'local-ca' : 'operator' };
}

const FORWARDED_HEADERS = ['x-forwarded-for', 'x-forwarded-proto', 'x-forwarded-host', 'x-forwarded-port', 'forwarded'];

/**
 * The request body as an async iterable for the app (Astro's NodeApp reads
 * `req.body` when it is set). It reads one chunk per request of the app,
 * stops at HARD_BODY_LIMIT, and when the app cancels it the socket is left
 * paused rather than destroyed, so the app's 413 still reaches the client.
 */
function guardedBody(req, onAbandon) {
  let seen = 0;
  let abandoned = false;
  const abandon = () => {
    if (abandoned) return;
    abandoned = true;
    onAbandon();
  };
  const next = () =>
    new Promise((resolve, reject) => {
      if (abandoned || req.readableEnded) return resolve({ done: true, value: undefined });
      const cleanup = () => {
        req.off('data', onData);
        req.off('end', onEnd);
        req.off('error', onError);
        req.off('close', onClose);
      };
      const onData = (chunk) => {
        cleanup();
        req.pause();
        seen += chunk.length;
        if (seen > HARD_BODY_LIMIT) {
          abandon();
          reject(Object.assign(new Error('request body over the server limit'), { code: BODY_LIMIT_CODE }));
        } else resolve({ done: false, value: chunk });
      };
      const onEnd = () => {
        cleanup();
        resolve({ done: true, value: undefined });
      };
      const onError = (err) => {
        cleanup();
        reject(err);
      };
      const onClose = () => {
        cleanup();
        if (!req.complete) reject(new Error('the client closed the connection'));
        else resolve({ done: true, value: undefined });
      };
      req.on('data', onData);
      req.on('end', onEnd);
      req.on('error', onError);
      req.on('close', onClose);
      req.resume();
    });
  // No own enumerable keys: Astro would otherwise JSON-serialise it as a parsed body.
  return {
    [Symbol.asyncIterator]() {
      return { next, return: async () => (abandon(), { done: true, value: undefined }) };
    },
  };
}

/** After the answer to a body the app did not read to its end: discard what still comes for a moment, then cut. */
function lingerThenClose(req) {
  const socket = req.socket;
  if (req.complete || socket.destroyed) return;
  let discarded = 0;
  const cut = () => socket.destroy();
  const timer = setTimeout(cut, LINGER_MS);
  timer.unref();
  socket.once('close', () => clearTimeout(timer));
  req.on('data', (chunk) => {
    discarded += chunk.length;
    if (discarded > LINGER_BYTES) cut();
  });
  req.once('end', () => clearTimeout(timer));
  req.resume();
}

/** dist/client/<path> when it is a file there (never a dot file, never outside the folder). */
function staticFile(pathname) {
  let decoded;
  try {
    decoded = decodeURIComponent(pathname);
  } catch {
    return null;
  }
  if (decoded.includes('\0') || decoded.split('/').some((part) => part.startsWith('.'))) return null;
  const file = normalize(join(clientDir, decoded));
  if (!file.startsWith(clientDir + sep)) return null;
  try {
    return statSync(file).isFile() ? decoded : null;
  } catch {
    return null;
  }
}

/**
 * Caching: Vite's /_astro/ files carry a content hash in their name, so they
 * are kept for a year; everything else (the service worker above all, whose
 * updates must be seen at once) is revalidated on every use.
 */
function serveStatic(req, res, path) {
  const hashed = path.startsWith('/_astro/');
  send(req, path, { root: clientDir, dotfiles: 'deny', index: false, cacheControl: false, etag: true, lastModified: true })
    .on('headers', (r) => {
      r.setHeader('Cache-Control', hashed ? 'public, max-age=31536000, immutable' : 'no-cache');
      r.setHeader('X-Content-Type-Options', 'nosniff');
    })
    .on('error', (err) => {
      res.statusCode = err.status ?? 500;
      res.end();
    })
    .pipe(res);
}

export async function createAppServer({ trustProxy = process.env.TRUST_PROXY } = {}) {
  const { handler } = await import(pathToFileURL(join(root, 'dist', 'server', 'entry.mjs')).href);
  if (typeof handler !== 'function') throw new Error('dist/server/entry.mjs has no handler: build with @astrojs/node in middleware mode');
  const tls = tlsOptions();
  const trusted = /^\d{1,2}$/.test(String(trustProxy ?? '').trim()) && Number(trustProxy) > 0;

  const listener = (req, res) => {
    try {
      decodeURI(req.url ?? '/');
    } catch {
      res.writeHead(400, { 'Content-Type': 'text/plain; charset=utf-8' });
      res.end('Bad request.');
      return;
    }
    // Without proxies of ours these headers are the client's own words: Astro must not build the URL from them.
    if (!trusted) for (const h of FORWARDED_HEADERS) delete req.headers[h];

    const pathname = (req.url ?? '/').split('?')[0];
    if (req.method === 'GET' || req.method === 'HEAD') {
      const path = staticFile(pathname);
      if (path) return serveStatic(req, res, path);
    }

    let abandoned = false;
    req.body = guardedBody(req, () => (abandoned = true));
    res.once('finish', () => {
      if (abandoned || !req.complete) lingerThenClose(req);
    });
    const locals = {
      connection: { remoteAddress: req.socket.remoteAddress ?? null, encrypted: Boolean(req.socket.encrypted), tls: tls?.source ?? null },
    };
    handler(req, res, undefined, locals);
  };

  const server = tls ? createHttpsServer({ cert: tls.cert, key: tls.key }, listener) : createHttpServer(listener);
  return { server, tls: tls?.source ?? null };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const port = Number(process.env.PORT ?? 4321);
  const host = process.env.HOST ?? 'localhost';
  const { server, tls } = await createAppServer();
  server.listen(port, host, () => {
    const scheme = tls ? 'https' : 'http';
    process.stdout.write(`[loopfold] app server listening on ${scheme}://${host}:${port}${tls === 'local-ca' ? ' (local CA certificate)' : ''}\n`);
  });
}
