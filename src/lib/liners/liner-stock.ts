/**
 * Liner stock planning: pure functions, no I/O. The depot's stock page and the reorder job feed them
 * figures read from the ledger, the order book and the supplier; every number they show comes from here.
 *
 *   eoq(D, S, H)                          → economic order quantity √(2DS/H)
 *   annualOrderingAndHoldingCost(…)       → D/Q·S + Q/2·H, the cost the EOQ minimises
 *   zForServiceLevel(p)                   → standard normal quantile Φ⁻¹(p) (cycle service level p)
 *   reorderPoint({ d̄, σd, L, p })         → d̄·L + z·σd·√L (with no known demand)
 *   planReorder(…)                        → the same with a known part (open orders) and a forecast part
 *   roundOrderQuantity(q, pack)           → raised to the minimum order, then up to whole packs
 *   daysOfCover(stock, demand)            → days until the stock is used up by known + forecast demand
 *   projectFefo(lots, demand, today)      → lots in first-expiry order: the day each is used up, liners at risk
 *   knownDemandByDay(orders, …)           → one liner per bin of the open orders (and kits) in the horizon
 *   forecastFromDaily(values)             → mean and sample standard deviation per day
 *
 * Conventions: quantities are liners; a day is a local date 'YYYY-MM-DD' (see calendar.ts); demand per day
 * is an array indexed from today (index 0 = today). A lot is usable up to and including its expiry date
 * (the same rule as checkLinerLot in lifecycle.ts). Every function throws a RangeError on input that makes
 * no sense rather than answering with a guess.
 */
import { addDays, daysBetween, isLocalDate, type LocalDate } from '@/lib/calendar';

function finiteAtLeast(name: string, value: number, min: number, exclusive = false): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || (exclusive ? value <= min : value < min)) {
    throw new RangeError(`${name} must be a number ${exclusive ? 'above' : 'of at least'} ${min}; got ${String(value)}.`);
  }
}

// ---------------------------------------------------------------------------------------------------
// Order quantity

/** Economic order quantity √(2·D·S/H): D liners a year, S per order, H to hold one liner a year. */
export function eoq(annualDemand: number, orderCost: number, holdingCostPerUnitYear: number): number {
  finiteAtLeast('annual demand', annualDemand, 0);
  finiteAtLeast('order cost', orderCost, 0);
  finiteAtLeast('holding cost per liner and year', holdingCostPerUnitYear, 0, true);
  return Math.sqrt((2 * annualDemand * orderCost) / holdingCostPerUnitYear);
}

/** Annual ordering cost (D/Q orders at S) plus holding cost (average stock Q/2 at H). */
export function annualOrderingAndHoldingCost(a: { annualDemand: number; orderCost: number; holdingCostPerUnitYear: number; orderQuantity: number }): number {
  finiteAtLeast('annual demand', a.annualDemand, 0);
  finiteAtLeast('order cost', a.orderCost, 0);
  finiteAtLeast('holding cost per liner and year', a.holdingCostPerUnitYear, 0);
  finiteAtLeast('order quantity', a.orderQuantity, 0, true);
  return (a.annualDemand / a.orderQuantity) * a.orderCost + (a.orderQuantity / 2) * a.holdingCostPerUnitYear;
}

export interface PackRule {
  /** Liners per pack (carton or pallet); orders are whole packs. */
  packSize: number;
  /** The supplier's minimum order quantity in liners (0 = none). */
  minimumOrder: number;
}

/** Raises a wanted quantity to the supplier's minimum, then up to whole packs. Nothing wanted: 0. */
export function roundOrderQuantity(wanted: number, rule: PackRule): number {
  finiteAtLeast('wanted quantity', wanted, 0);
  if (!Number.isInteger(rule.packSize) || rule.packSize < 1) throw new RangeError(`pack size must be a whole number of liners of at least 1; got ${String(rule.packSize)}.`);
  finiteAtLeast('minimum order', rule.minimumOrder, 0);
  if (wanted === 0) return 0;
  const atLeast = Math.max(wanted, rule.minimumOrder);
  // A hair of floating-point noise (240.00000000001) must not cost a whole extra pack.
  return Math.ceil(atLeast / rule.packSize - 1e-9) * rule.packSize;
}

// ---------------------------------------------------------------------------------------------------
// Service level

// P. J. Acklam's rational approximation of the inverse standard normal distribution: a central region and
// two tails, split at p = 0.02425. Relative error about 1e-9 for 1e-10 ≤ p ≤ 1 − 1e-10 (checked against a
// statistics package in the tests); looser further out, far beyond any service level a planner sets.
const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;

function tail(q: number): number {
  return (((((C[0]! * q + C[1]!) * q + C[2]!) * q + C[3]!) * q + C[4]!) * q + C[5]!) / ((((D[0]! * q + D[1]!) * q + D[2]!) * q + D[3]!) * q + 1);
}

