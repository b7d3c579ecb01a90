import { useState } from 'react';
import { api, ApiError } from '@/lib/api.client';
import { Icon } from '@/components/ui/Icon';

interface Props {
  depotId: number;
  plannedOn: string;
  trailerId: number | null;
  binTypeId: number | null;
  stops: Array<{ siteId: number; expectedBins: number }>;
}

/** Saves a suggested run as a planned run and opens its page. */
export default function PlanRunButton(props: Props) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function save() {
    setBusy(true);
    setProblem(null);
    try {
      const out = await api.post<{ id: number }>('/api/planning/runs', {
        depotId: props.depotId,
        plannedOn: props.plannedOn,
        trailerId: props.trailerId,
        binTypeId: props.binTypeId,
        stops: props.stops,
      });
      window.location.assign(`/planning/runs/${out.id}`);
    } catch (err) {
      setBusy(false);
      setProblem(err instanceof ApiError ? err.message : 'The run could not be saved. Try again.');
    }
  }
  return (
    <div>
      <button type="button" className="btn-primary" disabled={busy} onClick={save} data-testid="plan-run">
        <Icon name="route" size={18} /> Plan this run
      </button>
      {problem && (
        <p className="notice-fault mt-2" role="alert">
          {problem}
        </p>
      )}
    </div>
  );
}
