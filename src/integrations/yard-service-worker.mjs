// Builds the yard's service worker after `astro build`, with Workbox's
// generateSW (workbox-build), from what the client build wrote to dist/client:
//  - precaches the hashed scripts and styles and the Latin font files, so a
//    yard page (and the QR decoder chunk) loads with no signal at all;
//  - keeps the yard pages a phone opened (/yard, /bins/<GRAI>) network-first:
//    fresh with signal, the last copy without; a bin page never opened falls
//    back to the saved /yard page, which shows that bin from the depot
//    snapshot (src/components/yard/YardScan.tsx);
//  - leaves /api/* alone: scans go through the phone's own queue (IndexedDB)
//    and the depot snapshot is kept there too.
// The result is dist/client/sw.js, served at /sw.js (scope /) by the Node adapter.
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Must match PAGE_CACHE in src/lib/yard/service-worker.client.ts. */
export const PAGE_CACHE = 'loopfold-yard-pages';

function serviceWorkerConfig(clientDir) {
  return {
    globDirectory: clientDir,
    globPatterns: ['_astro/*.{js,css}', '_astro/ibm-plex-*-latin-*-normal.*.woff2', 'favicon.svg'],
    swDest: join(clientDir, 'sw.js'),
    mode: 'production',
    sourcemap: false,
    inlineWorkboxRuntime: true,
    skipWaiting: true,
    clientsClaim: true,
    cleanupOutdatedCaches: true,
    // Vite puts a content hash in every _astro file name: the URL is the version.
    dontCacheBustURLsMatching: /^_astro\//,
    // Plenty for the client chunks; a bigger file is left out of the precache (the build says so).
    maximumFileSizeToCacheInBytes: 2 * 1024 * 1024,
    runtimeCaching: [
      {
        urlPattern: ({ request, url }) =>
          request.mode === 'navigate' && (url.pathname === '/yard' || url.pathname === '/yard/' || /^\/bins\/0\d{13}[^/]{1,60}$/.test(url.pathname)),
        handler: 'NetworkFirst',
        options: {
          cacheName: PAGE_CACHE,
          networkTimeoutSeconds: 4,
          matchOptions: { ignoreSearch: true },
          expiration: { maxEntries: 80, maxAgeSeconds: 14 * 24 * 3600 },
          // Only real pages: a sign-in redirect or an error page must never be served as a saved copy.
          cacheableResponse: { statuses: [200] },
          plugins: [
            {
              // Runs inside the service worker (Workbox writes its source there), so it names the cache literally.
              handlerDidError: async () => {
                const cache = await caches.open('loopfold-yard-pages');
                return (await cache.match('/yard', { ignoreSearch: true })) ?? undefined;
              },
            },
          ],
        },
      },
    ],
  };
}

export default function yardServiceWorker() {
  let clientDir = '';
  return {
    name: 'loopfold-yard-service-worker',
    hooks: {
      'astro:config:done': ({ config }) => {
        clientDir = fileURLToPath(config.build.client);
      },
      'astro:build:done': async ({ logger }) => {
        // Loaded with Node's own require: Astro's config loader has closed its module runner by now.
        const { generateSW } = createRequire(import.meta.url)('workbox-build');
        const { count, size, warnings } = await generateSW(serviceWorkerConfig(clientDir));
        for (const w of warnings) logger.warn(w);
        logger.info(`service worker: ${count} files precached (${(size / 1024).toFixed(0)} KiB) → ${join(clientDir, 'sw.js')}`);
      },
    },
  };
}
