import { useEffect, useState, type FormEvent } from 'react';
import useSWR from 'swr';
import { FieldProblem } from '@/components/ui/Dialog';
import { api, ApiError, fetcher, withQuery } from '@/lib/api.client';
import { formatLongDate } from '@/lib/calendar';
import { DEFAULT_TARIFF_TERMS, HIRE_START_LABELS, HIRE_STOP_LABELS, dayCountWords, inForce, type Tariff } from '@/lib/planning/tariffs';

interface Customer {
  id: number;
  name: string;
}

const EMPTY = {
  validFrom: '',
  freeDays: '',
  dailyRate: '',
  perTripFee: '0.00',
  lostBinFee: '',
  currency: 'EUR',
  linerFee: DEFAULT_TARIFF_TERMS.linerFee as string,
  stopFee: DEFAULT_TARIFF_TERMS.stopFee as string,
  hireStartsAt: DEFAULT_TARIFF_TERMS.hireStartsAt as Tariff['hireStartsAt'],
  hireStopsAt: DEFAULT_TARIFF_TERMS.hireStopsAt as Tariff['hireStopsAt'],
  firstDayCounts: DEFAULT_TARIFF_TERMS.firstDayCounts as boolean,
  lastDayCounts: DEFAULT_TARIFF_TERMS.lastDayCounts as boolean,
};
type Form = typeof EMPTY;
type TextKey = 'validFrom' | 'freeDays' | 'dailyRate' | 'perTripFee' | 'lostBinFee' | 'currency' | 'linerFee' | 'stopFee';

/**
 * A customer's hire terms by period: the periods on record (newest first, the one in force marked) and new terms
 * from a date. The open-ended period before it is ended the day before (the server decides, planNewTariff()); a
 * date inside a closed period is refused with the reason. Orders, the overdue rule and billing read these.
 */
