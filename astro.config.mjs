// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwind from '@astrojs/tailwind';
import auth from 'auth-astro';
import yardServiceWorker from './src/integrations/yard-service-worker.mjs';

// Astro >= 5.17 ignores the Host header (and fails the origin check of every
// form POST) unless the host is allowed. Loopfold is reached by name, by
// localhost and by LAN address from phones, so any host is accepted here; links
// that leave the app (mail, QR labels) never use the Host header but the
// configured APP_URL / Digital Link base, so a forged Host cannot poison them.
const allowedDomains = [{}];

// Content-Security-Policy (see DEVELOPERS.md, "Content Security Policy"): Astro
// hashes every script and style it emits and sends the policy as a header on
// each rendered page; scripts run only from this origin or by hash. Pages that
// inject styles at run time (the fleet grid) add a per-response nonce with
// Astro.csp.insertStyleResource; the middleware adds `style-src-attr` for
// style="…" attributes, a directive Astro's list does not take.
/** @type {Exclude<NonNullable<import('astro').AstroUserConfig['experimental']>['csp'], boolean | undefined>} */
const csp = {
  algorithm: 'SHA-256',
  directives: [
    "default-src 'self'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "media-src 'self' blob:",
    "worker-src 'self'",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ],
  scriptDirective: { resources: ["'self'"] },
  styleDirective: { resources: ["'self'"] },
};

export default defineConfig({
  output: 'server',
  // Middleware mode: src/cli/serve.mjs is the server (static files, TLS, the socket's address for the app).
  adapter: node({ mode: 'middleware' }),
  integrations: [react(), tailwind({ applyBaseStyles: false }), auth({ configFile: './auth.config.ts' }), yardServiceWorker()],
  security: { checkOrigin: true, allowedDomains },
  experimental: { csp },
  server: { host: process.env.HOST ?? 'localhost', port: Number(process.env.PORT ?? 4321) },
  vite: {
    resolve: { alias: { '@': new URL('./src', import.meta.url).pathname } },
    ssr: { external: ['pg-native'] },
  },
});
