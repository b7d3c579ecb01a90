// One button that POSTs a JSON body to an API route, asks first when told to, and then opens the page the answer
// names (`{id}` in `thenHref` is the answer's id). The route's refusal is shown beside the button.
import { useState } from 'react';
import { api, ApiError } from '@/lib/api.client';

interface Props {
  endpoint: string;
  body: Record<string, unknown>;
  label: string;
  busyLabel: string;
  /** Read to the screen-reader user instead of the short label (e.g. which customer). */
  ariaLabel: string;
  /** A question to confirm first (window.confirm); none: no question. */
  confirm?: string;
  thenHref: string;
  primary?: boolean;
  testId?: string;
}

export default function ActionButton({ endpoint, body, label, busyLabel, ariaLabel, confirm, thenHref, primary = false, testId }: Props) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function act() {
    if (confirm && !window.confirm(confirm)) return;
    setBusy(true);
    setProblem(null);
    try {
      const out = await api.post<{ id: number }>(endpoint, body);
      window.location.assign(thenHref.replace('{id}', String(out.id)));
    } catch (err) {
      setProblem(err instanceof ApiError ? err.message : 'Something went wrong. Try again.');
      setBusy(false);
    }
  }
  return (
    <span className="inline-flex flex-col items-end">
      <button type="button" className={primary ? 'btn-primary' : 'btn-quiet'} onClick={() => void act()} disabled={busy} aria-label={ariaLabel} data-action-button={testId}>
        {busy ? busyLabel : label}
      </button>
      {problem && (
        <span className="text-sm font-medium text-brick" role="alert">
          {problem}
        </span>
      )}
    </span>
  );
}
