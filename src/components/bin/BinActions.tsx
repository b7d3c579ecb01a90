// The bin page's actions island. Records through POST /api/scan-events with
// the bin's version, so two people acting at once cannot overwrite each other.
// Yard users record through the phone's scan queue: without signal the scan is
// saved on the phone and sent later (src/lib/yard/scan-queue.client.ts).
import { api, ApiError } from '@/lib/api.client';
import { newClientEventId } from '@/lib/yard/ids.client';
import { submitScan } from '@/lib/yard/scan-queue.client';
import type { Action, Status } from '@/lib/scans/lifecycle';
import type { LotOption, OrderOption, SiteOption } from '@/lib/yard/action-options.server';
import ActionPanel, { type PanelOutcome } from './ActionPanel';

export interface BinActionsProps {
  assetId: number;
  grai: string;
  serial: string;
  version: number;
  actions: Action[];
  actingSite: SiteOption | null;
  lots: LotOption[];
  orders: OrderOption[];
  cautions: Partial<Record<Action, string[]>>;
  defer: string;
  status: Status;
  /** Record through the phone's offline queue (yard users). */
  queue?: boolean;
}

type Outcome = { statusTo: Status; inferred: Action[] };

const reloadSoon = () => setTimeout(() => window.location.reload(), 900);

export default function BinActions({ assetId, grai, serial, version, actions, actingSite, queue = false, ...options }: BinActionsProps) {
  async function record(action: Action, extra: Record<string, unknown>): Promise<PanelOutcome> {
    const body = { clientEventId: newClientEventId(), assetId, action, siteId: actingSite?.id ?? null, expectedVersion: version, ...extra };
    if (queue) {
      const r = await submitScan(body as Parameters<typeof submitScan>[0], { grai, serial, action });
      if (r.kind === 'recorded') {
        reloadSoon();
        return { kind: 'recorded', statusTo: r.outcome.statusTo as Status, inferred: r.outcome.inferred };
      }
      return r.kind === 'queued' ? r : { kind: 'refused', message: r.message };
    }
    try {
      const out = await api.post<Outcome>('/api/scan-events', body);
      reloadSoon();
      return { kind: 'recorded', ...out };
    } catch (e) {
      return { kind: 'refused', message: (e as ApiError).message };
    }
  }

  return <ActionPanel actions={actions} siteName={actingSite?.name ?? null} record={record} {...options} />;
}
