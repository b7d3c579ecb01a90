import { Icon } from './Icon';
import { STATUS_LOOK, TEST_LAPSED_LOOK, TONE_CLASSES } from '@/lib/status-look';
import type { Status } from '@/lib/scans/lifecycle';

/** A bin's status as a word and an icon; with `testLapsed`, the "Test lapsed" mark beside it (word and icon too). */
export function StatusBadge({ status, size = 'sm', testLapsed = false }: { status: Status; size?: 'sm' | 'lg'; testLapsed?: boolean }) {
  const d = STATUS_LOOK[status];
  const pill = `inline-flex items-center gap-1.5 rounded-full border font-medium whitespace-nowrap ${size === 'lg' ? 'px-3 py-1 text-base' : 'px-2 py-0.5 text-sm'}`;
  return (
    <>
      <span className={`${pill} ${TONE_CLASSES[d.tone]}`} data-status={status}>
        <Icon name={d.icon} size={size === 'lg' ? 20 : 16} />
        {d.label}
      </span>
      {testLapsed && status !== 'retired' && (
        <span className={`${pill} ${TONE_CLASSES[TEST_LAPSED_LOOK.tone]}`} data-test-lapsed>
          <Icon name={TEST_LAPSED_LOOK.icon} size={size === 'lg' ? 20 : 16} />
          {TEST_LAPSED_LOOK.label}
        </span>
      )}
    </>
  );
}
