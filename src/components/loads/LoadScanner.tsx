// Continuous scan mode: each bin identified is put on the load at once
// (a dispatch scan). Shows count against target, the bins on, and every
// refusal with its reason; then the carrier's details send the truck off.
import { useState, type FormEvent } from 'react';
import type { Identified } from '@/components/yard/ScanInput';
import ContinuousScan from '@/components/yard/ContinuousScan';
import { api, type ApiError } from '@/lib/api.client';
import { newClientEventId } from '@/lib/yard/ids.client';

interface Bin {
  grai: string;
  serial: string;
  lotNumber: string | null;
}
interface Props {
  reference: string;
  status: string;
  target: number;
  bins: Bin[];
  prefixLength: number;
  cautions: string[];
  defer: string;
  /** Planners may send a bin past the operator's lapse margin with a reason (never past the order's wanted date). */
  canOverride?: boolean;
  /** The trailers in use (admin data); the one chosen is checked against the bins on and named on the note. */
  trailers: Array<{ id: number; name: string }>;
}
type Attempt = { key: string; label: string; ok: boolean; message: string; overridable?: boolean };

export default function LoadScanner(props: Props) {
  const [bins, setBins] = useState<Bin[]>(props.bins);
  const [attempts, setAttempts] = useState<Attempt[]>([]);
  const [busy, setBusy] = useState(false);
  const [status, setStatus] = useState(props.status);
  const [error, setError] = useState<string | null>(null);
  const full = bins.length >= props.target;

  async function add(id: Identified, overrideReason?: string) {
    const label = id.grai ?? id.serial!;
    setBusy(true);
    try {
      const out = await api.post<{ grai: string; loaded: number; replayed: boolean }>(`/api/loads/${encodeURIComponent(props.reference)}/bins`, {
        clientEventId: newClientEventId(),
        grai: label,
        ...(overrideReason ? { overrideReason } : {}),
      });
      if (!out.replayed) setBins((b) => [{ grai: out.grai, serial: out.grai.slice(14), lotNumber: null }, ...b]);
      const message = `On the load (${out.loaded} of ${props.target}).${overrideReason ? ' Sent past the margin; your reason is recorded.' : ''}`;
      setAttempts((a) => [{ key: newClientEventId(), label, ok: true, message }, ...a.filter((x) => !(overrideReason && x.label === label && x.overridable))].slice(0, 12));
    } catch (e) {
      const err = e as ApiError;
      const overridable = Boolean(props.canOverride && (err.details as { overridable?: boolean } | undefined)?.overridable);
      setAttempts((a) => [{ key: newClientEventId(), label, ok: false, message: err.message, overridable }, ...a].slice(0, 12));
    } finally {
      setBusy(false);
    }
  }

  async function dispatch(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = e.currentTarget;
    const val = (n: string) => (f.elements.namedItem(n) as HTMLInputElement).value;
    setBusy(true);
    setError(null);
    try {
      await api.post(`/api/loads/${encodeURIComponent(props.reference)}/dispatch`, {
        carrier: val('carrier'),
        vehicleRegistration: val('vehicle'),
        driverName: val('driver') || undefined,
        trailerSeals: val('seals')
          .split(/[\s,;]+/)
          .filter(Boolean),
        trailerId: val('trailer') ? Number(val('trailer')) : null,
      });
      setStatus('dispatched');
      window.location.assign(`/loads/${encodeURIComponent(props.reference)}/note`);
    } catch (err) {
      setError((err as ApiError).message);
    } finally {
      setBusy(false);
    }
  }

  if (status !== 'loading') {
    return (
      <p className="notice-info">
        This load has left. <a href={`/loads/${encodeURIComponent(props.reference)}/note`}>Open the dispatch note</a>.
      </p>
    );
  }

  return (
    <div className="space-y-4">
      <div className="card p-4">
        <div className="flex items-baseline justify-between">
          <span className="text-lg font-semibold">On the load</span>
          <span className="num text-3xl font-bold" data-testid="load-count">
            {bins.length}
            <span className="text-lg text-ink-soft">/{props.target}</span>
          </span>
        </div>
        <div
          className="mt-2 h-3 rounded-full bg-paper-deep"
          role="progressbar"
          aria-label="Bins on the load against the target"
          aria-valuemin={0}
          aria-valuemax={props.target}
          aria-valuenow={bins.length}
        >
          <div className="h-3 rounded-full bg-kelp" style={{ width: `${Math.min(100, (bins.length / props.target) * 100)}%` }} />
        </div>
        {full && <p className="mt-2 font-medium text-moss">Target reached. Enter the carrier’s details below.</p>}
      </div>

      {!full && (
        <ContinuousScan
          prefixLength={props.prefixLength}
          onIdentified={add}
          busy={busy}
          label="Scan or type each bin as it goes on"
          cautions={props.cautions}
          defer={props.defer}
        />
      )}

      {attempts.length > 0 && (
        <ul className="space-y-1" aria-live="polite" data-testid="load-attempts">
          {attempts.map((a) => (
            <li key={a.key} className={a.ok ? 'notice-good' : 'notice-fault'} data-ok={a.ok}>
              <span className="ident">{a.label}</span>: {a.message}
              {a.overridable && <OverrideForm label={a.label} busy={busy} onSend={(reason) => void add({ grai: a.label, serial: null }, reason)} />}
            </li>
          ))}
        </ul>
      )}

      <form onSubmit={dispatch} className="card space-y-3 p-4">
        <h2>Send the truck</h2>
        {error && (
          <p className="notice-fault" role="alert">
            {error}
          </p>
        )}
        <div className="grid gap-3 sm:grid-cols-2">
          <div>
            <label className="label" htmlFor="carrier">
              Carrier
            </label>
            <input id="carrier" name="carrier" className="field" required maxLength={120} />
          </div>
          <div>
            <label className="label" htmlFor="vehicle">
              Vehicle registration
            </label>
            <input id="vehicle" name="vehicle" className="field ident uppercase" required maxLength={20} />
          </div>
          <div>
            <label className="label" htmlFor="driver">
              Driver
            </label>
            <input id="driver" name="driver" className="field" maxLength={120} />
          </div>
          <div>
            <label className="label" htmlFor="trailer">
              Trailer
            </label>
            <select id="trailer" name="trailer" className="field" defaultValue="">
              <option value="">Not recorded</option>
              {props.trailers.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label className="label" htmlFor="seals">
              Trailer seal numbers
            </label>
            <input id="seals" name="seals" className="field ident" maxLength={200} />
          </div>
        </div>
        <button className="btn-primary w-full" type="submit" disabled={busy || bins.length === 0}>
          Dispatch {bins.length} bin{bins.length === 1 ? '' : 's'} and print the note
        </button>
      </form>

      {bins.length > 0 && (
        <details className="card p-4">
          <summary className="cursor-pointer font-medium">Bins on this load</summary>
          <ul className="mt-2 space-y-1">
            {bins.map((b) => (
              <li key={b.grai}>
                <a className="ident" href={`/bins/${b.grai}`}>
                  {b.grai}
                </a>
              </li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}

/** A planner's override of the lapse margin for one refused bin: the reason is required and kept with the dispatch. */
function OverrideForm({ label, busy, onSend }: { label: string; busy: boolean; onSend: (reason: string) => void }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const id = `override-${label.replace(/[^A-Za-z0-9]/g, '')}`;
  if (!open) {
    return (
      <button type="button" className="btn-quiet mt-2 block" onClick={() => setOpen(true)} data-override-open={label}>
        Override the margin…
      </button>
    );
  }
  return (
    <form
      className="mt-2 space-y-2"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        if (reason.trim().length < 5) return setProblem('Say why the bin may go anyway (at least a few words).');
        setProblem(null);
        onSend(reason.trim());
      }}
    >
      <label className="label" htmlFor={id}>
        Why it may go anyway (recorded with the dispatch, flagged for review)
      </label>
      <textarea id={id} className="field w-full" rows={2} maxLength={500} value={reason} onChange={(e) => setReason(e.target.value)} aria-describedby={`${id}-problem`} />
      {problem && (
        <p id={`${id}-problem`} className="text-sm font-medium text-brick">
          {problem}
        </p>
      )}
      <button type="submit" className="btn-primary" disabled={busy} data-override-send={label}>
        Send it anyway
      </button>
    </form>
  );
}