/** z such that Φ(z) = p: the safety factor for a cycle service level p (0 < p < 1). */
export function zForServiceLevel(p: number): number {
  if (typeof p !== 'number' || !Number.isFinite(p) || p <= 0 || p >= 1) {
    throw new RangeError(`service level must be a probability strictly between 0 and 1 (e.g. 0.95); got ${String(p)}.`);
  }
  if (p < P_LOW) return tail(Math.sqrt(-2 * Math.log(p)));
  if (p > 1 - P_LOW) return -tail(Math.sqrt(-2 * Math.log(1 - p)));
  const q = p - 0.5;
  const r = q * q;
  return ((((((A[0]! * r + A[1]!) * r + A[2]!) * r + A[3]!) * r + A[4]!) * r + A[5]!) * q) / (((((B[0]! * r + B[1]!) * r + B[2]!) * r + B[3]!) * r + B[4]!) * r + 1);
}

// ---------------------------------------------------------------------------------------------------
// Reorder point

export interface ReorderPointInput {
  meanDailyDemand: number;
  sdDailyDemand: number;
  leadTimeDays: number;
  /** Cycle service level: the chance of not running out during one lead time (0 < p < 1). */
  serviceLevel: number;
}

/** Safety stock z·σd·√L. */
export function safetyStock(i: ReorderPointInput): number {
  finiteAtLeast('standard deviation of daily demand', i.sdDailyDemand, 0);
  finiteAtLeast('lead time in days', i.leadTimeDays, 0);
  return zForServiceLevel(i.serviceLevel) * i.sdDailyDemand * Math.sqrt(i.leadTimeDays);
}

/** Reorder point with safety stock: ROP = d̄·L + z·σd·√L. */
export function reorderPoint(i: ReorderPointInput): number {
  finiteAtLeast('mean daily demand', i.meanDailyDemand, 0);
  return i.meanDailyDemand * i.leadTimeDays + safetyStock(i);
}

// ---------------------------------------------------------------------------------------------------
// Demand: a known part (the order book) and a forecast part (recent unplanned use)

export interface DemandOrder {
  /** The day the bins are needed (an overdue order counts today). */
  neededBy: LocalDate;
  /** Bins of the order still to be sent out: each takes one liner. */
  bins: number;
  /** Liner kits sent with the order's folded bins (customers fit those themselves). */
  kits?: number;
}

/**
 * Liners the order book needs on each day of the horizon (index 0 = today): one per bin still to go out
 * and one per kit. Bins already lined and waiting at the depot (`linedReady`) have had their liner: they
 * serve the earliest orders first. Orders needed after the horizon are left out.
 */
export function knownDemandByDay(orders: DemandOrder[], o: { today: LocalDate; horizonDays: number; linedReady?: number }): number[] {
  if (!isLocalDate(o.today)) throw new RangeError(`today must be a date 'YYYY-MM-DD'; got ${String(o.today)}.`);
  if (!Number.isInteger(o.horizonDays) || o.horizonDays < 1) throw new RangeError(`horizon must be a whole number of days of at least 1; got ${String(o.horizonDays)}.`);
  let ready = o.linedReady ?? 0;
  finiteAtLeast('lined bins ready', ready, 0);
  const days = new Array<number>(o.horizonDays).fill(0);
  const sorted = [...orders].sort((a, b) => a.neededBy.localeCompare(b.neededBy));
  for (const order of sorted) {
    if (!isLocalDate(order.neededBy)) throw new RangeError(`an order's day must be a date 'YYYY-MM-DD'; got ${String(order.neededBy)}.`);
    finiteAtLeast('bins of an order', order.bins, 0);
    finiteAtLeast('kits of an order', order.kits ?? 0, 0);
    const index = Math.max(0, daysBetween(o.today, order.neededBy));
    if (index >= o.horizonDays) continue;
    const covered = Math.min(ready, order.bins);
    ready -= covered;
    days[index]! += order.bins - covered + (order.kits ?? 0);
  }
  return days;
}

export interface Forecast {
  mean: number;
  sd: number;
}

/** Mean and sample standard deviation (n − 1) of daily figures; fewer than two days give no spread. */
export function forecastFromDaily(values: number[]): Forecast {
  if (values.length === 0) return { mean: 0, sd: 0 };
  for (const v of values) finiteAtLeast('a daily figure', v, 0);
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  if (values.length < 2) return { mean, sd: 0 };
  const ss = values.reduce((s, v) => s + (v - mean) ** 2, 0);
  return { mean, sd: Math.sqrt(ss / (values.length - 1)) };
}

