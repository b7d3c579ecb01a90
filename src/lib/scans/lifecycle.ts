// The bin lifecycle rule table: which action is allowed from which status, by whom, where, and what it
// changes. Pure: no I/O. The scan service calls decide() inside its transaction, records any inferred
// steps before the real one, applies `patch` to the asset's snapshot and opens/closes the trip.
// A refusal carries a reason a yard hand can act on and changes nothing.

export const STATUSES = ['available', 'prepared', 'in_transit', 'on_hire', 'awaiting_collection', 'quarantine', 'in_repair', 'missing', 'retired'] as const;
export const ACTIONS = [
  'register',
  'receive',
  'prep_check',
  'fit_liner',
  'dispatch',
  'deliver',
  'fill_seal',
  'discharge',
  'fold',
  'collect',
  'quarantine',
  'send_to_repair',
  'release',
  'retire',
  'mark_missing',
  'mark_found',
  'inspect',
] as const;
import { ROLES, type Role } from '@/lib/permissions';
import { dueDatesOf, inspectionLabel, inspectionNeeded } from '@/lib/inspections/inspection-due';
export { ROLES, type Role };

export type Status = (typeof STATUSES)[number];
export type Action = (typeof ACTIONS)[number];
export type Leg = 'outbound' | 'return' | 'transfer';
export type SiteKind = 'depot' | 'customer' | 'repair' | 'recycling';

export interface BinState {
  status: Status | null; // null = not registered yet
  siteId: string | null; // null while on a truck (in_transit) or before registration
  siteKind: SiteKind | null;
  leg: Leg | null; // only meaningful while in_transit
  prepChecked: boolean; // passed a prep check since it last arrived at a depot
  linerLotId: string | null; // liner fitted and not yet used up
  filled: boolean; // filled and sealed, not yet discharged
  tripOpen: boolean;
  nextDue: string | null; // 'YYYY-MM-DD' next periodic test/inspection due; null = no periodic regime
  /**
   * Both due dates and the bin type's intervals, so a lapse refusal names the inspection that is needed
   * ("2.5-year", "5-year", "18-month" …). Optional: without it the refusal says "its periodic inspection".
   */
  inspection?: { intermediateDue: string; fullDue: string; intermediateMonths: number; fullMonths: number } | null;
  /** The test months and due dates a passed inspection sets (only ever in a patch; see `inspect`). */
  schedule?: Schedule | null;
}

/** A bin's test record as its columns keep it: the last tests done and the due dates they give. */
export interface Schedule {
  lastInspectionOn: string;
  lastLeakTestOn: string | null;
  lastFullInspectionOn: string | null;
  nextIntermediateDue: string;
  nextFullDue: string;
  nextDue: string;
}

/** What an inspection at the test bench found (the inspect action's input). */
export interface InspectionResult {
  kind: 'intermediate' | 'full' | 'after_repair';
  outcome: 'pass' | 'repair' | 'fail';
  /** The schedule after a pass, worked out by the caller from the clocks the test restarts; null when none moves. */
  scheduleAfter: Schedule | null;
}

export interface ActionContext {
  role: Role;
  today: string; // YYYY-MM-DD in the operator's zone
  siteId: string | null; // where the scan happens (null = entered at a desk, not scanned on site)
  siteKind: SiteKind | null;
  prepResult?: 'pass' | 'fail'; // prep_check only
  linerLotId?: string; // fit_liner only
  purpose?: 'hire' | 'transfer'; // dispatch only (transfer = move empties between depots, no trip)
  inspection?: InspectionResult; // inspect only
}

export type LotRefusalCode = 'lot_on_hold' | 'lot_recalled' | 'lot_expired';
export type RefusalCode =
  | 'role_not_allowed'
  | 'not_allowed_from_status'
  | 'already_registered'
  | 'already_here'
  | 'wrong_site_kind'
  | 'wrong_site' // records put the bin at another site and no missed scan explains it
  | 'inspection_lapsed'
  | 'prep_check_needed'
  | 'no_prep_result'
  | 'no_liner_lot'
  | 'no_inspection_result'
  | 'already_filled'
  | 'not_filled'
  | LotRefusalCode;

export type TripEffect = 'open' | 'close' | 'keep' | 'none';

