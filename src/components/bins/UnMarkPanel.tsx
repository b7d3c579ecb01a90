import type { UnMarkSummary } from '@/lib/bins/un-mark-summary';
import { Icon } from '@/components/ui/Icon';

/** The UN mark decoded as it is typed: each field in words, or the parser's reason it cannot be read. */
export function UnMarkPanel({ summary, typeWarning }: { summary: UnMarkSummary | null; typeWarning?: string | null }) {
  if (!summary) return null;
  if (!summary.ok) {
    return (
      <div className="notice-fault mt-2 flex items-start gap-2" id="un-mark-problem" role="status">
        <Icon name="alert" className="mt-0.5 shrink-0" />
        <span>
          <strong>This mark cannot be read:</strong> {summary.message}
        </span>
      </div>
    );
  }
  return (
    <div className="mt-2 rounded-md border border-paper-line bg-paper/60 p-3" id="un-mark-decoded" role="status" aria-label="Decoded UN mark">
      <p className="flex items-center gap-1 text-sm font-medium text-moss">
        <Icon name="check" size={16} /> The mark reads as:
      </p>
      <dl className="mt-2 grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[11rem_1fr]">
        {summary.fields.map((f) => (
          <div key={f.key} className="contents" data-field={f.key}>
            <dt className="text-ink-soft">{f.label}</dt>
            <dd className="font-medium">{f.value}</dd>
          </div>
        ))}
      </dl>
      {typeWarning && (
        <p className="notice-attention mt-3 flex items-start gap-2">
          <Icon name="alert" className="mt-0.5 shrink-0" /> {typeWarning}
        </p>
      )}
    </div>
  );
}
