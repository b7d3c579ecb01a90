import { useState } from 'react';
import { api, ApiError } from '@/lib/api.client';
import type { OrderCommand } from '@/lib/planning/order-status';
import { Icon } from '@/components/ui/Icon';

const ASK: Record<OrderCommand, string | null> = {
  confirm: null,
  cancel: 'Cancel this order? It stops counting as demand at the depot. This cannot be undone.',
  close: 'Close this order? No more bins will be loaded for it.',
};

/** The commands the rule table allows now; destructive ones ask first. */
export function OrderCommands({ orderId, version, commands }: { orderId: number; version: number; commands: { command: OrderCommand; label: string }[] }) {
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (commands.length === 0) return null;
  async function run(command: OrderCommand) {
    const ask = ASK[command];
    if (ask && !window.confirm(ask)) return;
    setBusy(true);
    setProblem(null);
    try {
      await api.post(`/api/planning/orders/${orderId}/status`, { command, version });
      window.location.reload();
    } catch (err) {
      setBusy(false);
      setProblem(err instanceof ApiError ? err.message : 'The change could not be saved. Try again.');
    }
  }
  return (
    <div className="flex flex-wrap items-center gap-3" data-testid="order-commands">
      {commands.map((c) => (
        <button
          key={c.command}
          type="button"
          disabled={busy}
          className={c.command === 'confirm' ? 'btn-primary' : 'btn-quiet'}
          onClick={() => run(c.command)}
          data-command={c.command}
        >
          {c.label}
        </button>
      ))}
      {problem && (
        <p className="notice-fault flex items-start gap-2 w-full" role="alert">
          <Icon name="alert" size={18} className="mt-0.5 shrink-0" /> {problem}
        </p>
      )}
    </div>
  );
}