export type Decision =
  | { ok: true; action: Action; from: Status | null; to: Status; inferred: Action[]; patch: Partial<BinState>; trip: TripEffect; flags: string[] }
  | { ok: false; action: Action; code: RefusalCode; reason: string };

// ---------------------------------------------------------------------------------------------------
// Words for the UI and for reasons.

export const STATUS_LABELS: Record<Status, string> = {
  available: 'Available',
  prepared: 'Prepared',
  in_transit: 'In transit',
  on_hire: 'On hire',
  awaiting_collection: 'Awaiting collection',
  quarantine: 'In quarantine',
  in_repair: 'In repair',
  missing: 'Missing',
  retired: 'Retired',
};

export const ACTION_LABELS: Record<Action, string> = {
  register: 'Register',
  receive: 'Receive at depot',
  prep_check: 'Prep check',
  fit_liner: 'Fit liner',
  dispatch: 'Dispatch',
  deliver: 'Confirm delivery',
  fill_seal: 'Fill and seal',
  discharge: 'Discharge',
  fold: 'Fold',
  collect: 'Collect',
  quarantine: 'Quarantine',
  send_to_repair: 'Send to repair',
  release: 'Release to service',
  retire: 'Retire',
  mark_missing: 'Mark missing',
  mark_found: 'Mark found',
  inspect: 'Record inspection',
};

/**
 * The status a skipped step would have left the bin in, recorded on inferred
 * log entries so the timeline reads in order.
 */
export const INFERRED_STATUS: Record<Action, Status> = {
  register: 'available',
  receive: 'available',
  prep_check: 'available',
  fit_liner: 'prepared',
  dispatch: 'in_transit',
  deliver: 'on_hire',
  fill_seal: 'on_hire',
  discharge: 'on_hire',
  fold: 'awaiting_collection',
  collect: 'in_transit',
  quarantine: 'quarantine',
  send_to_repair: 'in_repair',
  release: 'available',
  retire: 'retired',
  mark_missing: 'missing',
  mark_found: 'available',
  inspect: 'available',
};

const SITE_KIND_WORDS: Record<SiteKind, string> = {
  depot: 'a depot',
  customer: 'a customer site',
  repair: 'a repair shop',
  recycling: 'a recycling point',
};

// ---------------------------------------------------------------------------------------------------
// Who may record what. Customers record only what happens to a bin at their own sites; planners and
// admins may record anything (they correct and enter scans from a desk).

const ACTION_ROLES: Record<Action, readonly Role[]> = {
  register: ['planner', 'admin'],
  receive: ['yard', 'planner', 'admin'],
  prep_check: ['yard', 'planner', 'admin'],
  fit_liner: ['yard', 'planner', 'admin'],
  dispatch: ['yard', 'planner', 'admin'],
  deliver: ['yard', 'planner', 'admin', 'customer'],
  fill_seal: ['customer', 'planner', 'admin'],
  discharge: ['customer', 'planner', 'admin'],
  fold: ['yard', 'customer', 'planner', 'admin'],
  collect: ['yard', 'planner', 'admin'],
  quarantine: ['yard', 'planner', 'admin'],
  send_to_repair: ['yard', 'planner', 'admin'],
  release: ['planner', 'admin'],
  retire: ['planner', 'admin'],
  mark_missing: ['planner', 'admin'],
  mark_found: ['yard', 'planner', 'admin'],
  inspect: ['yard', 'planner', 'admin'],
};

// ---------------------------------------------------------------------------------------------------
// Rule helpers.

type Refusal = { code: RefusalCode; reason: string };
type Move = { to: Status; inferred?: Action[]; patch?: Partial<BinState>; trip: TripEffect; flags?: string[] };
type Outcome = Refusal | Move;
type Registered = BinState & { status: Status };

const isRefusal = (o: unknown): o is Refusal => typeof o === 'object' && o !== null && 'code' in o;

/** A periodic test is lapsed from the day after its due date (the due date itself is still inside it). */
export function isInspectionLapsed(nextDue: string | null, today: string): boolean {
  return nextDue !== null && nextDue < today; // ISO dates compare as strings
}

