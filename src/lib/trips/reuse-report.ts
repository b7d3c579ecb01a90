/**
 * The reuse report: how often the pool's bins go round, for customers' sustainability reporting and as the
 * operator's record for packaging rules on reusable transport packaging.
 *
 *   inPoolDuring(bin, from, to)            → the bin was in service on at least one day of the range
 *   daysInPool(bin, from, to)              → how many days of the range it was in service
 *   serviceYears(bin, today)               → years from commissioning to leaving the pool (or today)
 *   reuseSummary(bins, period, scope)      → the headline figures for a period
 *   reuseByYear(bins, today, scope)        → the same figures per calendar year (this year up to today)
 *   reuseCsv(bins, period, today, scope)   → header and rows of the per-bin CSV
 *
 * Definitions (also printed on the page):
 * - A rotation is a completed trip: out from a depot and received back at one. It counts in the period (or
 *   year) its return falls in.
 * - The pool during a period: bins commissioned (registered) on or before its last day and not gone from the
 *   pool (retired or declared missing) before its first day.
 * - A bin is reused in a period when it completed at least one rotation in it.
 * - Rotations per bin per year = rotations in the period / bin-years in service in it, where a bin-year is
 *   365 of its days in the pool inside the period (a bin that joined half-way counts half). For a period in
 *   which every bin served throughout, that is rotations / bins × 365 / days in the period.
 * - Average rotations per bin since commissioning = all rotations / all bins ever commissioned.
 * - With a customer chosen, only that customer's rotations count, and the bins are those that made at least
 *   one rotation for the customer in the period: "share of the pool" has no meaning there and is left out.
 */
import { daysBetween } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';
import { plainDecimal } from '@/lib/figures';
import type { CsvCell } from '@/lib/csv';

export interface ReuseBin {
  assetId: number;
  grai: string;
  serial: string;
  binType: string;
  commissionedOn: LocalDate;
  /** The day the bin was retired or declared missing; null while in service. */
  leftOn: LocalDate | null;
  /** Completed rotations since commissioning (the chosen customer's only, when one is chosen). */
  rotationsTotal: number;
  /** Completed rotations by the calendar year of their return, e.g. { '2026': 7 }. */
  rotationsByYear: Readonly<Record<string, number>>;
  rotationsInPeriod: number;
}

export interface Period {
  from: LocalDate;
  to: LocalDate;
}

export type ReuseScope = { kind: 'pool' } | { kind: 'customer'; name: string };

export interface ReuseFigures {
  days: number;
  /** Days the counted bins were in the pool inside the period, added up. */
  binDays: number;
  /** Pool scope: bins in service during the period. Customer scope: bins that made a rotation for the customer. */
  bins: number;
  binsReused: number;
  /** Fraction of the pool reused in the period; null for a customer, or an empty pool. */
  shareReused: number | null;
  rotations: number;
  rotationsPerBinPerYear: number | null;
}

export interface ReuseSummary extends ReuseFigures {
  binsEverCommissioned: number;
  rotationsSinceCommissioning: number;
  averageRotationsSinceCommissioning: number | null;
  rotationsPerServiceYear: number | null;
}

export interface ReuseYear extends ReuseFigures {
  year: number;
  from: LocalDate;
  to: LocalDate;
  /** True for the current year, counted up to today. */
  partial: boolean;
}

const DAYS_PER_YEAR = 365;

export function inPoolDuring(bin: Pick<ReuseBin, 'commissionedOn' | 'leftOn'>, from: LocalDate, to: LocalDate): boolean {
  return bin.commissionedOn <= to && (bin.leftOn === null || bin.leftOn >= from);
}

/** The bin's days in the pool inside from–to, both ends included (0 when it was not in the pool then). */
export function daysInPool(bin: Pick<ReuseBin, 'commissionedOn' | 'leftOn'>, from: LocalDate, to: LocalDate): number {
  const start = bin.commissionedOn > from ? bin.commissionedOn : from;
  const end = bin.leftOn !== null && bin.leftOn < to ? bin.leftOn : to;
  return Math.max(0, daysBetween(start, end) + 1);
}

export function serviceYears(bin: Pick<ReuseBin, 'commissionedOn' | 'leftOn'>, today: LocalDate): number {
  const end = bin.leftOn !== null && bin.leftOn < today ? bin.leftOn : today;
  return Math.max(0, daysBetween(bin.commissionedOn, end)) / DAYS_PER_YEAR;
}

