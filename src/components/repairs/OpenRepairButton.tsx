// Opens a repair order from a damage report (the planners' list), then goes to it.
import { useState } from 'react';
import { api, ApiError } from '@/lib/api.client';

export default function OpenRepairButton({ damageReportId, serial }: { damageReportId: number; serial: string }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function open() {
    setBusy(true);
    setProblem(null);
    try {
      const out = await api.post<{ id: number }>('/api/repairs', { damageReportId });
      window.location.assign(`/repairs/${out.id}`);
    } catch (err) {
      const details = err instanceof ApiError ? (err.details as { repairOrderId?: number } | undefined) : undefined;
      if (details?.repairOrderId) window.location.assign(`/repairs/${details.repairOrderId}`);
      else setProblem(err instanceof ApiError ? err.message : 'Something went wrong. Try again.');
      setBusy(false);
    }
  }
  return (
    <span className="inline-flex flex-col items-start">
      <button type="button" className="btn-quiet" onClick={() => void open()} disabled={busy} aria-label={`Open repair order for bin ${serial}`} data-open-repair={damageReportId}>
        {busy ? 'Opening…' : 'Open repair order'}
      </button>
      {problem && (
        <span className="text-sm font-medium text-brick" role="alert">
          {problem}
        </span>
      )}
    </span>
  );
}