// ADR/RID 4.1.2.2: an IBC may not be filled or offered for carriage after its periodic test has
// lapsed. Lining and hire dispatch are refused for the same reason (the only point of either is a fill).
function lapsedRefusal(s: BinState, today: string): Refusal | null {
  if (!isInspectionLapsed(s.nextDue, today)) return null;
  const i = s.inspection;
  const label = i ? inspectionLabel(inspectionNeeded(dueDatesOf(i.intermediateDue, i.fullDue), today), i) : null;
  // "an 8-year", "an 11-month", "an 18-month": the article follows the spoken number.
  const book = label ? `${/^(8|11-|18-)/.test(label) ? 'an' : 'a'} ${label} inspection` : 'its periodic inspection';
  return {
    code: 'inspection_lapsed',
    reason: `Periodic test lapsed on ${s.nextDue}; book ${book}. A bin may not be lined, filled or dispatched for hire after its test has lapsed.`,
  };
}

// What to do instead, by status, when an action does not fit it.
const NEXT_STEP: Record<Status, string> = {
  available: 'prep check it and fit a liner to prepare it',
  prepared: 'dispatch it, or fold it to take the liner out',
  in_transit: 'receive it at a depot, or confirm delivery at the customer',
  on_hire: 'it is with the customer; receive it when it comes back to a depot',
  awaiting_collection: 'collect it, or receive it at a depot',
  quarantine: 'send it to repair, or have a planner release it',
  in_repair: 'have a planner release it when the repair is done',
  missing: 'mark it found, or receive it at a depot',
  retired: 'a retired bin has left the pool and nothing more can be recorded for it',
};

// Sharper advice where the default would mislead.
const NEXT_STEP_FOR: Partial<Record<`${Action}:${Status}`, string>> = {
  'receive:prepared': 'it is already at a depot and lined; dispatch it, or fold it to take the liner out',
  'receive:quarantine': 'it is already held at a depot; send it to repair, or have a planner release it',
  'prep_check:prepared': 'it is already checked and lined; fold it first to check it again',
  'fit_liner:prepared': 'it already has a liner',
  'dispatch:available': 'prep check it and fit a liner first, or dispatch it as a transfer of empties',
  'fold:available': 'it is already folded',
  'fold:awaiting_collection': 'it is already folded and waiting for collection',
  'fill_seal:awaiting_collection': 'it has been folded and its liner is spent; it needs a new liner at a depot',
  'fill_seal:prepared': 'dispatch it and confirm delivery first',
  'send_to_repair:available': 'quarantine it first',
  'send_to_repair:prepared': 'quarantine it first',
  'retire:prepared': 'fold it first to take the liner out',
  'inspect:prepared': 'take the liner out first (fold it), then test it',
  'inspect:in_transit': 'receive it at a depot first',
  'inspect:on_hire': 'it is with the customer; test it when it is back at a depot',
  'inspect:awaiting_collection': 'it is waiting at the customer; test it when it is back at a depot',
  'inspect:missing': 'mark it found first',
};

function wrongStatus(action: Action, s: BinState, advice?: string): Refusal {
  const words = s.status === null ? 'not registered' : STATUS_LABELS[s.status].toLowerCase();
  const todo = advice ?? (s.status === null ? 'register it first' : (NEXT_STEP_FOR[`${action}:${s.status}`] ?? NEXT_STEP[s.status]));
  return { code: 'not_allowed_from_status', reason: `${ACTION_LABELS[action]} is not possible while the bin is ${words}: ${todo}.` };
}

function wrongSiteKind(action: Action, ctx: ActionContext, where: string, advice = ''): Refusal {
  const here = ctx.siteKind === null ? 'no site' : SITE_KIND_WORDS[ctx.siteKind];
  return { code: 'wrong_site_kind', reason: `${ACTION_LABELS[action]} is recorded at ${where}; this scan is at ${here}.${advice && ` ${advice}`}` };
}

/** No trip change: an open trip stays open, otherwise there is none. */
const keepTrip = (s: BinState): TripEffect => (s.tripOpen ? 'keep' : 'none');

// Arrival at a depot (receive, or a find at a depot): the bin is folded and empty, needs a fresh prep
// check, and any liner is gone (a trip's liner is used up; a bin arriving from anywhere is relined).
function arrivalPatch(ctx: ActionContext): Partial<BinState> {
  return { siteId: ctx.siteId, siteKind: 'depot', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false };
}

