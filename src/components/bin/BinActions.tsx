// The bin page's actions island. Records through POST /api/scan-events with
// the bin's version, so two people acting at once cannot overwrite each other.
// Yard users record through the phone's scan queue: without signal the scan is
// saved on the phone and sent later (src/lib/yard/scan-queue.client.ts).
//
// After a scan the page reloads (status, history and the actions offered all
// change); what was recorded is carried across the reload in sessionStorage and
// kept in view at the top of the actions, with "Undo" while the operator's undo
// window lasts (src/lib/scans/undo-window.ts; the server decides).
import { useEffect, useRef, useState } from 'react';
import { api, ApiError } from '@/lib/api.client';
import { newClientEventId } from '@/lib/yard/ids.client';
import { submitScan } from '@/lib/yard/scan-queue.client';
import { ACTION_LABELS, STATUS_LABELS, type Action, type Status } from '@/lib/scans/lifecycle';
import { recordedWords, undoSecondsLeft } from '@/lib/scans/undo-window';
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
  /** The operator's undo window in seconds (0: no undo). */
  undoSeconds?: number;
}

type Outcome = { statusTo: Status; inferred: Action[]; eventId?: number };

/** What the page shows after the reload. `at` is this browser's clock when the answer came. */
type Carried =
  | { kind: 'recorded'; action: Action; statusTo: Status; inferred: Action[]; eventId: number | null; at: number }
  | { kind: 'undone'; action: Action; statusTo: Status };

const keyOf = (grai: string) => `loopfold:last-scan:${grai}`;
// A margin for the trip to the server: the phone stops offering undo a little before the server would refuse it.
const MARGIN_S = 2;

function carry(grai: string, c: Carried) {
  try {
    sessionStorage.setItem(keyOf(grai), JSON.stringify(c));
  } catch {
    /* private mode: the reload simply shows no confirmation */
  }
  // Land at the top of the bin's actions, not where the page was scrolled.
  if ('scrollRestoration' in history) history.scrollRestoration = 'manual';
  history.replaceState(history.state, '', `${location.pathname}${location.search}#bin-actions`);
  // A moment for the panel's own notice; the page then shows the carried confirmation.
  setTimeout(() => location.reload(), 600);
}

function readCarried(grai: string): Carried | null {
  try {
    const raw = sessionStorage.getItem(keyOf(grai));
    return raw ? (JSON.parse(raw) as Carried) : null;
  } catch {
    return null;
  }
}

function Confirmation({ carried, grai, undoSeconds }: { carried: Carried; grai: string; undoSeconds: number }) {
  const ref = useRef<HTMLParagraphElement>(null);
  const [left, setLeft] = useState(() => (carried.kind === 'recorded' && carried.eventId ? undoSecondsLeft(new Date(carried.at), new Date(), undoSeconds - MARGIN_S) : 0));
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    ref.current?.closest('section')?.scrollIntoView({ block: 'start' });
    ref.current?.focus({ preventScroll: true });
  }, []);
  useEffect(() => {
    if (carried.kind !== 'recorded' || left <= 0) return;
    const timer = setInterval(() => {
      const next = undoSecondsLeft(new Date(carried.at), new Date(), undoSeconds - MARGIN_S);
      setLeft(next);
      if (next <= 0) clearInterval(timer);
    }, 1000);
    return () => clearInterval(timer);
  }, [carried, undoSeconds, left > 0]);

  async function undo() {
    if (carried.kind !== 'recorded' || !carried.eventId) return;
    setBusy(true);
    setProblem(null);
    try {
      const r = await api.post<{ status: Status }>(`/api/scan-events/${carried.eventId}/undo`, {});
      carry(grai, { kind: 'undone', action: carried.action, statusTo: r.status });
    } catch (e) {
      setProblem(e instanceof ApiError ? e.message : 'The undo did not reach Loopfold. Try again, or ask a planner to void the scan.');
      setBusy(false);
      setLeft(0);
    }
  }

  if (carried.kind === 'undone') {
    return (
      <p ref={ref} tabIndex={-1} className="notice-info" role="status" id="scan-confirmation" data-confirmation="undone">
        {ACTION_LABELS[carried.action]} undone: kept in the history as void. The bin is {STATUS_LABELS[carried.statusTo].toLowerCase()} again.
      </p>
    );
  }
  return (
    <p ref={ref} tabIndex={-1} className="notice-good flex flex-wrap items-center justify-between gap-3" role="status" id="scan-confirmation" data-confirmation="recorded">
      <span>
        <strong>{recordedWords(ACTION_LABELS[carried.action], STATUS_LABELS[carried.statusTo])}</strong>
        {carried.inferred.length > 0 && <> Missed steps were inferred and flagged for a planner: {carried.inferred.map((a) => ACTION_LABELS[a]).join(', ')}.</>}
        {problem && (
          <span className="mt-1 block" role="alert">
            {problem}
          </span>
        )}
      </span>
      {left > 0 && (
        <button type="button" className="btn-quiet" onClick={() => void undo()} disabled={busy} id="scan-undo">
          {busy ? 'Undoing…' : `Undo (${left} s)`}
        </button>
      )}
    </p>
  );
}

export default function BinActions({ assetId, grai, serial, version, actions, actingSite, queue = false, undoSeconds = 0, ...options }: BinActionsProps) {
  const [carried, setCarried] = useState<Carried | null>(null);
  useEffect(() => {
    const c = readCarried(grai);
    if (!c) return;
    setCarried(c);
    // Shown once: a later visit to the page starts clean.
    sessionStorage.removeItem(keyOf(grai));
  }, [grai]);

  async function record(action: Action, extra: Record<string, unknown>): Promise<PanelOutcome> {
    const body = { clientEventId: newClientEventId(), assetId, action, siteId: actingSite?.id ?? null, expectedVersion: version, ...extra };
    const recorded = (out: Outcome): PanelOutcome => {
      carry(grai, { kind: 'recorded', action, statusTo: out.statusTo, inferred: out.inferred, eventId: out.eventId ?? null, at: Date.now() });
      return { kind: 'recorded', statusTo: out.statusTo, inferred: out.inferred };
    };
    if (queue) {
      const r = await submitScan(body as Parameters<typeof submitScan>[0], { grai, serial, action });
      if (r.kind === 'recorded') return recorded({ statusTo: r.outcome.statusTo as Status, inferred: r.outcome.inferred, eventId: r.outcome.eventId });
      return r.kind === 'queued' ? r : { kind: 'refused', message: r.message };
    }
    try {
      return recorded(await api.post<Outcome>('/api/scan-events', body));
    } catch (e) {
      return { kind: 'refused', message: (e as ApiError).message };
    }
  }

  return (
    <div className="space-y-3">
      {carried && <Confirmation carried={carried} grai={grai} undoSeconds={undoSeconds} />}
      <ActionPanel actions={actions} siteName={actingSite?.name ?? null} record={record} {...options} />
    </div>
  );
}
