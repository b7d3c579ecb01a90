// A cookie-keeping HTTP client for tests that need no browser: sign in through
// the credentials flow as the sign-in page does, then call the app as that
// session. Cookies are kept per client, so two clients are two devices.
export class HttpClient {
  readonly jar = new Map<string, string>();
  constructor(readonly base: string) {}

  cookieHeader(): string {
    return [...this.jar].map(([k, v]) => `${k}=${v}`).join('; ');
  }
  private take(res: Response) {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const eq = pair!.indexOf('=');
      const name = pair!.slice(0, eq);
      const value = pair!.slice(eq + 1);
      if (value === '' || /max-age=0\b|expires=thu, 01 jan 1970/i.test(c)) this.jar.delete(name);
      else this.jar.set(name, value);
    }
  }
  async fetch(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.jar.size) headers.set('Cookie', this.cookieHeader());
    const res = await fetch(this.base + path, { redirect: 'manual', ...init, headers });
    this.take(res);
    return res;
  }
  async csrf(): Promise<string> {
    const res = await this.fetch('/api/auth/csrf');
    return ((await res.json()) as { csrfToken: string }).csrfToken;
  }
  async signIn(email: string, password: string): Promise<void> {
    const csrfToken = await this.csrf();
    const res = await this.fetch('/api/auth/callback/credentials', {
      method: 'POST',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: this.base, 'X-Auth-Return-Redirect': '1' },
      body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${this.base}/` }),
    });
    if (!this.sessionCookies().length) throw new Error(`sign-in failed (HTTP ${res.status}: ${await res.text()})`);
  }
  async signOut(): Promise<void> {
    const csrfToken = await this.csrf();
    await this.fetch('/api/auth/signout', {
      method: 'POST',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: this.base, 'X-Auth-Return-Redirect': '1' },
      body: new URLSearchParams({ csrfToken, callbackUrl: '/login' }),
    });
  }
  sessionCookies(): string[] {
    return [...this.jar.keys()].filter((k) => k.includes('authjs.session-token'));
  }
  /** A second device holding a copy of this one's cookies. */
  copy(): HttpClient {
    const c = new HttpClient(this.base);
    for (const [k, v] of this.jar) c.jar.set(k, v);
    return c;
  }
  post(path: string, body: unknown = {}): Promise<Response> {
    return this.fetch(path, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: this.base }, body: JSON.stringify(body) });
  }
}