/**
 * The unplanned part of each past day's use: what was consumed beyond what the order book had asked
 * for that day in advance (never below zero).
 */
export function unplannedDaily(days: Array<{ consumed: number; planned: number }>): number[] {
  return days.map((d) => Math.max(0, d.consumed - d.planned));
}

export interface Demand {
  /** Known liners per day from today (the order book); may be shorter than the horizon of interest. */
  known: number[];
  forecast: Forecast;
}

const demandOn = (d: Demand, day: number): number => (d.known[day] ?? 0) + d.forecast.mean;

/**
 * Days the stock lasts: whole days whose demand it meets in full, plus the fraction of the day it runs
 * out in. Infinity when demand stops before the stock does (no forecast use and the order book ends).
 * Hand-worked: 100 liners at 10 a day last 10 days; with 30 more known today, 7 days.
 */
export function daysOfCover(stock: number, demand: Demand): number {
  finiteAtLeast('stock', stock, 0);
  finiteAtLeast('forecast mean per day', demand.forecast.mean, 0);
  for (const k of demand.known) finiteAtLeast('known demand of a day', k, 0);
  let left = stock;
  for (let day = 0; ; day++) {
    const need = demandOn(demand, day);
    if (day >= demand.known.length && demand.forecast.mean === 0) return Infinity;
    if (need > left) return day + left / need;
    left -= need;
    if (day >= demand.known.length) return day + 1 + left / demand.forecast.mean; // only the steady rate from here
  }
}

export interface ReorderPlanInput {
  demand: Demand;
  leadTimeDays: number;
  serviceLevel: number;
  /** On hand at the depot, plus liners on their way to it (transfers in, open purchase orders). */
  inventoryPosition: number;
  orderCost: number;
  holdingCostPerUnitYear: number;
  pack: PackRule;
}

export interface ReorderPlan {
  /** Liners the order book takes within the lead time. */
  knownInLeadTime: number;
  /** Forecast use within the lead time: d̄·L. */
  forecastInLeadTime: number;
  safetyStock: number;
  z: number;
  reorderPoint: number;
  /** Liners a year: the order book's daily average over its length plus the forecast mean, × 365. */
  annualDemand: number;
  eoq: number;
  /** At or below the reorder point: order now. */
  reorderNow: boolean;
  /** Whole packs (0 when no order is due) that lift the position above the reorder point by at least the EOQ. */
  suggestedQuantity: number;
}

/**
 * Reorder point and order quantity from both parts of demand: ROP = known use within the lead time +
 * d̄·L + z·σd·√L, where d̄ and σd describe the forecast (unplanned) part only — the known part has no
 * spread. When the position is at or below it, order enough to lift the position to ROP + EOQ, rounded
 * to the supplier's packs and minimum.
 */
export function planReorder(i: ReorderPlanInput): ReorderPlan {
  finiteAtLeast('lead time in days', i.leadTimeDays, 0);
  finiteAtLeast('inventory position', i.inventoryPosition, -Infinity);
  const whole = Math.floor(i.leadTimeDays);
  const part = i.leadTimeDays - whole;
  let knownInLeadTime = 0;
  for (let d = 0; d < whole; d++) knownInLeadTime += i.demand.known[d] ?? 0;
  knownInLeadTime += part * (i.demand.known[whole] ?? 0);
  const z = zForServiceLevel(i.serviceLevel);
  const forecastInLeadTime = i.demand.forecast.mean * i.leadTimeDays;
  const safety = safetyStock({ meanDailyDemand: i.demand.forecast.mean, sdDailyDemand: i.demand.forecast.sd, leadTimeDays: i.leadTimeDays, serviceLevel: i.serviceLevel });
  const rop = knownInLeadTime + forecastInLeadTime + safety;
  const knownTotal = i.demand.known.reduce((s, v) => s + v, 0);
  const knownPerDay = i.demand.known.length ? knownTotal / i.demand.known.length : 0;
  const annualDemand = (knownPerDay + i.demand.forecast.mean) * 365;
  const q = eoq(annualDemand, i.orderCost, i.holdingCostPerUnitYear);
  const reorderNow = i.inventoryPosition <= rop && annualDemand > 0;
  const wanted = reorderNow ? rop + q - i.inventoryPosition : 0;
  return {
    knownInLeadTime,
    forecastInLeadTime,
    safetyStock: safety,
    z,
    reorderPoint: rop,
    annualDemand,
    eoq: q,
    reorderNow,
    suggestedQuantity: roundOrderQuantity(wanted, i.pack),
  };
}

// ---------------------------------------------------------------------------------------------------
// First expiry, first out

export interface StockLot {
  lotId: number;
  lotNumber: string;
  onHand: number;
  /** Last day a liner of the lot may be fitted. */
  expiryDate: LocalDate;
}

