import { useState } from 'react';
import { api, ApiError } from '@/lib/api.client';
import { Icon } from '@/components/ui/Icon';

/** Approves the plan shown (solved again on the server for the same settings); its lanes become orders and runs. */
export default function ApprovePlanButton({ settings, lanes }: { settings: { horizonDays: number; costPerKm: number; roadFactor: number }; lanes: number }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function approve() {
    if (!window.confirm(`Approve the plan? Its ${lanes} ${lanes === 1 ? 'lane becomes' : 'lanes become'} repositioning orders and collection runs.`)) return;
    setBusy(true);
    setProblem(null);
    try {
      await api.post('/api/planning/repositioning/approve', settings);
      window.location.hash = 'approved-h';
      window.location.reload();
    } catch (err) {
      setBusy(false);
      setProblem(err instanceof ApiError ? err.message : 'The plan could not be approved. Try again.');
    }
  }
  return (
    <div className="flex flex-wrap items-center gap-3">
      <button type="button" className="btn-primary" disabled={busy} onClick={approve} data-testid="approve-plan">
        <Icon name="check" size={18} /> {busy ? 'Approving…' : 'Approve the plan'}
      </button>
      {problem && (
        <p className="notice-fault" role="alert">
          {problem}
        </p>
      )}
    </div>
  );
}

/** Withdraws what is left of an approved plan (its open orders, and runs nothing was received against). */
export function WithdrawPlanButton({ planId }: { planId: number }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function withdraw() {
    if (!window.confirm('Withdraw this plan? Its open repositioning orders and the runs nothing came in on yet are cancelled.')) return;
    setBusy(true);
    setProblem(null);
    try {
      await api.post(`/api/planning/repositioning/plans/${planId}/withdraw`);
      window.location.reload();
    } catch (err) {
      setBusy(false);
      setProblem(err instanceof ApiError ? err.message : 'The plan could not be withdrawn. Try again.');
    }
  }
  return (
    <div className="mt-2 flex flex-wrap items-center gap-3">
      <button type="button" className="btn-quiet" disabled={busy} onClick={withdraw} data-testid="withdraw-plan">
        Withdraw what is left
      </button>
      {problem && (
        <p className="notice-fault" role="alert">
          {problem}
        </p>
      )}
    </div>
  );
}
