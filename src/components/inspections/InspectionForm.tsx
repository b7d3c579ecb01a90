// The test-bench form on a phone: kind, checklist per kind, leakproofness test (refused below the minimum
// of ADR/RID 6.5.6.7.3), outcome, inspector (a qualified person or an outside body), photos, remarks.
// The same pure rules as the server (inspection-form.ts) say at once what is missing; the server decides.
import { useMemo, useState, type FormEvent } from 'react';
import { api, type ApiError } from '@/lib/api.client';
import { newClientEventId } from '@/lib/yard/ids.client';
import { CHECKLIST, KIND_LABELS, OUTCOME_LABELS, inspectionProblems, leakTestRequired, type InspectionDraft, type PeriodicKind } from '@/lib/inspections/inspection-form';
import { LEAK_TEST_MIN_KPA, LEAK_TEST_MIN_MINUTES, type TestOutcome } from '@/lib/inspections/inspection-due';
import { STATUS_LABELS, type Status } from '@/lib/scans/lifecycle';
import { formatLongDate } from '@/lib/calendar';
import { Cautions, uploadPhotos } from '@/components/bin/ActionForm';

export interface InspectionFormProps {
  assetId: number;
  grai: string;
  version: number;
  siteId: number | null;
  today: string;
  manufactureMonth: string;
  suggestedKind: PeriodicKind;
  inspectors: Array<{ id: number; name: string }>;
  meId: number;
  /** The bin's next due date now, shown until a new one replaces it. */
  nextDue: string | null;
  cautions: string[];
  defer: string;
}

interface Recorded {
  inspectionId: number;
  scan: { statusTo: Status };
  nextIntermediateDue: string | null;
  nextFullDue: string | null;
  nextDue: string | null;
  restarted: { intermediate: boolean; full: boolean };
  testMark: string | null;
  repairOrderId?: number | null;
  repairClosed?: boolean;
}

const OUTCOMES: TestOutcome[] = ['pass', 'repair', 'fail'];