function figures(bins: readonly ReuseBin[], from: LocalDate, to: LocalDate, rotationsOf: (bin: ReuseBin) => number, scope: ReuseScope): ReuseFigures {
  const days = daysBetween(from, to) + 1;
  if (days < 1) throw new RangeError(`Period ends before it starts: ${from} – ${to}`);
  const counted = scope.kind === 'pool' ? bins.filter((b) => inPoolDuring(b, from, to)) : bins.filter((b) => rotationsOf(b) > 0);
  const rotations = counted.reduce((sum, b) => sum + rotationsOf(b), 0);
  const binsReused = counted.filter((b) => rotationsOf(b) > 0).length;
  const n = counted.length;
  const binDays = counted.reduce((sum, b) => sum + daysInPool(b, from, to), 0);
  return {
    days,
    binDays,
    bins: n,
    binsReused,
    shareReused: scope.kind === 'pool' && n > 0 ? binsReused / n : null,
    rotations,
    rotationsPerBinPerYear: binDays > 0 ? rotations / (binDays / DAYS_PER_YEAR) : null,
  };
}

export function reuseSummary(bins: readonly ReuseBin[], period: Period, today: LocalDate, scope: ReuseScope): ReuseSummary {
  const periodFigures = figures(bins, period.from, period.to, (b) => b.rotationsInPeriod, scope);
  const commissioned = scope.kind === 'pool' ? bins.filter((b) => b.commissionedOn <= today) : bins.filter((b) => b.rotationsTotal > 0);
  const rotationsSinceCommissioning = commissioned.reduce((sum, b) => sum + b.rotationsTotal, 0);
  const years = commissioned.reduce((sum, b) => sum + serviceYears(b, today), 0);
  return {
    ...periodFigures,
    binsEverCommissioned: commissioned.length,
    rotationsSinceCommissioning,
    averageRotationsSinceCommissioning: commissioned.length > 0 ? rotationsSinceCommissioning / commissioned.length : null,
    rotationsPerServiceYear: years > 0 ? rotationsSinceCommissioning / years : null,
  };
}

export function reuseByYear(bins: readonly ReuseBin[], today: LocalDate, scope: ReuseScope): ReuseYear[] {
  if (bins.length === 0) return [];
  const firstYear = Math.min(...bins.map((b) => Number(b.commissionedOn.slice(0, 4))));
  const thisYear = Number(today.slice(0, 4));
  const years: ReuseYear[] = [];
  for (let year = thisYear; year >= firstYear; year -= 1) {
    const from = `${String(year).padStart(4, '0')}-01-01`;
    const partial = year === thisYear;
    const to = partial ? today : `${String(year).padStart(4, '0')}-12-31`;
    years.push({ year, from, to, partial, ...figures(bins, from, to, (b) => b.rotationsByYear[String(year)] ?? 0, scope) });
  }
  return years;
}

export interface CsvTable {
  fields: string[];
  rows: CsvCell[][];
}

/** One row per bin counted in the period (see `figures`), in serial order; numbers with '.' and no grouping. */
export function reuseCsv(bins: readonly ReuseBin[], period: Period, today: LocalDate, scope: ReuseScope): CsvTable {
  const counted = scope.kind === 'pool' ? bins.filter((b) => inPoolDuring(b, period.from, period.to)) : bins.filter((b) => b.rotationsInPeriod > 0);
  const forCustomer = scope.kind === 'customer';
  const fields = [
    ...(forCustomer ? ['customer'] : []),
    'grai',
    'serial',
    'bin_type',
    'commissioned_on',
    'left_pool_on',
    'period_from',
    'period_to',
    forCustomer ? 'rotations_for_customer_in_period' : 'rotations_in_period',
    forCustomer ? 'rotations_for_customer_since_commissioning' : 'rotations_since_commissioning',
    'years_in_service',
    forCustomer ? 'rotations_for_customer_per_year_in_service' : 'rotations_per_year_in_service',
  ];
  const sorted = [...counted].sort((a, b) => a.serial.localeCompare(b.serial, 'en', { numeric: true }) || a.grai.localeCompare(b.grai));
  const rows = sorted.map((b) => {
    const years = serviceYears(b, today);
    return [
      ...(forCustomer ? [scope.name] : []),
      b.grai,
      b.serial,
      b.binType,
      b.commissionedOn,
      b.leftOn ?? '',
      period.from,
      period.to,
      // Numbers as numbers (src/lib/csv.ts writes them unquoted), rounded to two decimals.
      b.rotationsInPeriod,
      b.rotationsTotal,
      Number(plainDecimal(years, 2)),
      years > 0 ? Number(plainDecimal(b.rotationsTotal / years, 2)) : null,
    ];
  });
  return { fields, rows };
}
