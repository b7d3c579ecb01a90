// Cell renderers of the fleet grid. Status and flags are a word plus an icon,
// dates are absolute with a relative hint, identifiers are grouped in Plex Mono.
import type { CustomCellRendererProps } from 'ag-grid-react';
import { Icon } from '@/components/ui/Icon';
import { formatDayCount as days, formatLongDate, formatRelative } from '@/lib/calendar';
import { groupGrai } from '@/lib/gs1';
import { STATUS_LABELS, type Status } from '@/lib/scans/lifecycle';
import { STATUS_LOOK, TEST_LAPSED_LOOK, TONE_TEXT } from '@/lib/status-look';
import { isInspectionLapsed } from '@/lib/scans/lifecycle';
import { DUE_SOON_DAYS } from '@/lib/inspections/inspection-due';
import type { GridContext, GridRow } from './types';

type Props = CustomCellRendererProps<GridRow, unknown, GridContext>;

function Hint({ children }: { children: React.ReactNode }) {
  return <span className="text-ink-faint"> · {children}</span>;
}

export function binHref(grai: string): string {
  return `/bins/${encodeURIComponent(grai)}`;
}

function readableGrai(grai: string, prefixLength: number): string {
  try {
    return groupGrai(grai, prefixLength);
  } catch {
    return grai; // a stored GRAI that does not parse still shows, as stored
  }
}

export function GraiCell({ data, context }: Props) {
  if (!data) return <span className="text-ink-faint">Loading…</span>;
  return (
    <a href={binHref(data.grai)} className="ident no-underline hover:underline" title={`Open bin ${data.grai}`}>
      {readableGrai(data.grai, context.prefixLength)}
    </a>
  );
}

export function StatusCell({ data, context }: Props) {
  if (!data) return null;
  const status = data.status as Status;
  const look = STATUS_LOOK[status];
  const lapsed = status !== 'retired' && isInspectionLapsed(data.nextDue ?? null, context.today);
  return (
    <span className="inline-flex items-center gap-3">
      <span className={`inline-flex items-center gap-1.5 font-medium ${look ? TONE_TEXT[look.tone] : ''}`}>
        {look && <Icon name={look.icon} size={18} />}
        <span className="text-ink">{STATUS_LABELS[status] ?? status}</span>
      </span>
      {lapsed && (
        <span className={`inline-flex items-center gap-1 font-medium ${TONE_TEXT[TEST_LAPSED_LOOK.tone]}`} data-test-lapsed>
          <Icon name={TEST_LAPSED_LOOK.icon} size={16} />
          <span className="text-ink">{TEST_LAPSED_LOOK.label}</span>
        </span>
      )}
    </span>
  );
}

export function DateCell({ value, context }: Props) {
  if (!value) return <span className="text-ink-faint">—</span>;
  const day = String(value);
  return (
    <span className="num">
      {formatLongDate(day)}
      <Hint>{formatRelative(day, context.today)}</Hint>
    </span>
  );
}

export function NextDueCell({ data, context }: Props) {
  if (!data) return null;
  if (!data.nextDue) return <span className="text-ink-faint">no periodic test</span>;
  return (
    <span className="inline-flex items-center gap-2 num">
      <span>
        {formatLongDate(data.nextDue)}
        <Hint>{formatRelative(data.nextDue, context.today)}</Hint>
      </span>
      {data.overdue && (
        <span className="inline-flex items-center gap-1 rounded bg-brick-tint px-1.5 text-sm font-medium text-brick">
          <Icon name="alert" size={15} /> Overdue
        </span>
      )}
      {data.dueSoon && (
        <span className="inline-flex items-center gap-1 rounded bg-ochre-tint px-1.5 text-sm font-medium text-ochre-text" title={`Due within ${DUE_SOON_DAYS} days`}>
          <Icon name="waiting" size={15} /> Due soon
        </span>
      )}
    </span>
  );
}

export function LastScanCell({ data, context }: Props) {
  if (!data) return null;
  if (!data.lastScanLocal) return <span className="text-ink-faint">never scanned</span>;
  const [day, time] = data.lastScanLocal.split(' ');
  return (
    <span className="num">
      {formatLongDate(day!)} {time}
      <Hint>{formatRelative(day!, context.today)}</Hint>
    </span>
  );
}

export function DaysAtSiteCell({ data }: Props) {
  if (!data) return null;
  if (data.daysAtSite === null) return <span className="text-ink-faint">{data.status === 'in_transit' ? 'on the road' : '—'}</span>;
  return (
    <span className="inline-flex items-center gap-2 num" title={data.siteSinceOn ? `since ${formatLongDate(data.siteSinceOn)}` : undefined}>
      {days(data.daysAtSite)}
      {data.overFreeDays && (
        <span className="inline-flex items-center gap-1 rounded bg-brick-tint px-1.5 text-sm font-medium text-brick" title={`More than the customer's ${data.freeDays} free days`}>
          <Icon name="alert" size={15} /> Over {data.freeDays} free
        </span>
      )}
    </span>
  );
}

export function DaysCell({ value }: Props) {
  if (value === null || value === undefined) return <span className="text-ink-faint">—</span>;
  return <span className="num">{days(Number(value))}</span>;
}

export function FlagCell({ value }: Props) {
  if (value === undefined) return null;
  return value ? (
    <span className="inline-flex items-center gap-1 font-medium text-ink">
      <Icon name="check" size={16} className="text-kelp" /> Yes
    </span>
  ) : (
    <span className="text-ink-faint">No</span>
  );
}

export function TextCell({ value, mono }: Props & { mono?: boolean }) {
  if (value === null || value === undefined || value === '') return <span className="text-ink-faint">—</span>;
  return <span className={mono ? 'ident' : undefined}>{String(value)}</span>;
}
