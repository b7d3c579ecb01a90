// A bin as the phone knows it without signal: from the depot snapshot, moved
// on by the scans still waiting on the phone, with the actions the rule table
// allows from there. What is recorded here waits in the phone's queue.
import { useEffect, useState } from 'react';
import { groupGrai } from '@/lib/gs1';
import type { Identified } from '@/lib/bins/bin-identify';
import { ACTION_LABELS, isInspectionLapsed, type Action, type Status } from '@/lib/scans/lifecycle';
import { CAUTIONS, DEFER } from '@/lib/yard/safety';
import { findInSnapshot, offlineActions, projectBin, todayIn, type ActingContext } from '@/lib/yard/yard-offline';
import { dateWithHint, instantLabel } from '@/lib/dates-display';
import { newClientEventId } from '@/lib/yard/ids.client';
import { submitScan, subscribe, type QueueStatus } from '@/lib/yard/scan-queue.client';
import { loadSnapshot, onSnapshot } from '@/lib/yard/depot-snapshot.client';
import type { StoredSnapshot } from '@/lib/yard/yard-db.client';
import type { ScanEventBody } from '@/lib/scans/scan-schema';
import { formatLongDate } from '@/lib/calendar';
import ActionPanel, { type PanelOutcome } from '@/components/bin/ActionPanel';
import { StatusBadge } from '@/components/ui/StatusBadge';
import { Icon } from '@/components/ui/Icon';

interface Props {
  identified: Identified;
  prefixLength: number;
  onClose: () => void;
}