export default function InspectionForm(p: InspectionFormProps) {
  const [kind, setKind] = useState<PeriodicKind>(p.suggestedKind);
  const [performedOn, setPerformedOn] = useState(p.today);
  const [checks, setChecks] = useState<Record<string, boolean>>({});
  const [leakDone, setLeakDone] = useState(true);
  const [pressure, setPressure] = useState('');
  const [minutes, setMinutes] = useState('');
  const [leakPassed, setLeakPassed] = useState<boolean | null>(null);
  const [outcome, setOutcome] = useState<TestOutcome | null>(null);
  const meQualified = p.inspectors.some((i) => i.id === p.meId);
  const [inspector, setInspector] = useState<string>(meQualified ? String(p.meId) : p.inspectors[0] ? String(p.inspectors[0].id) : 'body');
  const [body, setBody] = useState('');
  const [remarks, setRemarks] = useState('');
  const [photos, setPhotos] = useState<File[]>([]);
  const [note, setNote] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [shown, setShown] = useState(false);
  const [serverError, setServerError] = useState<string | null>(null);
  const [done, setDone] = useState<Recorded | null>(null);

  const withLeak = leakTestRequired(kind) || leakDone;
  const draft: InspectionDraft = useMemo(
    () => ({
      kind,
      performedOn,
      checklist: Object.fromEntries(CHECKLIST[kind].filter((i) => i.key in checks).map((i) => [i.key, checks[i.key]!])),
      leakTest: withLeak
        ? { pressureKpa: pressure.trim() === '' ? Number.NaN : Number(pressure), minutes: minutes.trim() === '' ? Number.NaN : Number(minutes), passed: leakPassed as boolean }
        : null,
      outcome: (outcome ?? '') as TestOutcome,
      inspectorId: inspector === 'body' ? null : Number(inspector),
      inspectionBody: inspector === 'body' ? body : null,
      remarks: remarks.trim() || null,
    }),
    [kind, performedOn, checks, withLeak, pressure, minutes, leakPassed, outcome, inspector, body, remarks],
  );
  const problems = inspectionProblems(draft, p.today, p.manufactureMonth);
  const problemOf = (...fields: string[]) => (shown ? problems.find((x) => fields.includes(x.field))?.message : undefined);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setShown(true);
    setServerError(null);
    if (problems.length) return;
    setBusy(true);
    try {
      const photoIds = await uploadPhotos(photos, setNote);
      const out = await api.post<Recorded>('/api/inspections', {
        clientEventId: newClientEventId(),
        assetId: p.assetId,
        siteId: p.siteId,
        expectedVersion: p.version,
        ...draft,
        inspectionBody: draft.inspectionBody?.trim() || null,
        photoIds,
      });
      setDone(out);
      window.scrollTo({ top: 0 });
    } catch (err) {
      setServerError((err as ApiError).message);
    } finally {
      setBusy(false);
    }
  }

  const back = (
    <a className="btn-quiet" href={`/bins/${p.grai}`}>
      Back to the bin
    </a>
  );
  if (done) {
    return (
      <div className="space-y-4" data-recorded={done.inspectionId}>
        <div className="notice-good" role="status">
          <p className="font-semibold">Inspection recorded. The bin is now {STATUS_LABELS[done.scan.statusTo].toLowerCase()}.</p>
          {done.nextDue && (
            <p className="mt-1">
              Next test due <strong data-testid="next-due">{formatLongDate(done.nextDue)}</strong>
              {done.nextIntermediateDue && <> · 2.5-year {formatLongDate(done.nextIntermediateDue)}</>}
              {done.nextFullDue && <> · 5-year {formatLongDate(done.nextFullDue)}</>}
            </p>
          )}
          {!done.restarted.intermediate && !done.restarted.full && <p className="mt-1">No due date moved.</p>}
          {done.repairOrderId && (
            <p className="mt-1" data-testid="repair-link">
              {done.repairClosed ? 'Repair order ' : 'The repair is tracked on repair order '}
              <a href={`/repairs/${done.repairOrderId}`}>#{done.repairOrderId}</a>
              {done.repairClosed ? ' is closed by this test.' : '.'}
            </p>
          )}
        </div>
        {done.testMark && (
          <div className="card p-4">
            <p className="label">Apply this test mark to the bin</p>
            <p className="ident text-2xl" data-testid="test-mark">
              {done.testMark}
            </p>
            <p className="text-sm text-ink-soft">Month and year of the test, and the inspector’s mark.</p>
          </div>
        )}
        <div className="flex flex-wrap gap-2">
          <a className="btn-primary" href={`/inspections/${done.inspectionId}`}>
            Printable record
          </a>
          {back}
        </div>
      </div>
    );
  }

  return (
    <form onSubmit={(e) => void submit(e)} className="space-y-5" noValidate>
      <p className="text-sm">
        Next test due {p.nextDue ? <strong>{formatLongDate(p.nextDue)}</strong> : 'not set'}
        {p.nextDue && p.nextDue < p.today && ' (lapsed)'}
      </p>
      <Cautions lines={p.cautions} defer={p.defer} />

      <fieldset className="space-y-2">
        <legend className="label">What is done</legend>
        {(['intermediate', 'full', 'after_repair'] as const).map((k) => (
          <label key={k} className="flex items-center gap-3 rounded-md border border-paper-line bg-card px-3 min-h-touch">
            <input
              type="radio"
              name="kind"
              value={k}
              checked={kind === k}
              onChange={() => {
                setKind(k);
                setChecks({});
              }}
            />
            <span>{KIND_LABELS[k]}</span>
          </label>
        ))}
      </fieldset>

      <div>
        <label className="label" htmlFor="performed-on">
          Day of the inspection
        </label>
        <input
          id="performed-on"
          type="date"
          className="field num"
          max={p.today}
          value={performedOn}
          onChange={(e) => setPerformedOn(e.target.value)}
          aria-describedby={problemOf('performedOn') ? 'performed-on-problem' : undefined}
        />
        {problemOf('performedOn') && (
          <p id="performed-on-problem" className="mt-1 text-sm font-medium text-brick">
            {problemOf('performedOn')}
          </p>
        )}
      </div>

      <fieldset className="space-y-2">
        <legend className="label">Checklist</legend>
        {CHECKLIST[kind].map((item) => (
          <div key={item.key} className="rounded-md border border-paper-line bg-card px-3 py-2">
            <span className="block">{item.label}</span>
            <div className="mt-2 flex gap-2" role="group" aria-label={item.label}>
              <button
                type="button"
                data-ok={item.key}
                className={checks[item.key] === true ? 'btn-primary min-h-touch px-4' : 'btn-quiet min-h-touch px-4'}
                aria-pressed={checks[item.key] === true}
                onClick={() => setChecks({ ...checks, [item.key]: true })}
              >
                OK
              </button>
              <button
                type="button"
                data-fault={item.key}
                className={checks[item.key] === false ? 'btn-danger min-h-touch px-4' : 'btn-quiet min-h-touch px-4'}
                aria-pressed={checks[item.key] === false}
                onClick={() => setChecks({ ...checks, [item.key]: false })}
              >
                Fault
              </button>
            </div>
          </div>
        ))}
        {problemOf('checklist') && <p className="text-sm font-medium text-brick">{problemOf('checklist')}</p>}
      </fieldset>

      <fieldset className="space-y-3 rounded-md border border-paper-line bg-card p-3">
        <legend className="label px-1">Leakproofness test</legend>
        {!leakTestRequired(kind) && (
          <label className="flex items-center gap-3 min-h-touch">
            <input type="checkbox" checked={leakDone} onChange={(e) => setLeakDone(e.target.checked)} />
            <span>Done with this inspection (without it only the 5-year date moves)</span>
          </label>
        )}
        {withLeak && (
          <>
            <p className="text-sm text-ink-soft">
              At least {LEAK_TEST_MIN_KPA} kPa gauge (0.2 bar) held for at least {LEAK_TEST_MIN_MINUTES} minutes; the form refuses less.
            </p>
            <div className="grid grid-cols-2 gap-3">
              <div>
                <label className="label" htmlFor="leak-kpa">
                  Pressure (kPa gauge)
                </label>
                <input
                  id="leak-kpa"
                  className="field num"
                  inputMode="decimal"
                  value={pressure}
                  onChange={(e) => setPressure(e.target.value)}
                  aria-invalid={!!problemOf('leakTestPressureKpa')}
                  aria-describedby={problemOf('leakTestPressureKpa') ? 'leak-kpa-problem' : undefined}
                />
              </div>
              <div>
                <label className="label" htmlFor="leak-min">
                  Held for (minutes)
                </label>
                <input
                  id="leak-min"
                  className="field num"
                  inputMode="decimal"
                  value={minutes}
                  onChange={(e) => setMinutes(e.target.value)}
                  aria-invalid={!!problemOf('leakTestMinutes')}
                  aria-describedby={problemOf('leakTestMinutes') ? 'leak-min-problem' : undefined}
                />
              </div>
            </div>
            {problemOf('leakTestPressureKpa') && (
              <p id="leak-kpa-problem" className="text-sm font-medium text-brick">
                {problemOf('leakTestPressureKpa')}
              </p>
            )}
            {problemOf('leakTestMinutes') && (
              <p id="leak-min-problem" className="text-sm font-medium text-brick">
                {problemOf('leakTestMinutes')}
              </p>
            )}
            <div className="flex gap-2" role="group" aria-label="Leakproofness test result">
              <button
                type="button"
                data-leak="pass"
                className={leakPassed === true ? 'btn-primary min-h-touch px-4' : 'btn-quiet min-h-touch px-4'}
                aria-pressed={leakPassed === true}
                onClick={() => setLeakPassed(true)}
              >
                No leak
              </button>
              <button
                type="button"
                data-leak="fail"
                className={leakPassed === false ? 'btn-danger min-h-touch px-4' : 'btn-quiet min-h-touch px-4'}
                aria-pressed={leakPassed === false}
                onClick={() => setLeakPassed(false)}
              >
                Leaks
              </button>
            </div>
          </>
        )}
        {problemOf('leakTest') && <p className="text-sm font-medium text-brick">{problemOf('leakTest')}</p>}
      </fieldset>

      <fieldset className="space-y-2">
        <legend className="label">Outcome</legend>
        <div className="flex flex-wrap gap-2">
          {OUTCOMES.map((o) => (
            <button
              key={o}
              type="button"
              data-outcome={o}
              className={outcome === o ? (o === 'pass' ? 'btn-primary min-h-touch px-4' : 'btn-danger min-h-touch px-4') : 'btn-quiet min-h-touch px-4'}
              aria-pressed={outcome === o}
              onClick={() => setOutcome(o)}
            >
              {OUTCOME_LABELS[o]}
            </button>
          ))}
        </div>
        {outcome && outcome !== 'pass' && <p className="text-sm">The bin goes to quarantine{outcome === 'repair' ? ' for repair' : ''}.</p>}
        {problemOf('outcome') && <p className="text-sm font-medium text-brick">{problemOf('outcome')}</p>}
      </fieldset>

      <div>
        <label className="label" htmlFor="inspector">
          Inspector
        </label>
        <select id="inspector" className="field" value={inspector} onChange={(e) => setInspector(e.target.value)}>
          {p.inspectors.map((i) => (
            <option key={i.id} value={i.id}>
              {i.name}
              {i.id === p.meId ? ' (you)' : ''}
            </option>
          ))}
          <option value="body">An outside inspection body</option>
        </select>
        {inspector === 'body' && (
          <>
            <label className="label mt-2" htmlFor="body">
              Name of the inspection body
            </label>
            <input id="body" className="field" maxLength={160} value={body} onChange={(e) => setBody(e.target.value)} />
          </>
        )}
        {problemOf('inspector') && <p className="mt-1 text-sm font-medium text-brick">{problemOf('inspector')}</p>}
      </div>

      <div>
        <label className="label" htmlFor="photos">
          Photos (up to 4)
        </label>
        <input
          id="photos"
          type="file"
          accept="image/*"
          capture="environment"
          multiple
          className="block w-full text-sm"
          onChange={(e) => setPhotos(Array.from(e.target.files ?? []).slice(0, 4))}
        />
        {note && <p className="notice-attention mt-1">{note}</p>}
      </div>

      <div>
        <label className="label" htmlFor="remarks">
          Remarks{outcome && outcome !== 'pass' ? ' — what was found' : ''}
        </label>
        <textarea id="remarks" className="field min-h-[80px] py-2" maxLength={2000} value={remarks} onChange={(e) => setRemarks(e.target.value)} />
        {problemOf('remarks') && <p className="mt-1 text-sm font-medium text-brick">{problemOf('remarks')}</p>}
      </div>

      {serverError && (
        <p className="notice-fault" role="alert">
          {serverError}
        </p>
      )}
      {shown && problems.length > 0 && (
        <p className="notice-attention" role="alert">
          {problems.length === 1 ? '1 thing is' : `${problems.length} things are`} missing or not right: see the marked fields.
        </p>
      )}
      <button type="submit" className="btn-primary w-full" disabled={busy}>
        {busy ? 'Recording…' : 'Record inspection'}
      </button>
      {back}
    </form>
  );
}
