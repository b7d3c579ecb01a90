// The yard shell's connection and sync indicator: online or offline, how many
// scans wait on the phone, and the ones the server refused, with the reason,
// until the user dismisses them. It also starts the yard's background sync
// and registers the service worker, once per page.
import { useEffect, useState } from 'react';
import { ACTION_LABELS } from '@/lib/scans/lifecycle';
import { dismissRefused, subscribe, syncNow, type QueueStatus } from '@/lib/yard/scan-queue.client';
import { startYardSync } from '@/lib/yard/yard-sync.client';
import { registerYardServiceWorker } from '@/lib/yard/service-worker.client';
import { currentUserId } from '@/lib/yard/yard-db.client';
import type { QueuedScan } from '@/lib/yard/scan-queue-state';
import { instantLabel } from '@/lib/dates-display';

// Signal bars and a struck-through cloud: the state is always a word and a shape, never colour alone.
const ONLINE_PATH = 'M4 18h.01M8 18v-3M12 18v-7M16 18V8M20 18V5';
const OFFLINE_PATH = 'M7 17h10a4 4 0 0 0 .5-8A6 6 0 0 0 6 9.5 3.8 3.8 0 0 0 7 17zM4 4l16 16';

// When a scan was queued, in the phone's own zone ("14 Mar 2027, 09:12"), through the shared formatter.
const PHONE_ZONE = Intl.DateTimeFormat().resolvedOptions().timeZone;
function when(iso: string): string {
  return instantLabel(iso, PHONE_ZONE);
}

function what(s: QueuedScan): string {
  return `${ACTION_LABELS[s.label.action]} · ${s.label.serial ?? s.label.grai ?? 'bin'}`;
}

export default function SyncStatus() {
  const [s, setS] = useState<QueueStatus | null>(null);
  const [open, setOpen] = useState(false);

  useEffect(() => {
    const off = subscribe(setS);
    startYardSync();
    const userId = currentUserId();
    if (userId !== null) registerYardServiceWorker(userId);
    return off;
  }, []);

  const online = s?.online ?? true;
  const waiting = s?.pending.length ?? 0;
  const refusedCount = s?.refused.length ?? 0;
  const summary = s?.syncing ? 'Sending…' : waiting > 0 ? `${waiting} waiting` : 'All sent';

  return (
    <div className="basis-full" data-sync-status data-sync-state={online ? 'online' : 'offline'} data-pending-count={waiting} data-refused-count={refusedCount}>
      <button
        type="button"
        className={`flex w-full min-h-touch items-center gap-3 rounded-md px-3 text-left text-sm font-medium ${online ? 'bg-white/10 text-white' : 'bg-ochre text-ink'}`}
        aria-expanded={open}
        aria-controls="sync-panel"
        onClick={() => setOpen(!open)}
      >
        <svg width="20" height="20" viewBox="0 0 24 24" fill="none" stroke="currentColor" strokeWidth={2} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true">
          <path d={online ? ONLINE_PATH : OFFLINE_PATH} />
        </svg>
        <span>{online ? 'Online' : 'Offline'}</span>
        <span aria-hidden="true">·</span>
        <span className="num" data-waiting>
          {summary}
        </span>
        {refusedCount > 0 && (
          <span className="ml-auto rounded-full bg-brick px-2 py-0.5 text-white num" data-refused>
            {refusedCount} refused
          </span>
        )}
        {s?.needsSignIn && <span className={refusedCount > 0 ? '' : 'ml-auto'}>Sign in again</span>}
      </button>

      {open && s && (
        <div id="sync-panel" className="mt-2 max-h-[60vh] space-y-3 overflow-y-auto rounded-md bg-card p-3 text-ink" data-sync-panel>
          {s.needsSignIn && (
            <p className="notice-attention">
              Your session has ended. <a href={`/login?next=${encodeURIComponent(location.pathname)}`}>Sign in again</a> to send the {waiting} scans waiting on this phone; they
              stay here meanwhile.
            </p>
          )}
          {!online && <p className="text-sm">No connection to Loopfold. Scans are saved on this phone and sent by themselves when the signal is back.</p>}
          {s.refused.length > 0 && (
            <section aria-labelledby="refused-title">
              <h3 id="refused-title" className="font-semibold">
                Refused by Loopfold
              </h3>
              <p className="text-sm text-ink-soft">These were not recorded. Check each bin and record again what still applies.</p>
              <ul className="mt-2 space-y-2">
                {s.refused.map((r) => (
                  <li key={r.clientEventId} className="notice-fault" data-refused-item={r.clientEventId}>
                    <div className="font-medium">{what(r)}</div>
                    <div>{r.message}</div>
                    <div className="mt-1 flex items-center justify-between gap-2 text-xs">
                      <span>scanned {when(r.queuedAt)}</span>
                      <span className="flex gap-2">
                        {r.label.grai && (
                          <a href={`/bins/${r.label.grai}`} className="btn-quiet min-h-[40px] px-3 text-sm">
                            Open bin
                          </a>
                        )}
                        <button type="button" className="btn-quiet min-h-[40px] px-3 text-sm" onClick={() => void dismissRefused(r.clientEventId)}>
                          Dismiss
                        </button>
                      </span>
                    </div>
                  </li>
                ))}
              </ul>
            </section>
          )}
          <section aria-labelledby="waiting-title">
            <h3 id="waiting-title" className="font-semibold">
              Waiting on this phone
            </h3>
            {s.pending.length === 0 ? (
              <p className="text-sm text-ink-soft">Nothing waiting: every scan has reached Loopfold.</p>
            ) : (
              <ul className="mt-1 divide-y divide-paper-line text-sm">
                {s.pending.map((p) => (
                  <li key={p.clientEventId} className="py-1.5" data-waiting-item={p.clientEventId}>
                    <span className="font-medium">{what(p)}</span> <span className="text-ink-soft">· {when(p.queuedAt)}</span>
                    {p.lastError && <div className="text-xs text-ink-soft">last try: {p.lastError}</div>}
                  </li>
                ))}
              </ul>
            )}
          </section>
          <button type="button" className="btn-primary w-full" disabled={s.syncing || s.pending.length === 0} onClick={() => void syncNow()}>
            {s.syncing ? 'Sending…' : 'Send now'}
          </button>
        </div>
      )}
    </div>
  );
}
