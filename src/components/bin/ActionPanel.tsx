// The actions a user may take on a bin: a big button per action, each opening
// its short form, and what became of the last one (recorded, saved on the
// phone to send later, or refused with the reason). The bin page and the
// yard's offline bin card both use it; `record` decides how a scan is sent.
import { useState } from 'react';
import { ACTION_LABELS, STATUS_LABELS, type Action, type Status } from '@/lib/scans/lifecycle';
import ActionForm, { type ActionOptions } from './ActionForm';

export type PanelOutcome = { kind: 'recorded'; statusTo: Status; inferred: Action[] } | { kind: 'queued'; waiting: number } | { kind: 'refused'; message: string };

interface Props extends ActionOptions {
  actions: Action[];
  siteName: string | null;
  record: (action: Action, extra: Record<string, unknown>) => Promise<PanelOutcome>;
}

export default function ActionPanel({ actions, siteName, record, ...options }: Props) {
  const [open, setOpen] = useState<Action | null>(null);
  const [busy, setBusy] = useState(false);
  const [outcome, setOutcome] = useState<PanelOutcome | null>(null);

  async function submit(action: Action, extra: Record<string, unknown>) {
    setBusy(true);
    setOutcome(null);
    try {
      const out = await record(action, extra);
      setOutcome(out);
      if (out.kind !== 'refused') setOpen(null);
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="space-y-3">
      {outcome?.kind === 'recorded' && (
        <p className="notice-good" role="status">
          Recorded. The bin is now <strong>{STATUS_LABELS[outcome.statusTo].toLowerCase()}</strong>.
          {outcome.inferred.length > 0 && <> Missed steps were inferred and flagged for a planner: {outcome.inferred.map((a) => ACTION_LABELS[a]).join(', ')}.</>}
        </p>
      )}
      {outcome?.kind === 'queued' && (
        <p className="notice-info" role="status" data-queued>
          Saved on this phone: Loopfold cannot be reached right now. It is sent by itself as soon as it can ({outcome.waiting} waiting).
        </p>
      )}
      {outcome?.kind === 'refused' && (
        <p className="notice-fault" role="alert">
          {outcome.message}
        </p>
      )}
      {actions.length === 0 ? (
        <p className="text-ink-soft">Nothing can be recorded on this bin from {siteName ?? 'here'} right now.</p>
      ) : (
        <>
          {siteName && <p className="text-sm text-ink-soft">Recording at {siteName}.</p>}
          <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
            {actions.map((a) => (
              <button
                key={a}
                type="button"
                className={open === a ? 'btn-primary justify-start' : 'btn-quiet justify-start'}
                aria-expanded={open === a}
                data-action={a}
                onClick={() => {
                  setOpen(open === a ? null : a);
                  setOutcome(null);
                }}
              >
                {ACTION_LABELS[a]}
              </button>
            ))}
          </div>
        </>
      )}
      {open && actions.includes(open) && (
        <ActionForm key={open} action={open} options={options} busy={busy} onCancel={() => setOpen(null)} onSubmit={(extra) => void submit(open, extra)} />
      )}
    </div>
  );
}
