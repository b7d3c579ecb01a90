// What the benchmarks share: the built app server on a free port against a
// chosen database, and a signed-in session through the credentials flow
// (`/api/auth/csrf`, then `/api/auth/callback/credentials` with an Origin header).
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { projectRoot } from './postgres.mjs';

export async function startServer(url: string, port: number, env: Record<string, string> = {}): Promise<ChildProcess> {
  const child = spawn(process.execPath, ['src/cli/serve.mjs'], {
    cwd: projectRoot,
    env: { ...process.env, DATABASE_URL: url, HOST: '127.0.0.1', PORT: String(port), AUTH_SECRET: randomBytes(32).toString('base64url'), NODE_ENV: 'production', ...env },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 200; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) return child;
    } catch {
      /* starting */
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  child.kill();
  throw new Error('the app server did not become healthy');
}

function cookiesOf(res: Response, jar: Map<string, string>) {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    const eq = pair!.indexOf('=');
    jar.set(pair!.slice(0, eq), pair!.slice(eq + 1));
  }
}
const cookieHeader = (jar: Map<string, string>) => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');

/** Signs in and returns the Cookie header that carries the session. */
export async function signIn(base: string, email: string, password: string): Promise<string> {
  const jar = new Map<string, string>();
  const csrfRes = await fetch(`${base}/api/auth/csrf`);
  cookiesOf(csrfRes, jar);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: base, Cookie: cookieHeader(jar) },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${base}/fleet` }),
  });
  cookiesOf(res, jar);
  if (![...jar.keys()].some((k) => k.endsWith('session-token'))) throw new Error(`sign-in failed (HTTP ${res.status})`);
  return cookieHeader(jar);
}