function arrive(s: BinState, ctx: ActionContext, inferred: Action[]): Move {
  // The return to a depot closes the rotation; a transfer leg never opened one, so it closes nothing.
  return { to: 'available', inferred, patch: arrivalPatch(ctx), trip: s.tripOpen ? 'close' : 'none' };
}

// Depot work (prep, lining, quarantine, dispatch, folding a lined bin) happens where the bin is. A folded
// empty recorded at another depot was evidently moved without a scan: its arrival here is inferred.
// A lined bin cannot have travelled unrecorded, so that is a records problem for a planner.
function atThisDepot(action: Action, s: Registered, ctx: ActionContext): Refusal | { inferred: Action[]; patch: Partial<BinState> } {
  if (ctx.siteKind !== 'depot') return wrongSiteKind(action, ctx, 'a depot');
  if (s.siteId === ctx.siteId) return { inferred: [], patch: {} };
  if (s.status === 'available') return { inferred: ['receive'], patch: arrivalPatch(ctx) };
  return {
    code: 'wrong_site',
    reason: `Records put this ${STATUS_LABELS[s.status].toLowerCase()} bin at another site; ask a planner to correct its location.`,
  };
}

// A bin on hire may move between the customer's own sites (filled at one, emptied at another): a scan
// at a customer site moves it there; an entry from a desk (no site) leaves it where it is.
function atCustomer(action: Action, ctx: ActionContext): Refusal | Partial<BinState> {
  if (ctx.siteKind === null) return {};
  if (ctx.siteKind !== 'customer') return wrongSiteKind(action, ctx, 'a customer site');
  return { siteId: ctx.siteId, siteKind: 'customer' };
}

/** Steps skipped between "on hire" and "folded, waiting": discharge when it still holds product, then fold. */
const emptyAndFold = (s: BinState): Action[] => (s.filled ? ['discharge', 'fold'] : ['fold']);

// What a missing bin's last known state implies once it turns up at a depot: found where it was last
// seen, then whatever brings it home from there (a filled bin was emptied, folded and collected; an
// empty one last seen at a customer was collected). Last seen at a depot or on a truck: nothing more.
function stepsHomeFromLastSeen(s: BinState): Action[] {
  if (s.filled) return ['discharge', 'fold', 'collect'];
  if (s.siteKind === 'customer') return ['collect'];
  return [];
}

// ---------------------------------------------------------------------------------------------------
// The rules, one per action. Each starts from a registered, not-retired bin whose role was checked.

type Rule = (s: Registered, ctx: ActionContext) => Outcome;

