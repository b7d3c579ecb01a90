// Keeps a yard phone in step: sends waiting scans on page load, when the
// browser comes back online, when the page becomes visible again and
// periodically (sooner while scans wait, backing off while nobody answers),
// and refreshes the depot snapshot after anything was recorded. Started once
// per page by the shell's sync indicator.
import { noteBrowserOffline, queueStatus, subscribe, syncNow } from './scan-queue.client';
import { refreshSnapshot } from './depot-snapshot.client';
import { retryDelayMs } from './scan-queue-state';

const IDLE_CHECK_MS = 60_000;
const SNAPSHOT_MAX_AGE_MS = 10 * 60_000;

let started = false;

export function startYardSync(): void {
  if (started) return;
  started = true;
  let timer: ReturnType<typeof setTimeout> | undefined;
  let seenRecorded = queueStatus().recordedCount;
  let snapshotAt = 0;

  const refresh = async () => {
    await refreshSnapshot();
    if (queueStatus().online) snapshotAt = Date.now();
  };

  const schedule = () => {
    clearTimeout(timer);
    const s = queueStatus();
    timer = setTimeout(tick, s.pending.length > 0 ? retryDelayMs(s.failures) : IDLE_CHECK_MS);
  };

  async function tick() {
    const s = queueStatus();
    if (s.pending.length > 0) await syncNow();
    if (queueStatus().online && Date.now() - snapshotAt > SNAPSHOT_MAX_AGE_MS) await refresh();
    schedule();
  }

  subscribe((s) => {
    if (s.recordedCount !== seenRecorded) {
      seenRecorded = s.recordedCount;
      void refresh();
    }
  });
  window.addEventListener('online', () => void tick());
  window.addEventListener('offline', () => noteBrowserOffline());
  document.addEventListener('visibilitychange', () => {
    if (document.visibilityState === 'visible') void tick();
  });
  void (async () => {
    await syncNow();
    await refresh();
    schedule();
  })();
}
