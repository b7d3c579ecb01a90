// The customer's "pay online" box on an invoice: how much to pay now (all that is outstanding, or part), then
// the payment provider's own pay page. The invoice shows the payment once the provider confirms it.
import { useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';

export default function PayOnline({ invoiceId, outstanding, currency }: { invoiceId: number; outstanding: string; currency: string }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<{ text: string; field: boolean } | null>(null);
  async function pay(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const amount = String(new FormData(e.currentTarget).get('amount') ?? '').trim();
    setBusy(true);
    setProblem(null);
    try {
      const out = await api.post<{ url: string }>(`/api/portal/invoices/${invoiceId}/checkout`, { amount });
      window.location.assign(out.url);
    } catch (err) {
      setProblem(
        err instanceof ApiError
          ? { text: err.fieldMessages().amount ?? err.message, field: 'amount' in err.fieldMessages() }
          : { text: 'The payment could not be started. Try again.', field: false },
      );
      setBusy(false);
    }
  }
  return (
    <form className="no-print card mt-6 space-y-3 p-4" onSubmit={(e) => void pay(e)} noValidate data-form="pay-online">
      <h2 className="text-base">Pay online</h2>
      <div>
        <label className="label" htmlFor="pay-amount">
          Amount to pay now ({currency})
        </label>
        <input
          id="pay-amount"
          name="amount"
          className="field num max-w-xs"
          inputMode="decimal"
          defaultValue={outstanding}
          aria-invalid={problem?.field ? true : undefined}
          aria-describedby={problem ? 'pay-problem' : 'pay-hint'}
        />
        <p id="pay-hint" className="mt-1 text-sm text-ink-soft">
          All that is outstanding, or part of it. You pay on our payment provider&apos;s page.
        </p>
        {problem && (
          <p id="pay-problem" className="mt-1 text-sm font-medium text-brick" role="alert">
            {problem.text}
          </p>
        )}
      </div>
      <button type="submit" className="btn-primary" disabled={busy} data-pay-online>
        {busy ? 'Opening the pay page…' : 'Pay online'}
      </button>
    </form>
  );
}