export default function TariffPanel({ customers, today }: { customers: Customer[]; today: string }) {
  const [customerId, setCustomerId] = useState<number | null>(customers[0]?.id ?? null);
  const { data: periods, mutate } = useSWR<Tariff[]>(customerId ? withQuery('/api/admin/tariffs', { customer: customerId }) : null, fetcher);
  const [form, setForm] = useState<Form>(EMPTY);
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [notice, setNotice] = useState<{ tone: 'good' | 'fault'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  // New terms start from what is in force, so only what changes needs typing.
  useEffect(() => {
    const current = periods?.find((p) => inForce(p, today)) ?? periods?.[0];
    setForm(
      current
        ? {
            validFrom: '',
            freeDays: String(current.freeDays),
            dailyRate: current.dailyRate,
            perTripFee: current.perTripFee,
            lostBinFee: current.lostBinFee,
            currency: current.currency,
            linerFee: current.linerFee,
            stopFee: current.stopFee,
            hireStartsAt: current.hireStartsAt,
            hireStopsAt: current.hireStopsAt,
            firstDayCounts: current.firstDayCounts,
            lastDayCounts: current.lastDayCounts,
          }
        : EMPTY,
    );
  }, [periods, today]);

  const set = (key: keyof Form) => (e: { target: { value: string } }) => setForm((f) => ({ ...f, [key]: e.target.value }));
  const tick = (key: 'firstDayCounts' | 'lastDayCounts') => (e: { target: { checked: boolean } }) => setForm((f) => ({ ...f, [key]: e.target.checked }));
  const aria = (name: string) => ({ 'aria-invalid': Boolean(problems[name]), 'aria-describedby': `tariff-${name}-problem` });

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!customerId) return;
    setBusy(true);
    setProblems({});
    setNotice(null);
    const freeDays = form.freeDays.trim() === '' || !Number.isFinite(Number(form.freeDays)) ? form.freeDays : Number(form.freeDays);
    try {
      const made = await api.post<{ id: number; endedPrevious: { id: number; validTo: string } | null }>('/api/admin/tariffs', {
        customerId,
        validFrom: form.validFrom,
        freeDays,
        dailyRate: form.dailyRate.trim().replace(',', '.'),
        perTripFee: form.perTripFee.trim().replace(',', '.'),
        lostBinFee: form.lostBinFee.trim().replace(',', '.'),
        currency: form.currency.trim().toUpperCase(),
        linerFee: form.linerFee.trim().replace(',', '.'),
        stopFee: form.stopFee.trim().replace(',', '.'),
        hireStartsAt: form.hireStartsAt,
        hireStopsAt: form.hireStopsAt,
        firstDayCounts: form.firstDayCounts,
        lastDayCounts: form.lastDayCounts,
      });
      const ended = made.endedPrevious ? ` The terms before end on ${formatLongDate(made.endedPrevious.validTo)}.` : '';
      setNotice({ tone: 'good', text: `New terms from ${formatLongDate(form.validFrom)} saved.${ended}` });
      await mutate();
    } catch (err) {
      if (err instanceof ApiError) {
        setProblems(err.fieldMessages());
        setNotice({ tone: 'fault', text: err.message });
      } else setNotice({ tone: 'fault', text: 'Something went wrong. Try again.' });
    }
    setBusy(false);
  }

  if (!customers.length) return null;
  return (
    <section className="card space-y-4 p-5" aria-labelledby="tariffs-title" id="tariffs">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="tariffs-title">Hire terms by period</h2>
          <p className="text-sm text-ink-soft">What a customer pays, from which day. Orders, the overdue rule and statements read the terms in force on each day.</p>
        </div>
        <div>
          <label className="label" htmlFor="tariff-customer">
            Customer
          </label>
          <select id="tariff-customer" className="field" value={customerId ?? ''} onChange={(e) => setCustomerId(Number(e.target.value))}>
            {customers.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </div>
      </div>

      <div className="overflow-x-auto rounded-md border border-paper-line" role="region" aria-label="Hire terms on record (the table scrolls sideways)" tabIndex={0}>
        <table className="w-full text-left text-sm" data-tariff-periods>
          <thead className="border-b border-paper-line bg-paper text-ink-soft">
            <tr>
              {['From', 'To', 'Free days', 'Daily rate', 'Trip fee', 'Lost-bin fee', 'Liner', 'Collection stop', 'Days counted'].map((label, i) => (
                <th key={label} scope="col" className={`px-3 py-2 font-medium ${i >= 2 && i <= 7 ? 'text-right' : ''} ${i === 0 ? 'sticky left-0 bg-paper' : ''}`}>
                  {label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody className="divide-y divide-paper-line">
            {(periods ?? []).map((p) => (
              <tr key={p.id} data-in-force={inForce(p, today) || undefined}>
                <td className="sticky left-0 whitespace-nowrap bg-card px-3 py-2.5 font-medium">
                  {formatLongDate(p.validFrom)}
                  {inForce(p, today) && <span className="ml-2 rounded bg-kelp-tint px-1.5 py-0.5 text-xs font-medium text-kelp">in force</span>}
                </td>
                <td className="whitespace-nowrap px-3 py-2.5">{p.validTo ? formatLongDate(p.validTo) : 'until further notice'}</td>
                <td className="num whitespace-nowrap px-3 py-2.5 text-right">{p.freeDays}</td>
                {[p.dailyRate, p.perTripFee, p.lostBinFee, p.linerFee, p.stopFee].map((amount, i) => (
                  <td key={i} className="num whitespace-nowrap px-3 py-2.5 text-right">
                    {p.currency} {amount}
                  </td>
                ))}
                <td className="min-w-[16rem] px-3 py-2.5">{dayCountWords(p)}</td>
              </tr>
            ))}
            {periods && periods.length === 0 && (
              <tr>
                <td colSpan={9} className="px-3 py-2.5 text-ink-soft">
                  No terms on record yet.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <form onSubmit={submit} noValidate className="space-y-3" id="tariff-form">
        <h3 className="text-base font-semibold">New terms from a date</h3>
        {notice && (
          <p className={`notice-${notice.tone}`} role={notice.tone === 'good' ? 'status' : 'alert'} id="tariff-notice">
            {notice.text}
          </p>
        )}
        <div className="grid gap-3 sm:grid-cols-3 xl:grid-cols-4">
          {(
            [
              ['validFrom', 'From', 'date'],
              ['freeDays', 'Free days', 'text'],
              ['dailyRate', 'Daily rate', 'text'],
              ['perTripFee', 'Trip fee', 'text'],
              ['lostBinFee', 'Lost-bin fee', 'text'],
              ['currency', 'Currency', 'text'],
              ['linerFee', 'Liner, per trip', 'text'],
              ['stopFee', 'Collection stop', 'text'],
            ] as const
          ).map(([name, label, type]) => (
            <div key={name}>
              <label className="label" htmlFor={`tariff-${name}`}>
                {label}
              </label>
              <input
                id={`tariff-${name}`}
                type={type}
                inputMode={name === 'freeDays' ? 'numeric' : name === 'validFrom' || name === 'currency' ? undefined : 'decimal'}
                className="field num"
                value={form[name as TextKey]}
                onChange={set(name)}
                maxLength={name === 'currency' ? 3 : 12}
                {...aria(name)}
              />
              <FieldProblem id={`tariff-${name}-problem`} message={problems[name]} />
            </div>
          ))}
        </div>
        <fieldset className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
          <legend className="mb-1 text-sm font-medium text-ink-soft">Which days are charged (the overdue rule counts the same days)</legend>
          <div>
            <label className="label" htmlFor="tariff-hireStartsAt">
              Hire starts
            </label>
            <select id="tariff-hireStartsAt" className="field" value={form.hireStartsAt} onChange={set('hireStartsAt')} {...aria('hireStartsAt')}>
              {Object.entries(HIRE_START_LABELS).map(([k, label]) => (
                <option key={k} value={k}>
                  {label}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label className="label" htmlFor="tariff-hireStopsAt">
              Hire stops
            </label>
            <select id="tariff-hireStopsAt" className="field" value={form.hireStopsAt} onChange={set('hireStopsAt')} {...aria('hireStopsAt')}>
              {Object.entries(HIRE_STOP_LABELS).map(([k, label]) => (
                <option key={k} value={k}>
                  {label}
                </option>
              ))}
            </select>
          </div>
          <label className="flex min-h-touch items-center gap-2 self-end">
            <input type="checkbox" checked={form.firstDayCounts} onChange={tick('firstDayCounts')} id="tariff-firstDayCounts" /> The first day counts
          </label>
          <label className="flex min-h-touch items-center gap-2 self-end">
            <input type="checkbox" checked={form.lastDayCounts} onChange={tick('lastDayCounts')} id="tariff-lastDayCounts" /> The last day counts
          </label>
        </fieldset>
        <button type="submit" className="btn-primary" disabled={busy || !form.validFrom}>
          Save new terms
        </button>
      </form>
    </section>
  );
}
