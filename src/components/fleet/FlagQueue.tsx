// The flagged scans of one page of the queue, with a tick per row: confirm the ticked ones as right, or void them
// with one reason (each scan is still decided and recorded on its own). Rows that went through leave the list;
// a row that could not be decided keeps its tick and says why.
import { useState } from 'react';
import { Icon } from '@/components/ui/Icon';
import { Dialog, FieldProblem } from '@/components/ui/Dialog';
import { api, ApiError } from '@/lib/api.client';
import { formatCount } from '@/lib/figures';

export interface FlagRow {
  id: number;
  grai: string;
  serial: string;
  when: string;
  scan: string;
  inferred: string | null;
  why: string;
  whereWho: string;
}

interface Outcome {
  id: number;
  ok: boolean;
  message?: string;
}

/** `total`: the queue's length under the filter (this page and the others); it follows the decisions made here. */
export default function FlagQueue({ rows: initial, total: initialTotal, pageNote }: { rows: FlagRow[]; total: number; pageNote: string }) {
  const [rows, setRows] = useState(initial);
  const [total, setTotal] = useState(initialTotal);
  const [ticked, setTicked] = useState<Set<number>>(new Set());
  const [problems, setProblems] = useState<Map<number, string>>(new Map());
  const [reason, setReason] = useState('');
  const [reasonProblem, setReasonProblem] = useState<string | undefined>();
  const [summary, setSummary] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [confirmVoid, setConfirmVoid] = useState(false);

  const all = rows.length > 0 && rows.every((r) => ticked.has(r.id));
  const toggle = (id: number) =>
    setTicked((t) => {
      const next = new Set(t);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });

  async function decide(decision: 'confirm' | 'void', ids: number[]) {
    setConfirmVoid(false);
    setBusy(true);
    setSummary(null);
    setReasonProblem(undefined);
    try {
      const out = await api.post<{ outcomes: Outcome[]; summary: string }>('/api/fleet/flags/review', {
        ids,
        decision,
        ...(decision === 'void' ? { reason } : {}),
      });
      const done = new Set(out.outcomes.filter((o) => o.ok).map((o) => o.id));
      setRows((r) => r.filter((x) => !done.has(x.id)));
      setTotal((n) => n - done.size);
      setTicked((t) => new Set([...t].filter((id) => !done.has(id))));
      setProblems(new Map(out.outcomes.filter((o) => !o.ok).map((o) => [o.id, o.message ?? 'Not decided.'])));
      setSummary(out.summary);
      if (decision === 'void' && done.size) setReason('');
    } catch (e) {
      const err = e instanceof ApiError ? e : null;
      setReasonProblem(err?.fieldMessages().reason);
      setSummary(err?.message ?? 'The decision could not be saved. Try again.');
    } finally {
      setBusy(false);
    }
  }

  const chosen = rows.filter((r) => ticked.has(r.id)).map((r) => r.id);
  return (
    <div>
      <p className="mt-3 font-medium num" data-testid="flag-total">
        {formatCount(total)} waiting{pageNote}
      </p>
      <div className="mt-3 card p-3 flex flex-wrap items-end gap-3" data-testid="bulk-bar">
        <p className="font-medium num min-w-[7rem]" data-testid="ticked-count">
          {chosen.length} ticked
        </p>
        <button type="button" className="btn-quiet" disabled={busy || chosen.length === 0} onClick={() => void decide('confirm', chosen)} data-testid="confirm-ticked">
          Confirm ticked as right
        </button>
        <div className="grow min-w-[14rem]">
          <label className="label" htmlFor="void-reason">
            Reason to void (kept with each scan)
          </label>
          <input
            id="void-reason"
            className="field"
            value={reason}
            maxLength={500}
            onChange={(e) => setReason(e.target.value)}
            aria-describedby={reasonProblem ? 'void-reason-problem' : undefined}
          />
          <FieldProblem id="void-reason-problem" message={reasonProblem} />
        </div>
        <button type="button" className="btn-danger" disabled={busy || chosen.length === 0} onClick={() => setConfirmVoid(true)} data-testid="void-ticked">
          Void ticked…
        </button>
      </div>
      <p role="status" className="mt-2 min-h-[1.5rem] text-sm" data-testid="bulk-summary">
        {summary}
      </p>
      {rows.length === 0 ? (
        <p className="notice-good mt-2">Nothing left to review here.</p>
      ) : (
        <div className="relative mt-2 overflow-x-auto card" tabIndex={0} role="region" aria-label="Scans to review (the table scrolls sideways)">
          <table className="table-pin w-full text-sm">
            <thead>
              <tr className="text-left text-ink-soft border-b border-paper-line">
                <th className="p-3 w-10">
                  <input
                    type="checkbox"
                    className="h-5 w-5"
                    aria-label="Tick every scan on this page"
                    checked={all}
                    onChange={() => setTicked(all ? new Set() : new Set(rows.map((r) => r.id)))}
                  />
                </th>
                <th className="p-3">Bin</th>
                <th className="p-3">When</th>
                <th className="p-3">Scan</th>
                <th className="p-3">Why flagged</th>
                <th className="p-3">Where · who</th>
                <th className="p-3">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-b border-paper-line align-top" data-flag-id={r.id}>
                  <td className="p-3">
                    <input type="checkbox" className="h-5 w-5" aria-label={`Tick the scan of bin ${r.serial}`} checked={ticked.has(r.id)} onChange={() => toggle(r.id)} />
                  </td>
                  <td className="p-3">
                    <a className="ident" href={`/bins/${r.grai}`}>
                      {r.serial}
                    </a>
                  </td>
                  <td className="p-3 num whitespace-nowrap">{r.when}</td>
                  <td className="p-3">
                    {r.scan}
                    {r.inferred && <div className="text-ink-soft">inferred before it: {r.inferred}</div>}
                  </td>
                  <td className="p-3">
                    <span className="inline-flex items-center gap-1">
                      <Icon name="alert" size={16} />
                      {r.why}
                    </span>
                    {problems.get(r.id) && (
                      <p className="mt-1 font-medium text-brick" data-testid="row-problem">
                        {problems.get(r.id)}
                      </p>
                    )}
                  </td>
                  <td className="p-3">{r.whereWho}</td>
                  <td className="p-3 whitespace-nowrap">
                    <button type="button" className="btn-quiet min-h-[40px] text-sm" data-review={r.id} disabled={busy} onClick={() => void decide('confirm', [r.id])}>
                      Looks right
                    </button>{' '}
                    <a className="btn-quiet min-h-[40px] text-sm" href={`/bins/${r.grai}`}>
                      Open bin
                    </a>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {confirmVoid && (
        <Dialog title={`Void ${chosen.length} scan${chosen.length === 1 ? '' : 's'}?`} labelId="confirm-bulk-void" onClose={() => setConfirmVoid(false)}>
          <p>Each scan is voided on its own with your reason, and its bin’s state is rebuilt from the rest of its history. Voids stay in the history; they are not deleted.</p>
          <div className="mt-4 flex flex-wrap justify-end gap-2">
            <button type="button" className="btn-quiet" onClick={() => setConfirmVoid(false)}>
              Keep them
            </button>
            <button type="button" className="btn-danger" data-testid="void-ticked-confirm" onClick={() => void decide('void', chosen)}>
              Void {chosen.length}
            </button>
          </div>
        </Dialog>
      )}
    </div>
  );
}
