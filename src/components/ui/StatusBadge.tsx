import { Icon } from './Icon';
import { STATUS_LOOK, TONE_CLASSES } from '@/lib/status-look';
import type { Status } from '@/lib/scans/lifecycle';

export function StatusBadge({ status, size = 'sm' }: { status: Status; size?: 'sm' | 'lg' }) {
  const d = STATUS_LOOK[status];
  return (
    <span
      className={`inline-flex items-center gap-1.5 rounded-full border font-medium whitespace-nowrap ${TONE_CLASSES[d.tone]} ${size === 'lg' ? 'px-3 py-1 text-base' : 'px-2 py-0.5 text-sm'}`}
      data-status={status}
    >
      <Icon name={d.icon} size={size === 'lg' ? 20 : 16} />
      {d.label}
    </span>
  );
}
