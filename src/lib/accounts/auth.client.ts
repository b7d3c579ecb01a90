// A small sign-in / sign-out client for auth-astro's endpoints (its shipped
// client is TypeScript source that trips the type checker). Browser only.

async function csrfToken(): Promise<string> {
  const res = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
  const { csrfToken } = (await res.json()) as { csrfToken: string };
  return csrfToken;
}

async function post(path: string, fields: Record<string, string>): Promise<URL> {
  const body = new URLSearchParams({ ...fields, csrfToken: await csrfToken() });
  const res = await fetch(path, {
    method: 'POST',
    credentials: 'same-origin',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1' },
    body,
  });
  const { url } = (await res.json()) as { url: string };
  return new URL(url, window.location.origin);
}

/** Returns null on success, or the error code the server gave ('credentials', 'rate_limited', …). */
export async function signIn(email: string, password: string, callbackUrl: string): Promise<string | null> {
  const url = await post('/api/auth/callback/credentials', { email, password, callbackUrl });
  if (url.searchParams.has('error')) return url.searchParams.get('code') ?? url.searchParams.get('error') ?? 'unknown';
  return null;
}

export async function signOut(): Promise<void> {
  await post('/api/auth/signout', { callbackUrl: '/login' });
  window.location.assign('/login?signed_out=1');
}