export interface LotProjection extends StockLot {
  /** Order of use (1 = first). */
  rank: number;
  /** The day the last liner of the lot is expected to be fitted; null when it expires first. */
  usedUpOn: LocalDate | null;
  /** Liners expected to be left when the lot expires (whole liners, rounded up). */
  atRisk: number;
  /** Within `soonDays` (60 unless told) of expiry today. */
  expiresSoon: boolean;
}

/**
 * Lots in first-expiry-first-out order (ties: lower lot id first), consumed day by day by the demand
 * (known + forecast mean): each day takes from the earliest-expiring lot still in date, then the next.
 * A lot still holding liners at the end of its expiry day is at risk by what it holds. Expired lots (expiry
 * before today) are at risk entirely.
 */
export function projectFefo(lots: StockLot[], demand: Demand, o: { today: LocalDate; soonDays?: number }): LotProjection[] {
  if (!isLocalDate(o.today)) throw new RangeError(`today must be a date 'YYYY-MM-DD'; got ${String(o.today)}.`);
  const soonDays = o.soonDays ?? 60;
  const order = [...lots].sort((a, b) => a.expiryDate.localeCompare(b.expiryDate) || a.lotId - b.lotId);
  const left = order.map((l) => {
    if (!isLocalDate(l.expiryDate)) throw new RangeError(`lot ${l.lotNumber}: expiry must be a date 'YYYY-MM-DD'.`);
    finiteAtLeast(`lot ${l.lotNumber} on hand`, l.onHand, 0);
    return l.onHand;
  });
  const usedUpOn: Array<LocalDate | null> = order.map(() => null);
  const lastDay = order.length ? daysBetween(o.today, order[order.length - 1]!.expiryDate) : -1;
  for (let day = 0; day <= lastDay; day++) {
    let need = demandOn(demand, day);
    if (need <= 0) {
      if (day >= demand.known.length) break; // nothing more will be used
      continue;
    }
    const date = addDays(o.today, day);
    for (let k = 0; k < order.length && need > 1e-12; k++) {
      if (left[k]! <= 1e-12 || order[k]!.expiryDate < date) continue;
      const take = Math.min(left[k]!, need);
      left[k]! -= take;
      need -= take;
      if (left[k]! <= 1e-9) {
        left[k] = 0;
        usedUpOn[k] ??= date;
      }
    }
  }
  return order.map((l, k) => ({
    ...l,
    rank: k + 1,
    usedUpOn: l.onHand === 0 ? null : usedUpOn[k]!,
    atRisk: left[k]! > 1e-9 ? Math.ceil(left[k]! - 1e-9) : 0,
    expiresSoon: daysBetween(o.today, l.expiryDate) <= soonDays,
  }));
}

// ---------------------------------------------------------------------------------------------------
// Liners at risk: a transfer to a depot that will use them in time

export interface DepotStockPicture {
  siteId: number;
  name: string;
  lots: StockLot[];
  demand: Demand;
}

export interface TransferProposal {
  toSiteId: number;
  toName: string;
  quantity: number;
  /** Liners that would expire across both depots without the transfer, less those with it. */
  saved: number;
}

const totalAtRisk = (lots: StockLot[], demand: Demand, today: LocalDate) => projectFefo(lots, demand, { today }).reduce((s, l) => s + l.atRisk, 0);

/**
 * Where to send `quantity` liners of `lot` that are projected to expire at their depot: each other depot is
 * projected FEFO with its own lots and demand, with and without the extra liners (usable on arrival,
 * `transferDays` ahead: the demand of the days before arrival cannot take them, so their expiry is read as
 * that much sooner). The depot where the fewest of them would still expire wins; the quantity is what it
 * would use in time. Null when no depot would use any of them in time (order less instead).
 */
export function proposeTransfer(lot: StockLot, quantity: number, others: DepotStockPicture[], o: { today: LocalDate; transferDays?: number }): TransferProposal | null {
  finiteAtLeast('liners at risk', quantity, 0);
  if (quantity === 0) return null;
  const lag = o.transferDays ?? 1;
  let best: TransferProposal | null = null;
  for (const d of others) {
    const before = totalAtRisk(d.lots, d.demand, o.today);
    // Arriving `lag` days later is like expiring `lag` days sooner for the receiving depot's days ahead.
    const sent: StockLot = { lotId: -lot.lotId, lotNumber: lot.lotNumber, onHand: quantity, expiryDate: addDays(lot.expiryDate, -lag) };
    const after = totalAtRisk([...d.lots, sent], d.demand, o.today);
    const used = Math.floor(quantity - (after - before) + 1e-9); // whole liners
    if (used > 0 && (!best || used > best.saved)) best = { toSiteId: d.siteId, toName: d.name, quantity: used, saved: used };
  }
  return best;
}
