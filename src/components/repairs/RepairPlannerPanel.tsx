// The planner's part of a repair order: the estimate, where it is repaired, and — when the repair would cost more
// than the operator's threshold — retiring the bin instead (the retire scan; the order ends as retired).
import { useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';
import { FieldProblem } from '@/components/ui/Dialog';

export interface RepairPlannerPanelProps {
  orderId: number;
  version: number;
  estimated: string;
  place: 'in_house' | 'shop';
  repairSiteId: number | null;
  shops: Array<{ id: number; name: string }>;
  currency: string;
  proposed: boolean;
}

export default function RepairPlannerPanel(p: RepairPlannerPanelProps) {
  const [estimated, setEstimated] = useState(p.estimated);
  const [place, setPlace] = useState(p.place);
  const [siteId, setSiteId] = useState(p.repairSiteId ? String(p.repairSiteId) : p.shops[0] ? String(p.shops[0].id) : '');
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<{ message: string; fields: Record<string, string> } | null>(null);
  const fail = (err: unknown) => {
    setProblem(err instanceof ApiError ? { message: err.message, fields: err.fieldMessages() } : { message: 'Something went wrong. Try again.', fields: {} });
    setBusy(false);
  };

  async function save(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setProblem(null);
    try {
      await api.patch(`/api/repairs/${p.orderId}`, {
        version: p.version,
        estimatedCost: estimated.trim() || null,
        place,
        repairSiteId: place === 'shop' && siteId ? Number(siteId) : null,
      });
      window.location.reload();
    } catch (err) {
      fail(err);
    }
  }
  async function retire(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setProblem(null);
    try {
      await api.post(`/api/repairs/${p.orderId}/retire`, { version: p.version, note });
      window.location.reload();
    } catch (err) {
      fail(err);
    }
  }

  return (
    <div className="space-y-4">
      <form onSubmit={(e) => void save(e)} className="card p-4 space-y-3" noValidate aria-labelledby="plan-heading">
        <h2 id="plan-heading">Estimate and place</h2>
        <div className="flex flex-wrap gap-4">
          <div>
            <label className="label" htmlFor="r-estimate">
              Estimated cost ({p.currency})
            </label>
            <input
              id="r-estimate"
              className="field num w-36"
              inputMode="decimal"
              value={estimated}
              onChange={(e) => setEstimated(e.target.value)}
              aria-invalid={Boolean(problem?.fields.estimatedCost)}
              aria-describedby="r-estimate-problem"
            />
            <FieldProblem id="r-estimate-problem" message={problem?.fields.estimatedCost} />
          </div>
          <fieldset>
            <legend className="label">Where</legend>
            <div className="flex flex-wrap gap-3">
              <label className="inline-flex items-center gap-2">
                <input type="radio" name="place" value="in_house" checked={place === 'in_house'} onChange={() => setPlace('in_house')} /> In-house
              </label>
              <label className="inline-flex items-center gap-2">
                <input type="radio" name="place" value="shop" checked={place === 'shop'} onChange={() => setPlace('shop')} disabled={p.shops.length === 0} /> At the repair shop
              </label>
            </div>
          </fieldset>
          {place === 'shop' && (
            <div>
              <label className="label" htmlFor="r-shop">
                Repair shop
              </label>
              <select id="r-shop" className="field" value={siteId} onChange={(e) => setSiteId(e.target.value)} aria-describedby="r-shop-problem">
                {p.shops.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </select>
              <FieldProblem id="r-shop-problem" message={problem?.fields.repairSiteId} />
            </div>
          )}
        </div>
        <button type="submit" className="btn-quiet" disabled={busy}>
          Save
        </button>
      </form>
      <form onSubmit={(e) => void retire(e)} className="card p-4 space-y-3" noValidate aria-labelledby="retire-heading">
        <h2 id="retire-heading">Retire the bin instead</h2>
        <p className="text-sm">
          {p.proposed
            ? 'The repair would cost more than the threshold in the settings: the bin is proposed for retirement.'
            : 'The repair is within the threshold; retire only when the bin is beyond repair for another reason.'}
        </p>
        <div>
          <label className="label" htmlFor="r-note">
            Why it is retired
          </label>
          <textarea
            id="r-note"
            className="field w-full"
            rows={2}
            value={note}
            onChange={(e) => setNote(e.target.value)}
            aria-invalid={Boolean(problem?.fields.note)}
            aria-describedby="r-note-problem"
          />
          <FieldProblem id="r-note-problem" message={problem?.fields.note} />
        </div>
        <button type="submit" className={p.proposed ? 'btn-primary' : 'btn-quiet'} disabled={busy} data-retire>
          Retire the bin
        </button>
      </form>
      {problem && (
        <p className="notice-fault" role="alert">
          {problem.message}
        </p>
      )}
    </div>
  );
}
