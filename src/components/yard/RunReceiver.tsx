// Receiving a truck run: each bin identified is recorded at once as a receive scan naming the run (the scan service
// refuses what the rule table refuses, with its reason); what is still expected per stop is read again after each.
import { useState } from 'react';
import type { Identified } from '@/components/yard/ScanInput';
import ContinuousScan from '@/components/yard/ContinuousScan';
import { api, type ApiError } from '@/lib/api.client';
import { newClientEventId } from '@/lib/yard/ids.client';

interface YardRun {
  id: number;
  reference: string;
  status: string;
  stops: Array<{ name: string; expected: number; received: number; left: number }>;
  expected: number;
  received: number;
  left: number;
}
interface Props {
  run: YardRun;
  prefixLength: number;
  cautions: string[];
  defer: string;
}
type Attempt = { key: string; label: string; ok: boolean; message: string };

export default function RunReceiver(props: Props) {
  const [run, setRun] = useState<YardRun>(props.run);
  const [attempts, setAttempts] = useState<Attempt[]>([]);
  const [busy, setBusy] = useState(false);
  const done = run.status !== 'confirmed';

  async function receive(id: Identified) {
    const label = id.grai ?? id.serial!;
    setBusy(true);
    try {
      await api.post('/api/scan-events', { clientEventId: newClientEventId(), grai: label, action: 'receive', runId: run.id });
      const next = await api.get<YardRun>(`/api/yard/runs/${run.id}`);
      setRun(next);
      setAttempts((a) => [{ key: newClientEventId(), label, ok: true, message: `Received (${next.received} in, ${next.left} still expected).` }, ...a].slice(0, 12));
    } catch (e) {
      setAttempts((a) => [{ key: newClientEventId(), label, ok: false, message: (e as ApiError).message }, ...a].slice(0, 12));
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="space-y-4">
      <div className="card p-4">
        <div className="flex items-baseline justify-between">
          <span className="text-lg font-semibold">Received</span>
          <span className="num text-3xl font-bold" data-testid="run-count">
            {run.received}
            <span className="text-lg text-ink-soft">/{run.expected}</span>
          </span>
        </div>
        <div
          className="mt-2 h-3 rounded-full bg-paper-deep"
          role="progressbar"
          aria-label="Bins received against the bins expected"
          aria-valuemin={0}
          aria-valuemax={run.expected}
          aria-valuenow={run.received}
        >
          <div className="h-3 rounded-full bg-kelp" style={{ width: `${Math.min(100, run.expected ? (run.received / run.expected) * 100 : 0)}%` }} />
        </div>
        <ul className="mt-3 space-y-1 text-sm" data-testid="run-stops-left">
          {run.stops.map((s) => (
            <li key={s.name} className="flex justify-between gap-2">
              <span>{s.name}</span>
              <span className="num">{s.left > 0 ? `${s.left} still expected (${s.received} of ${s.expected})` : `all ${s.expected} in`}</span>
            </li>
          ))}
        </ul>
        {done && (
          <p className="notice-good mt-3" data-testid="run-done">
            The run is {run.status === 'done' ? 'done: every expected bin is in' : run.status}.
          </p>
        )}
      </div>

      {!done && (
        <ContinuousScan
          prefixLength={props.prefixLength}
          onIdentified={receive}
          busy={busy}
          label="Scan or type each bin as it comes off"
          cautions={props.cautions}
          defer={props.defer}
        />
      )}

      {attempts.length > 0 && (
        <ul className="space-y-1" aria-live="polite" data-testid="run-attempts">
          {attempts.map((a) => (
            <li key={a.key} className={a.ok ? 'notice-good' : 'notice-fault'} data-ok={a.ok}>
              <span className="ident">{a.label}</span>: {a.message}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