export default function OfflineBinCard({ identified, prefixLength, onClose }: Props) {
  const [stored, setStored] = useState<StoredSnapshot | null | undefined>(undefined);
  const [queue, setQueue] = useState<QueueStatus | null>(null);

  useEffect(() => {
    void loadSnapshot().then((s) => setStored(s));
    const offSnap = onSnapshot((s) => setStored(s));
    const offQueue = subscribe(setQueue);
    return () => {
      offSnap();
      offQueue();
    };
  }, []);

  if (stored === undefined || queue === null) return null;
  const graiText = identified.grai ? safeGroup(identified.grai, prefixLength) : null;
  const snapshot = stored?.snapshot ?? null;
  const ctx: ActingContext | null = snapshot ? { role: 'yard', today: todayIn(snapshot.timeZone, new Date()), site: { id: snapshot.depot.id, kind: snapshot.depot.kind } } : null;
  const found = snapshot ? findInSnapshot(snapshot, identified) : null;
  const pendingBodies = queue.pending.map((p) => p.body);
  const projection = found && ctx ? projectBin(found, pendingBodies, ctx) : null;
  const bin = projection?.bin ?? null;

  async function record(target: { assetId?: number; grai?: string; serial: string | null }, action: Action, extra: Record<string, unknown>): Promise<PanelOutcome> {
    const body = {
      clientEventId: newClientEventId(),
      ...(target.assetId !== undefined ? { assetId: target.assetId } : { grai: target.grai }),
      action,
      siteId: snapshot?.depot.id,
      // The lots offered came from this snapshot: a lot stopped after it was taken was not known here.
      ...(action === 'fit_liner' && stored ? { lotsAsOf: stored.storedAt } : {}),
      ...extra,
    } as ScanEventBody;
    const r = await submitScan(body, { grai: target.grai ?? null, serial: target.serial, action });
    if (r.kind === 'recorded') return { kind: 'recorded', statusTo: r.outcome.statusTo as Status, inferred: r.outcome.inferred };
    return r.kind === 'queued' ? r : { kind: 'refused', message: r.message };
  }

  return (
    <section className="card mt-4 space-y-3 border-2 border-harbour p-4" aria-labelledby="offline-bin-title" data-offline-card data-grai={bin?.grai ?? identified.grai ?? ''}>
      <div className="flex items-start justify-between gap-3">
        <div>
          <p className="text-sm font-medium text-harbour">Offline view</p>
          <h2 id="offline-bin-title" className="ident break-all">
            {bin ? `Bin ${bin.serial}` : (graiText ?? `Serial ${identified.serial}`)}
          </h2>
          {bin && <p className="ident text-sm text-ink-soft break-all">{safeGroup(bin.grai, prefixLength)}</p>}
        </div>
        <button type="button" className="btn-quiet min-w-touch px-3" onClick={onClose} aria-label="Close the offline view">
          ✕
        </button>
      </div>

      <p className="notice-info" role="status">
        No connection to Loopfold.{' '}
        {snapshot ? (
          <>Showing your depot as this phone saw it at {instantLabel(stored!.storedAt, snapshot.timeZone)}.</>
        ) : (
          <>This phone has no offline copy of your depot yet: it is saved the next time the yard page opens with signal.</>
        )}{' '}
        What you record is saved on the phone and sent when the signal is back.
      </p>

      {bin && projection && ctx && snapshot && (
        <>
          <div className="flex flex-wrap items-center gap-2">
            <StatusBadge status={bin.status} size="lg" testLapsed={isInspectionLapsed(bin.nextDue, ctx.today)} />
            {projection.applied > 0 && (
              <span className="text-sm text-ink-soft">
                after {projection.applied} scan{projection.applied === 1 ? '' : 's'} waiting on this phone
              </span>
            )}
          </div>
          <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
            <dt className="text-ink-soft">Type</dt>
            <dd>{bin.binType}</dd>
            <dt className="text-ink-soft">Where</dt>
            <dd>{bin.where === 'here' ? snapshot.depot.name : `On its way back to ${snapshot.depot.name}`}</dd>
            <dt className="text-ink-soft">Test due</dt>
            <dd className="num">{bin.nextDue ? dateWithHint(bin.nextDue, ctx.today) : 'no periodic test'}</dd>
            <dt className="text-ink-soft">Prep check</dt>
            <dd>{bin.prepChecked ? 'passed since it arrived' : 'not yet'}</dd>
          </dl>
          {bin.nextDue && isInspectionLapsed(bin.nextDue, ctx.today) && (
            <p className="notice-fault flex items-center gap-2" role="status">
              <Icon name="alert" /> Periodic test lapsed on {formatLongDate(bin.nextDue)}: it may not be lined, filled or dispatched until it passes.
            </p>
          )}
          {projection.blocked && (
            <p className="notice-attention" role="status">
              A waiting scan ({ACTION_LABELS[projection.blocked.action]}) will probably be refused: {projection.blocked.reason}
            </p>
          )}
          <ActionPanel
            actions={offlineActions(bin, ctx)}
            siteName={snapshot.depot.name}
            record={(action, extra) => record({ assetId: bin.id, grai: bin.grai, serial: bin.serial }, action, extra)}
            lots={snapshot.lots}
            orders={snapshot.orders.filter((o) => o.binTypeId === bin.binTypeId)}
            cautions={CAUTIONS}
            defer={DEFER}
            status={bin.status as Status}
          />
        </>
      )}

      {!bin && snapshot && (
        <div className="space-y-3">
          <p>
            {identified.grai ? 'This bin is not in your depot’s offline list' : `No single bin in your depot’s offline list has serial ${identified.serial}`} (bins here and bins on
            their way back here).
            {identified.grai ? ' If it has just arrived, you can still receive it: Loopfold checks it when the signal is back.' : ' Scan or type the full GRAI instead.'}
          </p>
          {identified.grai && (
            <ActionPanel
              actions={['receive']}
              siteName={snapshot.depot.name}
              record={(action, extra) => record({ grai: identified.grai!, serial: null }, action, extra)}
              lots={[]}
              orders={[]}
              cautions={CAUTIONS}
              defer={DEFER}
              status="in_transit"
            />
          )}
        </div>
      )}
    </section>
  );
}

function safeGroup(grai: string, prefixLength: number): string {
  try {
    return groupGrai(grai, prefixLength);
  } catch {
    return grai;
  }
}
