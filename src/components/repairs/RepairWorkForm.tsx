// Work done on a repair order, on a phone at the bench or from a desk: what was done, parts used, labour hours,
// the cost, photos. Each entry is kept as recorded; the order's cost is their sum.
import { useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';
import { FieldProblem } from '@/components/ui/Dialog';
import { Cautions, uploadPhotos } from '@/components/bin/ActionForm';
import { repairWorkProblems } from '@/lib/inspections/repairs';

export interface RepairWorkFormProps {
  orderId: number;
  today: string;
  openedOn: string;
  currency: string;
  digits: number;
  cautions: string[];
  defer: string;
}

export default function RepairWorkForm(p: RepairWorkFormProps) {
  const [performedOn, setPerformedOn] = useState(p.today);
  const [description, setDescription] = useState('');
  const [parts, setParts] = useState('');
  const [hours, setHours] = useState('');
  const [cost, setCost] = useState('');
  const [photos, setPhotos] = useState<File[]>([]);
  const [note, setNote] = useState<string | null>(null);
  const [shown, setShown] = useState(false);
  const [busy, setBusy] = useState(false);
  const [server, setServer] = useState<{ message: string; fields: Record<string, string> } | null>(null);
  const entry = { performedOn, description, parts: parts.trim() || null, labourHours: hours.trim() === '' ? Number.NaN : Number(hours), cost };
  const problems = repairWorkProblems(entry, p.today, p.openedOn, p.digits);
  const problemOf = (f: string) => (shown ? problems.find((x) => x.field === f)?.message : undefined) ?? server?.fields[f];
  const aria = (f: string) => ({ 'aria-invalid': Boolean(problemOf(f)), 'aria-describedby': `w-${f}-problem` });

  async function submit(e: FormEvent) {
    e.preventDefault();
    setShown(true);
    setServer(null);
    if (problems.length) return;
    setBusy(true);
    try {
      const photoIds = await uploadPhotos(photos, setNote);
      await api.post(`/api/repairs/${p.orderId}/work`, { ...entry, description: description.trim(), photoIds });
      window.location.reload();
    } catch (err) {
      setServer(err instanceof ApiError ? { message: err.message, fields: err.fieldMessages() } : { message: 'Something went wrong. Try again.', fields: {} });
      setBusy(false);
    }
  }

  return (
    <form onSubmit={(e) => void submit(e)} className="space-y-4" noValidate aria-labelledby="work-heading" data-testid="repair-work-form">
      <h2 id="work-heading">Record work</h2>
      <Cautions lines={p.cautions} defer={p.defer} />
      <div>
        <label className="label" htmlFor="w-performedOn">
          Day of the work
        </label>
        <input id="w-performedOn" type="date" className="field" value={performedOn} max={p.today} onChange={(e) => setPerformedOn(e.target.value)} {...aria('performedOn')} />
        <FieldProblem id="w-performedOn-problem" message={problemOf('performedOn')} />
      </div>
      <div>
        <label className="label" htmlFor="w-description">
          What was done
        </label>
        <textarea id="w-description" className="field w-full" rows={3} value={description} onChange={(e) => setDescription(e.target.value)} {...aria('description')} />
        <FieldProblem id="w-description-problem" message={problemOf('description')} />
      </div>
      <div>
        <label className="label" htmlFor="w-parts">
          Parts used <span className="font-normal text-ink-soft">(one a line, optional)</span>
        </label>
        <textarea id="w-parts" className="field w-full" rows={2} value={parts} onChange={(e) => setParts(e.target.value)} {...aria('parts')} />
        <FieldProblem id="w-parts-problem" message={problemOf('parts')} />
      </div>
      <div className="flex flex-wrap gap-4">
        <div>
          <label className="label" htmlFor="w-labourHours">
            Labour (hours)
          </label>
          <input id="w-labourHours" className="field num w-32" inputMode="decimal" value={hours} onChange={(e) => setHours(e.target.value)} {...aria('labourHours')} />
          <FieldProblem id="w-labourHours-problem" message={problemOf('labourHours')} />
        </div>
        <div>
          <label className="label" htmlFor="w-cost">
            Cost ({p.currency}, parts and labour)
          </label>
          <input id="w-cost" className="field num w-36" inputMode="decimal" value={cost} onChange={(e) => setCost(e.target.value)} {...aria('cost')} />
          <FieldProblem id="w-cost-problem" message={problemOf('cost')} />
        </div>
      </div>
      <div>
        <label className="label" htmlFor="w-photos">
          Photos <span className="font-normal text-ink-soft">(optional)</span>
        </label>
        <input id="w-photos" type="file" accept="image/*" capture="environment" multiple onChange={(e) => setPhotos([...(e.target.files ?? [])])} />
        {note && <p className="text-sm text-ink-soft">{note}</p>}
      </div>
      {server && (
        <p className="notice-fault" role="alert">
          {server.message}
        </p>
      )}
      <button type="submit" className="btn-primary" disabled={busy}>
        {busy ? 'Recording…' : 'Record the work'}
      </button>
    </form>
  );
}
