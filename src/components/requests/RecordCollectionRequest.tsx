// The planner's form for a collection request taken on the phone or by mail: which customer site, how many bins,
// the day they are ready and who to ask for. Saved requests join the list below and the run suggestions.
import { useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';

interface Props {
  sites: Array<{ id: number; name: string; customer: string }>;
  /** The operator's local day, offered as the ready day. */
  today: string;
}

export default function RecordCollectionRequest({ sites, today }: Props) {
  const [busy, setBusy] = useState(false);
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [summary, setSummary] = useState<string | null>(null);

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const str = (k: string) => String(f.get(k) ?? '');
    const whole = (k: string) => (/^\d+$/.test(str(k).trim()) ? Number(str(k).trim()) : str(k).trim() === '' ? undefined : Number.NaN);
    setBusy(true);
    setProblems({});
    setSummary(null);
    try {
      await api.post('/api/requests/collection', {
        siteId: whole('siteId'),
        quantity: whole('quantity'),
        readyOn: str('readyOn'),
        contactName: str('contactName'),
        contactPhone: str('contactPhone'),
        note: str('note'),
      });
      window.location.assign('/requests#collections');
    } catch (err) {
      if (err instanceof ApiError) {
        setProblems(err.fieldMessages());
        setSummary(err.message);
      } else setSummary('The request could not be saved. Try again.');
    } finally {
      setBusy(false);
    }
  }

  const problem = (k: string) =>
    problems[k] ? (
      <p id={`pcr-${k}-problem`} className="mt-1 text-sm text-brick">
        {problems[k]}
      </p>
    ) : null;
  const described = (k: string) => (problems[k] ? `pcr-${k}-problem` : undefined);

  return (
    <details className="card mt-3 p-4" data-testid="record-collection">
      <summary className="cursor-pointer font-medium">Record a collection request (phone or mail)</summary>
      <form onSubmit={submit} className="mt-3 grid gap-3 sm:grid-cols-2 xl:grid-cols-3" noValidate>
        {summary && (
          <p className="notice-fault sm:col-span-2 xl:col-span-3" role="alert">
            {summary}
          </p>
        )}
        <div className="sm:col-span-2 xl:col-span-1">
          <label className="label" htmlFor="pcr-site">
            Customer site
          </label>
          <select id="pcr-site" name="siteId" className="field" defaultValue="" aria-describedby={described('siteId')}>
            <option value="">Choose…</option>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.customer} · {s.name}
              </option>
            ))}
          </select>
          {problem('siteId')}
        </div>
        <div>
          <label className="label" htmlFor="pcr-quantity">
            Bins ready
          </label>
          <input id="pcr-quantity" name="quantity" className="field num" inputMode="numeric" aria-describedby={described('quantity')} />
          {problem('quantity')}
        </div>
        <div>
          <label className="label" htmlFor="pcr-ready">
            Ready on
          </label>
          <input id="pcr-ready" name="readyOn" type="date" className="field" defaultValue={today} aria-describedby={described('readyOn')} />
          {problem('readyOn')}
        </div>
        <div>
          <label className="label" htmlFor="pcr-contact">
            Ask for
          </label>
          <input id="pcr-contact" name="contactName" className="field" maxLength={120} aria-describedby={described('contactName')} />
          {problem('contactName')}
        </div>
        <div>
          <label className="label" htmlFor="pcr-phone">
            Phone (optional)
          </label>
          <input id="pcr-phone" name="contactPhone" type="tel" className="field" maxLength={40} aria-describedby={described('contactPhone')} />
          {problem('contactPhone')}
        </div>
        <div className="sm:col-span-2 xl:col-span-3">
          <label className="label" htmlFor="pcr-note">
            Note (optional)
          </label>
          <textarea id="pcr-note" name="note" className="field" rows={2} maxLength={1000} aria-describedby={described('note')} />
          {problem('note')}
        </div>
        <div className="sm:col-span-2 xl:col-span-3">
          <button className="btn-primary" type="submit" disabled={busy}>
            Save the request
          </button>
        </div>
      </form>
    </details>
  );
}
