// The admin's two corrections to an invoice: a bank transfer received (the amount and the day) and a credit note
// (the net amount and why). Each posts to its route and reloads the invoice, which then shows the new balance.
import { useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';

interface Props {
  invoiceId: number;
  /** What is outstanding, as a plain decimal ("250.00"), offered as the payment. */
  outstanding: string;
  currency: string;
  today: string;
}

type Which = 'payment' | 'credit';

export default function InvoiceAdminForms({ invoiceId, outstanding, currency, today }: Props) {
  const [busy, setBusy] = useState<Which | null>(null);
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [summary, setSummary] = useState<{ which: Which; text: string } | null>(null);

  async function submit(which: Which, e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const str = (k: string) => String(f.get(k) ?? '').trim();
    setBusy(which);
    setProblems({});
    setSummary(null);
    try {
      if (which === 'payment') {
        await api.post(`/api/billing/invoices/${invoiceId}/payments`, { amount: str('amount'), paidOn: str('paidOn'), ...(str('note') ? { note: str('note') } : {}) });
      } else {
        await api.post(`/api/billing/invoices/${invoiceId}/credit-notes`, { amount: str('amount'), reason: str('reason') });
      }
      window.location.reload();
    } catch (err) {
      if (err instanceof ApiError) {
        setProblems(err.fieldMessages());
        setSummary({ which, text: err.message });
      } else setSummary({ which, text: 'That could not be saved. Try again.' });
      setBusy(null);
    }
  }

  const field = (which: Which, k: string) => `inv-${which}-${k}`;
  const problem = (which: Which, k: string) =>
    summary?.which === which && problems[k] ? (
      <p id={`${field(which, k)}-problem`} className="mt-1 text-sm text-brick">
        {problems[k]}
      </p>
    ) : null;
  const described = (which: Which, k: string) => (summary?.which === which && problems[k] ? `${field(which, k)}-problem` : undefined);
  const notice = (which: Which) =>
    summary?.which === which ? (
      <p className="notice-fault" role="alert">
        {summary.text}
      </p>
    ) : null;

  return (
    <div className="no-print mt-6 grid gap-4 md:grid-cols-2">
      <form className="card space-y-3 p-4" onSubmit={(e) => void submit('payment', e)} noValidate data-form="payment">
        <h2 className="text-base">Record a bank transfer</h2>
        {notice('payment')}
        <div>
          <label className="label" htmlFor={field('payment', 'amount')}>
            Amount received ({currency})
          </label>
          <input
            id={field('payment', 'amount')}
            name="amount"
            className="field num"
            inputMode="decimal"
            defaultValue={outstanding}
            aria-describedby={described('payment', 'amount')}
          />
          {problem('payment', 'amount')}
        </div>
        <div>
          <label className="label" htmlFor={field('payment', 'paidOn')}>
            Received on
          </label>
          <input id={field('payment', 'paidOn')} name="paidOn" type="date" className="field" max={today} defaultValue={today} aria-describedby={described('payment', 'paidOn')} />
          {problem('payment', 'paidOn')}
        </div>
        <div>
          <label className="label" htmlFor={field('payment', 'note')}>
            Bank reference (optional)
          </label>
          <input id={field('payment', 'note')} name="note" className="field" maxLength={500} aria-describedby={described('payment', 'note')} />
          {problem('payment', 'note')}
        </div>
        <button type="submit" className="btn-primary" disabled={busy !== null}>
          {busy === 'payment' ? 'Recording…' : 'Record the payment'}
        </button>
      </form>
      <form className="card space-y-3 p-4" onSubmit={(e) => void submit('credit', e)} noValidate data-form="credit">
        <h2 className="text-base">Issue a credit note</h2>
        {notice('credit')}
        <div>
          <label className="label" htmlFor={field('credit', 'amount')}>
            Net amount to credit ({currency}, tax is added as on the invoice)
          </label>
          <input id={field('credit', 'amount')} name="amount" className="field num" inputMode="decimal" aria-describedby={described('credit', 'amount')} />
          {problem('credit', 'amount')}
        </div>
        <div>
          <label className="label" htmlFor={field('credit', 'reason')}>
            Why
          </label>
          <textarea id={field('credit', 'reason')} name="reason" className="field py-2" rows={2} maxLength={500} aria-describedby={described('credit', 'reason')} />
          {problem('credit', 'reason')}
        </div>
        <button type="submit" className="btn-quiet" disabled={busy !== null}>
          {busy === 'credit' ? 'Issuing…' : 'Issue the credit note'}
        </button>
      </form>
    </div>
  );
}