const RULES: Record<Exclude<Action, 'register'>, Rule> = {
  inspect,

  // Arrival at a depot, also the return that closes a trip. A bin the yard never saw collected is
  // accepted: the missed steps are inferred in cycle order and flagged for a planner.
  receive(s, ctx) {
    const from = s.status;
    if (!['in_transit', 'awaiting_collection', 'on_hire', 'missing', 'available'].includes(from)) return wrongStatus('receive', s);
    if (ctx.siteKind !== 'depot') return wrongSiteKind('receive', ctx, 'a depot');
    if (from === 'available' && s.siteId === ctx.siteId) {
      return { code: 'already_here', reason: 'This bin is already recorded as available at this depot.' };
    }
    if (from === 'awaiting_collection') return arrive(s, ctx, ['collect']);
    if (from === 'on_hire') return arrive(s, ctx, [...emptyAndFold(s), 'collect']);
    if (from === 'missing') return arrive(s, ctx, ['mark_found', ...stepsHomeFromLastSeen(s)]);
    return arrive(s, ctx, []); // in_transit on any leg, or a folded empty moved from another depot
  },

  // A condition check of the opened bin (walls, floor, valve). Allowed after the periodic test has
  // lapsed: it is not a use. A fail sends the bin to quarantine in the same step.
  prep_check(s, ctx) {
    if (s.status !== 'available') return wrongStatus('prep_check', s);
    const here = atThisDepot('prep_check', s, ctx);
    if (isRefusal(here)) return here;
    if (ctx.prepResult === undefined) return { code: 'no_prep_result', reason: 'Record whether the prep check passed or failed.' };
    if (ctx.prepResult === 'fail') {
      return { to: 'quarantine', inferred: here.inferred, patch: { ...here.patch, prepChecked: false, linerLotId: null }, trip: keepTrip(s) };
    }
    return { to: 'available', inferred: here.inferred, patch: { ...here.patch, prepChecked: true }, trip: keepTrip(s) };
  },

  // Only a prep-checked bin inside its test interval is lined. Which lots may be used is
  // checkLinerLot's job; here the lot only has to be named.
  fit_liner(s, ctx) {
    if (s.status !== 'available') return wrongStatus('fit_liner', s);
    const here = atThisDepot('fit_liner', s, ctx);
    if (isRefusal(here)) return here;
    const lapsed = lapsedRefusal(s, ctx.today);
    if (lapsed) return lapsed;
    const checkedHere = here.inferred.length === 0 && s.prepChecked; // an inferred arrival resets the check
    if (!checkedHere) return { code: 'prep_check_needed', reason: 'Run the prep check on this bin before fitting a liner.' };
    if (!ctx.linerLotId) return { code: 'no_liner_lot', reason: 'Choose the liner lot the liner comes from.' };
    return { to: 'prepared', inferred: here.inferred, patch: { ...here.patch, linerLotId: ctx.linerLotId }, trip: keepTrip(s) };
  },

  // Hire: a prepared bin leaves on a load and a trip opens. Transfer: folded empties are repositioned
  // between depots; no trip, and allowed after the test has lapsed (ADR/RID 4.1.2.2 lets an empty IBC
  // travel to be tested). No purpose given means hire, the stricter of the two.
  dispatch(s, ctx) {
    const purpose = ctx.purpose ?? 'hire';
    const leaving = (leg: Leg): Partial<BinState> => ({ leg, siteId: null, siteKind: null, prepChecked: false });
    if (purpose === 'transfer') {
      if (s.status !== 'available') {
        return wrongStatus('dispatch', s, s.status === 'prepared' ? 'a transfer moves folded empties; fold it first, or dispatch it for hire' : undefined);
      }
      const here = atThisDepot('dispatch', s, ctx);
      if (isRefusal(here)) return here;
      return { to: 'in_transit', inferred: here.inferred, patch: { ...here.patch, ...leaving('transfer') }, trip: keepTrip(s) };
    }
    if (s.status !== 'prepared') return wrongStatus('dispatch', s);
    const here = atThisDepot('dispatch', s, ctx);
    if (isRefusal(here)) return here;
    const lapsed = lapsedRefusal(s, ctx.today);
    if (lapsed) return lapsed;
    return { to: 'in_transit', patch: { ...leaving('outbound'), tripOpen: true }, trip: 'open' };
  },

  // Delivery confirmed at the customer's site. A prepared bin confirmed there was evidently dispatched
  // without a scan: the dispatch is inferred (and flagged if its test had lapsed, since it should not
  // have left; refusing the delivery would not bring it back).
  deliver(s, ctx) {
    const outbound = s.status === 'in_transit' && s.leg === 'outbound';
    if (!outbound && s.status !== 'prepared') {
      return wrongStatus('deliver', s, s.status === 'in_transit' ? 'it is travelling back to a depot; receive it there' : undefined);
    }
    if (ctx.siteKind !== 'customer') return wrongSiteKind('deliver', ctx, 'a customer site');
    const patch: Partial<BinState> = { siteId: ctx.siteId, siteKind: 'customer', leg: null, prepChecked: false, tripOpen: true };
    if (outbound) return { to: 'on_hire', patch, trip: s.tripOpen ? 'keep' : 'open' };
    const flags = isInspectionLapsed(s.nextDue, ctx.today) ? ['inspection_lapsed'] : [];
    return { to: 'on_hire', inferred: ['dispatch'], patch, trip: 'open', flags };
  },

  // Filling and fitting the tamper-evident seals. Never after the periodic test has lapsed (ADR/RID
  // 4.1.2.2). A bin filled at the customer but never confirmed delivered: the delivery is inferred.
  fill_seal(s, ctx) {
    const outbound = s.status === 'in_transit' && s.leg === 'outbound';
    if (s.status !== 'on_hire' && !outbound) return wrongStatus('fill_seal', s);
    if (outbound && ctx.siteKind !== 'customer') return wrongSiteKind('fill_seal', ctx, 'a customer site');
    const site = atCustomer('fill_seal', ctx);
    if (isRefusal(site)) return site;
    if (s.filled) return { code: 'already_filled', reason: 'This bin is already filled and sealed; discharge it before it can be filled again.' };
    const lapsed = lapsedRefusal(s, ctx.today);
    if (lapsed) return lapsed;
    if (outbound) return { to: 'on_hire', inferred: ['deliver'], patch: { ...site, leg: null, prepChecked: false, filled: true }, trip: keepTrip(s) };
    return { to: 'on_hire', patch: { ...site, filled: true }, trip: keepTrip(s) };
  },

  // Seal check and draining at the receiving site. A bin filled before its test lapsed may still be
  // carried and emptied (ADR/RID 4.1.2.2), so no lapse check here.
  discharge(s, ctx) {
    if (s.status !== 'on_hire') return wrongStatus('discharge', s);
    const site = atCustomer('discharge', ctx);
    if (isRefusal(site)) return site;
    if (!s.filled) return { code: 'not_filled', reason: 'This bin is not recorded as filled; there is nothing to discharge.' };
    return { to: 'on_hire', patch: { ...site, filled: false }, trip: keepTrip(s) };
  },

  // Folding flat. At the customer it ends the use (the spent liner comes out; a still-filled bin must
  // have been discharged first, which is inferred). At a depot it undoes a preparation: liner out, and
  // the bin needs a new prep check before it is lined again.
  fold(s, ctx) {
    if (s.status === 'on_hire') {
      const site = atCustomer('fold', ctx);
      if (isRefusal(site)) return site;
      return { to: 'awaiting_collection', inferred: s.filled ? ['discharge'] : [], patch: { ...site, filled: false, linerLotId: null }, trip: keepTrip(s) };
    }
    if (s.status === 'prepared') {
      const here = atThisDepot('fold', s, ctx);
      if (isRefusal(here)) return here;
      return { to: 'available', patch: { linerLotId: null, prepChecked: false }, trip: keepTrip(s) };
    }
    return wrongStatus('fold', s);
  },

  // Pick-up of folded empties at the customer's site (or entered from a desk). A bin still on hire was
  // evidently emptied and folded without a scan: those steps are inferred.
  collect(s, ctx) {
    if (s.status !== 'awaiting_collection' && s.status !== 'on_hire') return wrongStatus('collect', s);
    if (ctx.siteKind !== null && ctx.siteKind !== 'customer') {
      return wrongSiteKind('collect', ctx, "the customer's site", ctx.siteKind === 'depot' ? 'At a depot, receive it instead.' : '');
    }
    const inferred = s.status === 'on_hire' ? emptyAndFold(s) : [];
    return { to: 'in_transit', inferred, patch: { leg: 'return', siteId: null, siteKind: null, filled: false, linerLotId: null }, trip: keepTrip(s) };
  },

  // Held aside at a depot (damage, contamination, a doubtful check); any liner comes out.
  quarantine(s, ctx) {
    if (s.status !== 'available' && s.status !== 'prepared') {
      const advice = s.status === 'quarantine' ? 'it is already in quarantine' : s.status === 'in_repair' ? NEXT_STEP.in_repair : 'receive it at a depot first';
      return wrongStatus('quarantine', s, advice);
    }
    const here = atThisDepot('quarantine', s, ctx);
    if (isRefusal(here)) return here;
    return { to: 'quarantine', inferred: here.inferred, patch: { ...here.patch, linerLotId: null, prepChecked: false }, trip: keepTrip(s) };
  },

  // Only a quarantined bin goes to repair. Recorded at the depot (in-house repair) or at the repair
  // shop; scanned at a repair shop, the bin is recorded there.
  send_to_repair(s, ctx) {
    if (s.status !== 'quarantine') return wrongStatus('send_to_repair', s);
    if (ctx.siteKind === 'customer' || ctx.siteKind === 'recycling') return wrongSiteKind('send_to_repair', ctx, 'a depot or a repair shop');
    const patch: Partial<BinState> = ctx.siteKind === null ? {} : { siteId: ctx.siteId, siteKind: ctx.siteKind };
    return { to: 'in_repair', patch, trip: keepTrip(s) };
  },

  // A planner's decision, usually from a desk: the bin is cleared (or repaired) and usable again where it
  // stands. Released at a repair shop it is received at a depot later like any moved empty.
  release(s) {
    if (s.status !== 'quarantine' && s.status !== 'in_repair') return wrongStatus('release', s);
    return { to: 'available', patch: { prepChecked: false, linerLotId: null, filled: false }, trip: keepTrip(s) };
  },

  // Out of the pool for good (scrapped, sold, written off as lost). A lost bin's open trip closes, so
  // the hire can be settled (lost-bin charge).
  retire(s) {
    if (!['available', 'quarantine', 'in_repair', 'missing'].includes(s.status)) {
      return wrongStatus('retire', s, NEXT_STEP_FOR[`retire:${s.status}`] ?? 'bring it back to a depot first, or mark it missing');
    }
    return { to: 'retired', patch: { tripOpen: false }, trip: s.tripOpen ? 'close' : 'none' };
  },

  // Unaccounted for. The last known site, leg and fill stay on the snapshot: they say where to look,
  // and what its finding implies.
  mark_missing(s) {
    if (!['available', 'in_transit', 'on_hire', 'awaiting_collection'].includes(s.status)) return wrongStatus('mark_missing', s);
    return { to: 'missing', patch: {}, trip: keepTrip(s) };
  },

  // Found at a depot: it arrives there (the trip closes; the way home from where it was last seen is
  // inferred). Found at a customer site: waiting for collection, or still on hire when it holds product.
  mark_found(s, ctx) {
    if (s.status !== 'missing') return wrongStatus('mark_found', s, 'it is not marked missing');
    if (ctx.siteKind === 'depot') return arrive(s, ctx, stepsHomeFromLastSeen(s));
    if (ctx.siteKind !== 'customer') return wrongSiteKind('mark_found', ctx, 'a depot or a customer site');
    const site = { siteId: ctx.siteId, siteKind: 'customer' as const, leg: null };
    if (s.filled) return { to: 'on_hire', patch: site, trip: keepTrip(s) };
    return { to: 'awaiting_collection', patch: { ...site, linerLotId: null }, trip: keepTrip(s) };
  },
};

