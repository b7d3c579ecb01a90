// Starts the built server (never `astro dev`: the origin check only runs in
// the built server) on a free port against the e2e database, and drives
// Debian's chromium through playwright-core.
import { spawn, type ChildProcess } from 'node:child_process';
import { freePort } from '@/cli/free-port.mjs';
import { startPayFake, type PayFake } from '@/cli/pay-fake.mjs';
import { LOCAL_FAKE_KEYS as LOCAL_PAY_KEYS } from '@/cli/pay-fake-keys.mjs';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, afterAll } from 'vitest';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { DateTime } from 'luxon';
import { OPERATOR } from '@/db/seed/scenario';

/**
 * Today where the demo operator works, as its forms read dates. The UTC date differs from it for an hour or two
 * around midnight, and a form refuses a "ready from" that is yesterday locally (the app works it out in `calendar.ts`).
 */
export function operatorToday(): string {
  return DateTime.now().setZone(OPERATOR.timeZone).toISODate()!;
}

export const ROOT = new URL('../../../', import.meta.url).pathname;
export const ARTIFACTS = join(ROOT, '.loopfold', 'artifacts');

export interface RunningApp {
  url: string;
  port: number;
  /** This app's own local payment provider (the fake its SDK talks to): the events it sent. */
  pay: { base: string; sent: PayFake['sent'] };
  /** The server process's id while it runs (to read its memory from /proc). */
  readonly pid: number | undefined;
  stop(): Promise<void>;
  start(): Promise<void>;
  /** Stops the server and its payment provider fake for good. */
  dispose(): Promise<void>;
}

async function waitHealthy(url: string, timeoutMs = 30_000) {
  const t0 = Date.now();
  while (Date.now() - t0 < timeoutMs) {
    try {
      const r = await fetch(`${url}/api/health`);
      if (r.ok) return;
    } catch {
      /* starting */
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`app at ${url} did not become healthy`);
}

export async function startApp(extraEnv: Record<string, string> = {}): Promise<RunningApp> {
  const port = await freePort();
  const url = `http://localhost:${port}`;
  let child: ChildProcess | null = null;
  // One payment provider fake per app, sending its signed events to this app.
  const fake = await startPayFake({ ...LOCAL_PAY_KEYS, webhookUrl: () => `${url}/api/payments/webhook` });
  const payEnv = {
    PAYMENTS_SECRET_KEY: LOCAL_PAY_KEYS.secretKey,
    PAYMENTS_WEBHOOK_SECRET: LOCAL_PAY_KEYS.webhookSecret,
    PAYMENTS_API_HOST: '127.0.0.1',
    PAYMENTS_API_PORT: String(fake.port),
    PAYMENTS_API_PROTOCOL: 'http',
  };
  const app: RunningApp = {
    url,
    port,
    pay: { base: fake.base, sent: fake.sent },
    get pid() {
      return child?.pid;
    },
    async start() {
      child = spawn(process.execPath, ['src/cli/serve.mjs'], {
        cwd: ROOT,
        env: { ...process.env, HOST: '127.0.0.1', PORT: String(port), APP_URL: url, ...payEnv, ...extraEnv },
        stdio: ['ignore', 'ignore', 'inherit'],
      });
      await waitHealthy(url);
    },
    async dispose() {
      await app.stop();
      await fake.close();
    },
    async stop() {
      const c = child;
      if (!c || c.exitCode !== null) return;
      await new Promise<void>((resolve) => {
        c.once('exit', () => resolve());
        c.kill('SIGTERM');
      });
      child = null;
    },
  };
  await app.start();
  return app;
}

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export const PHONE = { viewport: { width: 390, height: 844 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true };
export const DESKTOP = { viewport: { width: 1280, height: 860 } };

export async function newContext(browser: Browser, app: RunningApp, kind: 'phone' | 'desktop' = 'desktop'): Promise<BrowserContext> {
  return browser.newContext({ baseURL: app.url, ...(kind === 'phone' ? PHONE : DESKTOP) });
}

export async function signIn(page: Page, email: string, password: string) {
  await page.goto('/login');
  await page.fill('#email', email);
  await page.fill('#password', password);
  await page.click('#login-submit');
}

/** The page is no wider than its viewport: anything wider scrolls inside its own region, never the whole page. */
export async function expectNoPageOverflow(page: Page, what: string) {
  const { scroll, width, culprits } = await page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    // The outermost elements that stick out, not inside a region that scrolls by itself: what to fix.
    const scrolls = (el: Element | null): boolean => !!el && el !== document.body && (getComputedStyle(el).overflowX !== 'visible' || scrolls(el.parentElement));
    const culprits = [...document.querySelectorAll('body *')]
      .filter(
        (el) => el.getBoundingClientRect().right > width + 1 && !scrolls(el.parentElement) && !(el.parentElement && el.parentElement.getBoundingClientRect().right > width + 1),
      )
      .slice(0, 5)
      .map((el) => `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}.${[...el.classList].slice(0, 3).join('.')} (${Math.round(el.getBoundingClientRect().right)} px)`);
    return { scroll: document.documentElement.scrollWidth, width, culprits };
  });
  if (scroll > width + 1) throw new Error(`${what}: the page is ${scroll} px wide in a ${width} px viewport; sticking out: ${culprits.join(', ')}`);
}

export async function screenshot(page: Page, name: string) {
  const dir = join(ARTIFACTS, 'screenshots');
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: join(dir, `${name}.png`), fullPage: true });
}

/**
 * For a test file: starts the built server and a browser before its tests and
 * stops both after them. Use `t.app` and `t.browser` inside tests.
 */
export function useApp(): { readonly app: RunningApp; readonly browser: Browser } {
  const held: { app?: RunningApp; browser?: Browser } = {};
  beforeAll(async () => {
    held.app = await startApp();
    held.browser = await launchBrowser();
  });
  afterAll(async () => {
    await held.browser?.close();
    await held.app?.dispose();
  });
  return {
    get app() {
      return held.app!;
    },
    get browser() {
      return held.browser!;
    },
  };
}
