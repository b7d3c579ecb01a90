// Registers the yard's service worker (built by src/integrations/yard-service-worker.mjs).
// Service workers exist only in secure contexts (HTTPS, or localhost).

/** Must match PAGE_CACHE in src/integrations/yard-service-worker.mjs. */
const PAGE_CACHE = 'loopfold-yard-pages';
const LAST_USER_KEY = 'loopfold.yardUser';

export function registerYardServiceWorker(userId: number): void {
  if (!('serviceWorker' in navigator) || !window.isSecureContext) return;
  // Another person signed in on this phone: the pages kept for the previous one must not show offline.
  let forgotten: Promise<unknown> = Promise.resolve();
  try {
    const last = localStorage.getItem(LAST_USER_KEY);
    if (last !== null && last !== String(userId)) forgotten = caches.delete(PAGE_CACHE);
    localStorage.setItem(LAST_USER_KEY, String(userId));
  } catch {
    /* storage blocked: nothing kept to protect */
  }
  const firstVisit = !navigator.serviceWorker.controller;
  forgotten
    .then(() => navigator.serviceWorker.register('/sw.js'))
    .then(() => navigator.serviceWorker.ready)
    .then(async () => {
      // On the very first visit the page loaded before its service worker existed, so nothing saved it.
      if (firstVisit) await keep(location.pathname);
      // The yard page is the offline fallback for every bin page the phone never saved: make sure it is there.
      if (location.pathname !== '/yard') await keep('/yard', { onlyIfMissing: true });
    })
    .catch(() => {
      /* a dev server has no service worker; the app works without one, only not offline */
    });
}

async function keep(path: string, { onlyIfMissing = false } = {}): Promise<void> {
  const cache = await caches.open(PAGE_CACHE);
  if (onlyIfMissing && (await cache.match(path, { ignoreSearch: true }))) return;
  const res = await fetch(path, { credentials: 'same-origin', cache: 'no-store' });
  if (!res.ok || res.redirected) return; // never keep a sign-in page under a yard address
  await cache.put(path, res);
}
