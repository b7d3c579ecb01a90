// The fixed cost of a signed-in request, measured two ways against a running
// server signed in as the demo planner: wall-clock req/s and p50/p99 at C
// connections, and the server process's own CPU time per request (from /proc),
// which holds up when other work shares the cores. Not part of npm test; the
// project's npm run bench supersedes it once it exists.
//   node src/cli/bench-session-cost.mjs <base url> [server pid] [seconds=10] [connections=8]
import http from 'node:http';
import { readFileSync } from 'node:fs';

const [base, pid, secs = '10', conns = '8'] = process.argv.slice(2);
if (!base) {
  console.error('usage: node src/cli/bench-session-cost.mjs <base url> [server pid] [seconds] [connections]');
  process.exit(2);
}
const agent = new http.Agent({ keepAlive: true, maxSockets: Number(conns) });
const cpuMs = () => {
  if (!pid) return NaN;
  const f = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
  return (Number(f[11]) + Number(f[12])) * 10; // utime + stime in 1/100 s (USER_HZ)
};
function req(path, headers = {}, method = 'GET', body) {
  return new Promise((resolve, reject) => {
    const u = new URL(path, base);
    const r = http.request({ host: u.hostname, port: u.port, path: u.pathname + u.search, method, headers, agent }, (res) => {
      const chunks = [];
      res.on('data', (c) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode, headers: res.headers, body: Buffer.concat(chunks).toString() }));
    });
    r.on('error', reject);
    if (body) r.write(body);
    r.end();
  });
}
const jar = new Map();
const take = (res) => {
  for (const c of res.headers['set-cookie'] ?? []) {
    const p = c.split(';')[0];
    const i = p.indexOf('=');
    jar.set(p.slice(0, i), p.slice(i + 1));
  }
};
const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
const csrf = await req('/api/auth/csrf');
take(csrf);
const { csrfToken } = JSON.parse(csrf.body);
const form = new URLSearchParams({ csrfToken, email: 'planner@northmere.example', password: 'fold-and-return', callbackUrl: `${base}/fleet` }).toString();
take(
  await req(
    '/api/auth/callback/credentials',
    { 'Content-Type': 'application/x-www-form-urlencoded', Origin: base, Cookie: cookie(), 'Content-Length': Buffer.byteLength(form) },
    'POST',
    form,
  ),
);
if (![...jar.keys()].some((k) => k.includes('session-token'))) throw new Error('sign-in failed');

async function run(path, auth) {
  const headers = auth ? { Cookie: cookie() } : {};
  const lat = [];
  let bad = 0;
  const warmUntil = Date.now() + 1500;
  const until = warmUntil + (Number(secs) - 1.5) * 1000;
  let c0 = NaN;
  await Promise.all(
    Array.from({ length: Number(conns) }, async () => {
      while (Date.now() < until) {
        const t0 = performance.now();
        const r = await req(path, headers);
        if (Date.now() < warmUntil) continue;
        if (Number.isNaN(c0)) c0 = cpuMs();
        lat.push(performance.now() - t0);
        if (r.status !== 200) bad += 1;
      }
    }),
  );
  const cpu = (cpuMs() - c0) / lat.length;
  lat.sort((a, b) => a - b);
  const q = (p) => lat[Math.min(lat.length - 1, Math.floor(p * lat.length))].toFixed(1);
  const rate = lat.length / (Number(secs) - 1.5);
  console.log(
    `${path.padEnd(18)} ${auth ? 'signed-in ' : 'no session'} ${rate.toFixed(0).padStart(5)} req/s  p50 ${q(0.5)} ms  p99 ${q(0.99)} ms` +
      `${pid ? `  server CPU ${cpu.toFixed(2)} ms/request` : ''}  non-200: ${bad}  (n=${lat.length}, c=${conns})`,
  );
  return rate;
}
const open = await run('/api/health', false);
const signedIn = await run('/api/fleet/views', true);
console.log(`signed-in / unauthenticated: ${((signedIn / open) * 100).toFixed(0)} %`);
agent.destroy();