// The periodic inspection and test, or the test after a repair, at the test bench (a depot or the repair
// shop), or entered from a desk by a planner from an outside inspection body's report. Allowed after the
// test has lapsed: that is when it is needed (an empty IBC may travel to its test, ADR/RID 4.1.2.2).
// A pass moves the due dates (only the clocks the test covers; the caller works them out); an after-repair
// pass puts a quarantined or repaired bin back in service. A repair or fail outcome quarantines the bin
// (a bin already in repair stays there), liner out.
function inspect(s: Registered, ctx: ActionContext): Outcome {
  if (!['available', 'quarantine', 'in_repair'].includes(s.status)) return wrongStatus('inspect', s);
  if (ctx.siteKind === 'customer' || ctx.siteKind === 'recycling') return wrongSiteKind('inspect', ctx, 'a depot or a repair shop');
  if (ctx.siteKind === null && ctx.role === 'yard') return wrongSiteKind('inspect', ctx, 'a depot or a repair shop');
  let inferred: Action[] = [];
  let patch: Partial<BinState> = ctx.siteKind === null ? {} : { siteId: ctx.siteId, siteKind: ctx.siteKind };
  if (s.status === 'available' && ctx.siteKind === 'depot') {
    const here = atThisDepot('inspect', s, ctx);
    if (isRefusal(here)) return here;
    inferred = here.inferred;
    patch = here.patch;
  }
  const r = ctx.inspection;
  if (!r) return { code: 'no_inspection_result', reason: 'Record what the inspection found: pass, needs repair or fail.' };
  if (r.outcome !== 'pass') {
    const to: Status = s.status === 'in_repair' ? 'in_repair' : 'quarantine';
    return { to, inferred, patch: { ...patch, prepChecked: false, linerLotId: null }, trip: keepTrip(s) };
  }
  const moved = r.scheduleAfter ? { schedule: r.scheduleAfter, nextDue: r.scheduleAfter.nextDue } : {};
  const backInService = r.kind === 'after_repair' && s.status !== 'available';
  return { to: backInService ? 'available' : s.status, inferred, patch: { ...patch, ...moved, ...(backInService ? { prepChecked: false } : {}) }, trip: keepTrip(s) };
}

