// One bin of a count's dispute, settled by the planner: found (it is there after all), moved (say where), or lost
// (marked missing through the scan service). Saved with the version the page showed; once settled it stands.
import { useState, type FormEvent } from 'react';
import { Icon } from '@/components/ui/Icon';
import { api, ApiError } from '@/lib/api.client';
import { COUNT_LOOK } from '@/lib/portal/count-look';
import { TONE_CLASSES } from '@/lib/status-look';
import type { Resolution } from '@/lib/portal/count-confirmation';

interface Props {
  countId: number;
  lineId: number;
  grai: string;
  kind: 'missing' | 'unexpected';
  version: number;
  resolution: Resolution | null;
  movedTo: string | null;
  sites: Array<{ id: number; name: string; kind: string }>;
}

const CHOICES: Record<Props['kind'], Array<{ value: Resolution; label: string }>> = {
  missing: [
    { value: 'found', label: 'Found: it is at the site' },
    { value: 'moved', label: 'Moved: it is elsewhere' },
    { value: 'lost', label: 'Lost: mark it missing' },
  ],
  unexpected: [
    { value: 'found', label: 'Found: it is at the site' },
    { value: 'moved', label: 'Moved: it belongs elsewhere' },
  ],
};

export default function DisputeLineControl(props: Props) {
  const [resolution, setResolution] = useState<Resolution | null>(props.resolution);
  const [movedTo, setMovedTo] = useState(props.movedTo);
  const [choice, setChoice] = useState<Resolution>('found');
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const base = `line-${props.lineId}`;

  async function save(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = e.currentTarget;
    const site = (f.elements.namedItem('movedToSiteId') as HTMLSelectElement | null)?.value;
    const note = (f.elements.namedItem('note') as HTMLInputElement).value;
    setBusy(true);
    setProblem(null);
    try {
      const out = await api.patch<{ line: { resolution: Resolution; movedTo: string | null }; countStatus: string }>(
        `/api/planning/counts/${props.countId}/lines/${props.lineId}`,
        {
          resolution: choice,
          movedToSiteId: choice === 'moved' && site ? Number(site) : null,
          note: note || null,
          version: props.version,
        },
      );
      setResolution(out.line.resolution);
      setMovedTo(out.line.movedTo);
      if (out.countStatus === 'resolved') document.querySelector('[data-count-status]')?.setAttribute('data-count-status', 'resolved');
    } catch (err) {
      setProblem(err instanceof ApiError ? err.message : 'The resolution could not be saved. Try again.');
    } finally {
      setBusy(false);
    }
  }

  if (resolution) {
    const look = COUNT_LOOK[resolution];
    return (
      <span className={`inline-flex items-center gap-1.5 rounded-full border px-2 py-0.5 text-sm font-medium ${TONE_CLASSES[look.tone]}`} data-resolution={resolution}>
        <Icon name={look.icon} size={16} />
        {look.label}
        {resolution === 'moved' && movedTo ? ` to ${movedTo}` : ''}
      </span>
    );
  }
  return (
    <form onSubmit={save} className="flex flex-wrap items-end gap-2" data-resolve={props.grai}>
      <fieldset className="flex flex-col gap-1">
        <legend className="sr-only">How is bin {props.grai} settled?</legend>
        {CHOICES[props.kind].map((c) => (
          <label key={c.value} className="flex min-h-[32px] items-center gap-2 text-sm">
            <input type="radio" name={`${base}-resolution`} value={c.value} checked={choice === c.value} onChange={() => setChoice(c.value)} />
            {c.label}
          </label>
        ))}
      </fieldset>
      {choice === 'moved' && (
        <label className="flex flex-col text-sm">
          <span>Moved to</span>
          <select name="movedToSiteId" className="field min-h-touch w-auto" required>
            {props.sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name} ({s.kind})
              </option>
            ))}
          </select>
        </label>
      )}
      <label className="flex flex-col text-sm">
        <span>Note (optional)</span>
        <input name="note" className="field min-h-touch w-48" maxLength={1000} />
      </label>
      <button type="submit" className="btn-primary min-h-touch px-3 text-sm" disabled={busy}>
        <Icon name="check" size={16} /> Settle
      </button>
      {problem && (
        <p className="notice-fault w-full" role="alert">
          {problem}
        </p>
      )}
    </form>
  );
}
