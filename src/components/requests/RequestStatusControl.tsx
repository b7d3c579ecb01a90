import { useState } from 'react';
import { Icon } from '@/components/ui/Icon';
import { Dialog } from '@/components/ui/Dialog';
import { api, ApiError } from '@/lib/api.client';
import { TONE_CLASSES } from '@/lib/status-look';
import { needsConfirmation, nextStatuses, statusLook, stepLabel, type RequestKind, type RequestStatus } from '@/lib/requests/request-status';

export interface RequestStatusControlProps {
  kind: RequestKind;
  id: number;
  status: string;
  version: number;
  /** Collections: the day the empties are ready, and the run day already planned. */
  readyOn?: string | null;
  plannedFor?: string | null;
  /** The operator's local day, the earliest run day offered. */
  today?: string;
}

/** The request's status (word and icon) and the planner's next steps, saved with the version the page showed. */
export default function RequestStatusControl({ kind, id, status: initialStatus, version: initialVersion, readyOn = null, plannedFor = null, today }: RequestStatusControlProps) {
  const earliest =
    [readyOn, today]
      .filter((d): d is string => !!d)
      .sort()
      .at(-1) ?? '';
  const [runDay, setRunDay] = useState(plannedFor ?? earliest);
  const [status, setStatus] = useState(initialStatus);
  const [version, setVersion] = useState(initialVersion);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [confirming, setConfirming] = useState<RequestStatus | null>(null);
  const look = statusLook(kind, status);
  const steps = nextStatuses(kind, status);

  async function move(to: RequestStatus) {
    setConfirming(null);
    setBusy(true);
    setProblem(null);
    try {
      const body = kind === 'collection' && to === 'scheduled' && runDay ? { status: to, version, plannedFor: runDay } : { status: to, version };
      const saved = await api.patch<{ status: string; version: number }>(`/api/requests/${kind}/${id}`, body);
      setStatus(saved.status);
      setVersion(saved.version);
    } catch (err) {
      setProblem(err instanceof ApiError ? err.message : 'The change could not be saved. Try again.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="flex flex-col items-start gap-2 sm:items-end" data-status-control={`${kind}-${id}`}>
      <span
        className={`inline-flex items-center gap-1.5 rounded-full border px-2 py-0.5 text-sm font-medium whitespace-nowrap ${TONE_CLASSES[look.tone]}`}
        data-request-status={status}
      >
        <Icon name={look.icon} size={16} />
        {look.label}
      </span>
      {kind === 'collection' && steps.includes('scheduled') && (
        <label className="flex items-center gap-2 text-sm">
          <span className="text-ink-soft">Run day</span>
          <input type="date" className="field min-h-touch w-auto" value={runDay} min={earliest || undefined} onChange={(e) => setRunDay(e.target.value)} data-run-day={id} />
        </label>
      )}
      {steps.length > 0 && (
        <div className="flex flex-wrap gap-2 sm:justify-end">
          {steps.map((to) => (
            <button
              key={to}
              type="button"
              disabled={busy}
              data-step={to}
              className={`${to === 'cancelled' ? 'btn-quiet text-brick' : to === steps[0] ? 'btn-primary' : 'btn-quiet'} min-h-touch px-3 text-sm`}
              onClick={() => (needsConfirmation(kind, to) ? setConfirming(to) : void move(to))}
            >
              {stepLabel(kind, status, to)}
            </button>
          ))}
        </div>
      )}
      {problem && (
        <p className="notice-fault max-w-xs text-left" role="alert">
          {problem}
        </p>
      )}
      {confirming && (
        <Dialog title="Cancel this collection request?" labelId={`confirm-${kind}-${id}`} onClose={() => setConfirming(null)}>
          <p>The request stays in the list as cancelled; the person who sent it is not told. You can reopen it later.</p>
          <div className="mt-4 flex flex-wrap justify-end gap-2">
            <button type="button" className="btn-quiet" onClick={() => setConfirming(null)}>
              Keep it
            </button>
            <button type="button" className="btn-danger" data-confirm-step={confirming} onClick={() => void move(confirming)}>
              Cancel request
            </button>
          </div>
        </Dialog>
      )}
    </div>
  );
}