// Registration puts a new bin into the pool, folded and empty, at a depot.
function register(s: BinState, ctx: ActionContext): Outcome {
  if (s.status !== null) return { code: 'already_registered', reason: `This bin is already registered (${STATUS_LABELS[s.status].toLowerCase()}).` };
  if (ctx.siteKind !== 'depot') return wrongSiteKind('register', ctx, 'a depot');
  return { to: 'available', patch: { ...arrivalPatch(ctx) }, trip: 'none' };
}

// ---------------------------------------------------------------------------------------------------

/** Decide whether `action` may be recorded on a bin in `state`, and what it changes. */
export function decide(state: BinState, action: Action, ctx: ActionContext): Decision {
  const outcome = evaluate(state, action, ctx);
  if (isRefusal(outcome)) return { ok: false, action, ...outcome };
  const inferred = outcome.inferred ?? [];
  const flags = [...(inferred.length > 0 ? ['inferred_steps'] : []), ...(outcome.flags ?? [])];
  return { ok: true, action, from: state.status, to: outcome.to, inferred, patch: { ...outcome.patch, status: outcome.to }, trip: outcome.trip, flags };
}

function evaluate(s: BinState, action: Action, ctx: ActionContext): Outcome {
  if (!ACTION_ROLES[action].includes(ctx.role)) {
    return { code: 'role_not_allowed', reason: `A ${ctx.role} user cannot record "${ACTION_LABELS[action]}".` };
  }
  // Customers record only what happens at their own sites (or through the portal, with no site).
  if (ctx.role === 'customer' && ctx.siteKind !== null && ctx.siteKind !== 'customer') {
    return { code: 'role_not_allowed', reason: `A customer user records actions only at the customer's own sites, not at ${SITE_KIND_WORDS[ctx.siteKind]}.` };
  }
  if (action === 'register') return register(s, ctx);
  if (s.status === null || s.status === 'retired') return wrongStatus(action, s); // retired is terminal
  return RULES[action](s as Registered, ctx);
}

