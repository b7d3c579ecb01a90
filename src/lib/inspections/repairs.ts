/**
 * Repair orders, the pure part: what opens one, what closes one, what a work entry must hold, the order's cost
 * and whether the bin is proposed for retirement. No I/O; repairs.server.ts applies these.
 *
 *   opensRepair(outcome)                    → a failed inspection (needs repair / fail) opens an order
 *   closesRepair(kind, outcome)             → only a passed test after repair closes one
 *   repairWorkProblems(entry, today)        → [{ field, message }] (empty when it can be recorded)
 *   toMinor("12.50", 2) / fromMinor(1250, 2) → exact money as whole minor units, the way billing counts it
 *   repairCost(order)                       → the work's cost so far, in minor units
 *   retirementProposal(order, threshold)    → proposed when the repair would cost more than the threshold
 *
 * After a repair the bin gets the leakproofness test and the condition checks again before it goes back in
 * service (inspection-form.ts: the after-repair kind; 49 CFR 180.352 counts the test interval from a qualifying
 * repair [published]). Proposing retirement above a cost threshold is the operator's economic rule (a setting),
 * not a regulation: the comparison is strict ("more than"), equal to the threshold still repairs.
 */
import { isLocalDate, type LocalDate } from '@/lib/calendar';
import type { TestOutcome } from './inspection-due';
import type { PeriodicKind } from './inspection-form';
import type { IconName } from '@/lib/icons';
import type { Tone } from '@/lib/status-look';
import { decimalToMinorUnits, minorUnitsToDecimal } from '@/lib/billing/money';

export const REPAIR_SOURCES = ['inspection', 'prep_check', 'damage_report', 'planner'] as const;
export type RepairSource = (typeof REPAIR_SOURCES)[number];
export const REPAIR_STATUSES = ['open', 'closed', 'retired', 'withdrawn'] as const;
export type RepairStatus = (typeof REPAIR_STATUSES)[number];
export type RepairPlace = 'in_house' | 'shop';

export const SOURCE_LABELS: Record<RepairSource, string> = {
  inspection: 'Failed inspection',
  prep_check: 'Failed prep check',
  damage_report: 'Damage report',
  planner: 'Opened by a planner',
};
export const PLACE_LABELS: Record<RepairPlace, string> = { in_house: 'In-house', shop: 'At the repair shop' };

/** Word, icon and tone of a repair order's status (never colour alone). */
export const REPAIR_LOOK: Record<RepairStatus, { label: string; icon: IconName; tone: Tone }> = {
  open: { label: 'Repair open', icon: 'wrench', tone: 'attention' },
  closed: { label: 'Repaired, test passed', icon: 'check', tone: 'good' },
  retired: { label: 'Bin retired', icon: 'retired', tone: 'neutral' },
  withdrawn: { label: 'Withdrawn, no repair', icon: 'folded', tone: 'neutral' },
};
export const RETIRE_PROPOSAL_LOOK = { label: 'Retirement proposed', icon: 'alert' as IconName, tone: 'fault' as Tone };

export function opensRepair(outcome: TestOutcome): boolean {
  return outcome === 'repair' || outcome === 'fail';
}

export function closesRepair(kind: PeriodicKind | 'prep_check', outcome: TestOutcome): boolean {
  return kind === 'after_repair' && outcome === 'pass';
}

/** "12.5" / "12.50" / "12" → 1250 with 2 digits (billing's money rule); costs are never negative, so a sign is refused. */
export function toMinor(value: string | number, digits: number): number | null {
  const minor = decimalToMinorUnits(value, digits);
  return minor === null || minor < 0 || String(value).trim().startsWith('-') ? null : minor;
}

/** 1250 with 2 digits → "12.50" (for NUMERIC columns and form fields). */
export const fromMinor = minorUnitsToDecimal;

export interface RepairWorkEntry {
  performedOn: LocalDate;
  description: string;
  parts: string | null;
  labourHours: number;
  /** The entry's cost (parts and labour) in the operator's currency, as typed: "85.50". */
  cost: string;
}
export type WorkField = 'performedOn' | 'description' | 'parts' | 'labourHours' | 'cost';

export function repairWorkProblems(e: RepairWorkEntry, today: LocalDate, openedOn: LocalDate, digits: number): Array<{ field: WorkField; message: string }> {
  const out: Array<{ field: WorkField; message: string }> = [];
  if (!isLocalDate(e.performedOn)) out.push({ field: 'performedOn', message: 'Enter the day of the work.' });
  else if (e.performedOn > today) out.push({ field: 'performedOn', message: 'The work cannot be recorded for a day still to come.' });
  else if (e.performedOn < openedOn) out.push({ field: 'performedOn', message: `The order was opened on ${openedOn}; the work cannot be earlier.` });
  if (!e.description.trim()) out.push({ field: 'description', message: 'Say what was done.' });
  if (!Number.isFinite(e.labourHours) || e.labourHours < 0 || e.labourHours > 999) out.push({ field: 'labourHours', message: 'Labour in hours, from 0 to 999.' });
  else if (Math.abs(Math.round(e.labourHours * 100) - e.labourHours * 100) > 1e-6)
    out.push({ field: 'labourHours', message: 'Hours to two decimals at most (0.25 for a quarter hour).' });
  if (toMinor(e.cost, digits) === null) out.push({ field: 'cost', message: `The cost as an amount, e.g. 85.50 (${digits} decimals at most, 0 when nothing was spent).` });
  return out;
}

/** The order's cost so far: the sum of its work entries, in minor units. */
export function repairCost(work: ReadonlyArray<{ costMinor: number }>): number {
  return work.reduce((n, w) => n + w.costMinor, 0);
}

export interface RetirementProposal {
  proposed: boolean;
  /** What the comparison used: the estimate or the cost so far, whichever is higher (minor units). */
  amountMinor: number;
  basis: 'estimate' | 'cost' | 'none';
}

/**
 * Proposed for retirement when what the repair would cost — the higher of the estimate and the cost already
 * spent — is more than the threshold. No threshold (null) proposes nothing.
 */
export function retirementProposal(order: { estimatedMinor: number | null; costMinor: number }, thresholdMinor: number | null): RetirementProposal {
  const est = order.estimatedMinor ?? -1;
  const basis: RetirementProposal['basis'] = order.estimatedMinor === null && order.costMinor === 0 ? 'none' : est >= order.costMinor ? 'estimate' : 'cost';
  const amountMinor = Math.max(est, order.costMinor, 0);
  return { proposed: thresholdMinor !== null && basis !== 'none' && amountMinor > thresholdMinor, amountMinor, basis };
}
