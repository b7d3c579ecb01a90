// A run's editor: its day, carrier, trailer and bin type; while planned, its stops (order, bins expected, add and
// remove, or the driving order worked out by the server); and the commands the run's status table allows now.
import { useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';
import { Icon } from '@/components/ui/Icon';
import type { RunCommand } from '@/lib/planning/run-status';

interface Choice {
  id: number;
  name: string;
}
interface Stop {
  siteId: number;
  name: string;
  expectedBins: number;
}
interface Props {
  runId: number;
  version: number;
  plannedOn: string;
  carrier: string | null;
  trailerId: number | null;
  binTypeId: number | null;
  stops: Stop[];
  editable: { stops: boolean; carrier: boolean };
  commands: Array<{ command: RunCommand; label: string }>;
  trailers: Choice[];
  binTypes: Choice[];
  openSites: Array<Choice & { bins: number }>;
}

const ASK: Record<RunCommand, string | null> = {
  confirm: null,
  cancel: 'Cancel this run? Its requests become open again for another run.',
  close: 'Close this run? The bins not received stay expected nowhere; its requests count as collected.',
};

export default function RunEditor(props: Props) {
  const [stops, setStops] = useState<Stop[]>(props.stops);
  const [adding, setAdding] = useState('');
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const addable = props.openSites.filter((s) => !stops.some((x) => x.siteId === s.id));

  function move(i: number, by: -1 | 1) {
    setStops((list) => {
      const next = [...list];
      const [s] = next.splice(i, 1);
      next.splice(i + by, 0, s!);
      return next;
    });
  }

  async function send(body: Record<string, unknown>) {
    setBusy(true);
    setProblem(null);
    try {
      await api.patch(`/api/planning/runs/${props.runId}`, { version: props.version, ...body });
      window.location.reload();
    } catch (err) {
      setBusy(false);
      setProblem(err instanceof ApiError ? err.message : 'The change could not be saved. Try again.');
    }
  }

  function save(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const body: Record<string, unknown> = {};
    if (props.editable.carrier) {
      const carrier = String(f.get('carrier') ?? '').trim();
      body.carrier = carrier === '' ? null : carrier;
      const trailer = String(f.get('trailerId') ?? '');
      body.trailerId = trailer === '' ? null : Number(trailer);
    }
    if (props.editable.stops) {
      body.plannedOn = String(f.get('plannedOn') ?? '');
      const type = String(f.get('binTypeId') ?? '');
      body.binTypeId = type === '' ? null : Number(type);
      body.stops = stops.map((s) => ({ siteId: s.siteId, expectedBins: s.expectedBins }));
    }
    void send(body);
  }

  async function command(c: RunCommand) {
    const ask = ASK[c];
    if (ask && !window.confirm(ask)) return;
    setBusy(true);
    setProblem(null);
    try {
      await api.post(`/api/planning/runs/${props.runId}/status`, { command: c, version: props.version });
      window.location.reload();
    } catch (err) {
      setBusy(false);
      setProblem(err instanceof ApiError ? err.message : 'The change could not be saved. Try again.');
    }
  }

  return (
    <div className="space-y-4" data-testid="run-editor">
      {(props.editable.carrier || props.editable.stops) && (
        <form className="card space-y-3 p-4" onSubmit={save}>
          <h2>Change the run</h2>
          <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
            {props.editable.stops && (
              <div>
                <label className="label" htmlFor="run-day">
                  Day
                </label>
                <input className="field" type="date" id="run-day" name="plannedOn" defaultValue={props.plannedOn} required />
              </div>
            )}
            {props.editable.carrier && (
              <>
                <div>
                  <label className="label" htmlFor="run-carrier">
                    Carrier
                  </label>
                  <input className="field" id="run-carrier" name="carrier" defaultValue={props.carrier ?? ''} maxLength={120} />
                </div>
                <div>
                  <label className="label" htmlFor="run-trailer">
                    Trailer
                  </label>
                  <select className="field" id="run-trailer" name="trailerId" defaultValue={props.trailerId ?? ''}>
                    <option value="">Standard semi-trailer</option>
                    {props.trailers.map((t) => (
                      <option key={t.id} value={t.id}>
                        {t.name}
                      </option>
                    ))}
                  </select>
                </div>
              </>
            )}
            {props.editable.stops && (
              <div>
                <label className="label" htmlFor="run-type">
                  Bin type (for the capacity)
                </label>
                <select className="field" id="run-type" name="binTypeId" defaultValue={props.binTypeId ?? ''}>
                  <option value="">First bin type</option>
                  {props.binTypes.map((t) => (
                    <option key={t.id} value={t.id}>
                      {t.name}
                    </option>
                  ))}
                </select>
              </div>
            )}
          </div>

          {props.editable.stops && (
            <fieldset>
              <legend className="label">Stops, in the order driven</legend>
              <ol className="mt-1 space-y-2" data-testid="edit-stops">
                {stops.map((s, i) => (
                  <li key={s.siteId} className="flex flex-wrap items-center gap-2" data-stop-site={s.siteId}>
                    <span className="num w-6 text-right">{i + 1}.</span>
                    <span className="min-w-[10rem] flex-1">{s.name}</span>
                    <label className="sr-only" htmlFor={`bins-${s.siteId}`}>
                      Bins expected at {s.name}
                    </label>
                    <input
                      className="field num w-24"
                      type="number"
                      min={1}
                      max={500}
                      id={`bins-${s.siteId}`}
                      value={s.expectedBins}
                      onChange={(e) => {
                        const v = Number(e.target.value);
                        setStops((list) => list.map((x) => (x.siteId === s.siteId ? { ...x, expectedBins: v } : x)));
                      }}
                    />
                    <span className="text-sm">bins</span>
                    <button type="button" className="btn-quiet" disabled={i === 0} onClick={() => move(i, -1)} aria-label={`Move ${s.name} earlier`}>
                      ↑
                    </button>
                    <button type="button" className="btn-quiet" disabled={i === stops.length - 1} onClick={() => move(i, 1)} aria-label={`Move ${s.name} later`}>
                      ↓
                    </button>
                    <button type="button" className="btn-quiet" disabled={stops.length === 1} onClick={() => setStops((l) => l.filter((x) => x.siteId !== s.siteId))}>
                      Remove
                    </button>
                  </li>
                ))}
              </ol>
              {addable.length > 0 && (
                <div className="mt-3 flex flex-wrap items-end gap-2">
                  <div>
                    <label className="label" htmlFor="add-stop">
                      Add a site with open requests
                    </label>
                    <select className="field" id="add-stop" value={adding} onChange={(e) => setAdding(e.target.value)}>
                      <option value="">Choose a site</option>
                      {addable.map((s) => (
                        <option key={s.id} value={s.id}>
                          {s.name} ({s.bins} bins)
                        </option>
                      ))}
                    </select>
                  </div>
                  <button
                    type="button"
                    className="btn-quiet"
                    disabled={adding === ''}
                    onClick={() => {
                      const site = addable.find((s) => String(s.id) === adding);
                      if (site) setStops((l) => [...l, { siteId: site.id, name: site.name, expectedBins: Math.max(1, site.bins) }]);
                      setAdding('');
                    }}
                  >
                    Add stop
                  </button>
                </div>
              )}
            </fieldset>
          )}
          <div className="flex flex-wrap gap-2">
            <button type="submit" className="btn-primary" disabled={busy} data-testid="save-run">
              Save changes
            </button>
            {props.editable.stops && (
              <button type="button" className="btn-quiet" disabled={busy} onClick={() => void send({ reorder: true })} data-testid="reorder-run">
                Put the saved stops in driving order
              </button>
            )}
          </div>
        </form>
      )}

      {props.commands.length > 0 && (
        <div className="flex flex-wrap items-center gap-3" data-testid="run-commands">
          {props.commands.map((c) => (
            <button
              key={c.command}
              type="button"
              disabled={busy}
              className={c.command === 'confirm' ? 'btn-primary' : 'btn-quiet'}
              onClick={() => void command(c.command)}
              data-command={c.command}
            >
              {c.label}
            </button>
          ))}
        </div>
      )}
      {problem && (
        <p className="notice-fault flex items-start gap-2" role="alert">
          <Icon name="alert" size={18} className="mt-0.5 shrink-0" /> {problem}
        </p>
      )}
    </div>
  );
}