// Any plausible value for the inputs a button does not know yet, so the page can offer the action.
const BUTTON_PROBES: Partial<Record<Action, Partial<ActionContext>[]>> = {
  prep_check: [{ prepResult: 'pass' }],
  fit_liner: [{ linerLotId: '(chosen on the next screen)' }],
  dispatch: [{ purpose: 'hire' }, { purpose: 'transfer' }],
  inspect: [{ inspection: { kind: 'intermediate', outcome: 'pass', scheduleAfter: null } }],
};

/** The actions this user may record on this bin here and now: the bin page's buttons. */
export function allowedActions(state: BinState, ctx: Omit<ActionContext, 'prepResult' | 'linerLotId' | 'purpose' | 'inspection'>): Action[] {
  return ACTIONS.filter((action) => (BUTTON_PROBES[action] ?? [{}]).some((probe) => decide(state, action, { ...ctx, ...probe }).ok));
}

/**
 * May a liner from this lot be fitted today? A recall outranks a hold, which outranks expiry; a lot is
 * usable up to and including its expiry date.
 */
export function checkLinerLot(
  lot: { status: 'released' | 'on_hold' | 'recalled'; expiryDate: string; lotNumber: string },
  today: string,
): { ok: true } | { ok: false; code: LotRefusalCode; reason: string } {
  if (lot.status === 'recalled') {
    return { ok: false, code: 'lot_recalled', reason: `Liner lot ${lot.lotNumber} has been recalled; take a liner from another lot.` };
  }
  if (lot.status === 'on_hold') {
    return { ok: false, code: 'lot_on_hold', reason: `Liner lot ${lot.lotNumber} is on hold; take a liner from another lot.` };
  }
  if (lot.expiryDate < today) {
    return { ok: false, code: 'lot_expired', reason: `Liner lot ${lot.lotNumber} expired on ${lot.expiryDate}; take a liner from another lot.` };
  }
  return { ok: true };
}
