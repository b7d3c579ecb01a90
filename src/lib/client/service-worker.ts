// Registers the yard's service worker (built by src/integrations/yard-service-worker.mjs).
// Service workers exist only in secure contexts (HTTPS, or localhost).

/** Must match PAGE_CACHE in src/integrations/yard-service-worker.mjs. */
const PAGE_CACHE = 'loopfold-yard-pages';
const LAST_USER_KEY = 'loopfold.yardUser';

export function registerYardServiceWorker(userId: number): void {
  if (!('serviceWorker' in navigator) || !window.isSecureContext) return;
  // Another person signed in on this phone: the pages kept for the previous one must not show offline.
  try {
    const last = localStorage.getItem(LAST_USER_KEY);
    if (last !== null && last !== String(userId)) void caches.delete(PAGE_CACHE);
    localStorage.setItem(LAST_USER_KEY, String(userId));
  } catch {
    /* storage blocked: nothing kept to protect */
  }
  const firstVisit = !navigator.serviceWorker.controller;
  navigator.serviceWorker
    .register('/sw.js')
    .then(() => navigator.serviceWorker.ready)
    .then(() => (firstVisit ? keepThisPage() : undefined))
    .catch(() => {
      /* a dev server has no service worker; the app works without one, only not offline */
    });
}

// On the very first visit the page loaded before its service worker existed, so nothing saved it; save it
// now, or the phone would have no yard page to open offline until the next visit.
async function keepThisPage(): Promise<void> {
  const res = await fetch(location.pathname, { credentials: 'same-origin', cache: 'no-store' });
  if (!res.ok || res.redirected) return; // never keep a sign-in page under the yard's address
  const cache = await caches.open(PAGE_CACHE);
  await cache.put(location.pathname, res);
}
