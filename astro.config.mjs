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

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  integrations: [react(), tailwind({ applyBaseStyles: false }), auth({ configFile: './auth.config.ts' }), yardServiceWorker()],
  security: { checkOrigin: true, allowedDomains },
  server: { host: process.env.HOST ?? 'localhost', port: Number(process.env.PORT ?? 4321) },
  vite: {
    resolve: { alias: { '@': new URL('./src', import.meta.url).pathname } },
    ssr: { external: ['pg-native'] },
  },
});
