// Issues one customer's statement for a month that is over, then opens it.
import { useState } from 'react';
import { api, ApiError } from '@/lib/api.client';

export default function IssueStatementButton({ customerId, customer, month }: { customerId: number; customer: string; month: string }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function issue() {
    if (!window.confirm(`Issue the ${month} statement for ${customer}? An issued statement never changes; later corrections go on the next one.`)) return;
    setBusy(true);
    setProblem(null);
    try {
      const out = await api.post<{ id: number }>('/api/billing/statements', { customerId, month });
      window.location.assign(`/billing/statements/${out.id}`);
    } catch (err) {
      setProblem(err instanceof ApiError ? err.message : 'Something went wrong. Try again.');
      setBusy(false);
    }
  }
  return (
    <span className="inline-flex flex-col items-end">
      <button type="button" className="btn-quiet" onClick={() => void issue()} disabled={busy} aria-label={`Issue the ${month} statement for ${customer}`} data-issue={customerId}>
        {busy ? 'Issuing…' : 'Issue'}
      </button>
      {problem && (
        <span className="text-sm font-medium text-brick" role="alert">
          {problem}
        </span>
      )}
    </span>
  );
}
