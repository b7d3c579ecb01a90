import { describe, test, expect } from 'vitest';
import { ACTIONS, ACTION_LABELS, ROLES, STATUSES, STATUS_LABELS, allowedActions, checkLinerLot, decide, isInspectionLapsed } from '@/lib/scans/lifecycle';
import type { Action, ActionContext, BinState, Role, Status } from '@/lib/scans/lifecycle';

// Every expected outcome below is written out by hand: the rule table in src/lib/scans/lifecycle.ts is the
// thing under test, never the source of an expectation. The lifecycle follows the trip in the design
// brief (depot prep → dispatch → on hire → fill and seal → discharge → fold → collect → receive).

const TODAY = '2026-05-04';
const NOT_DUE = '2027-06-30'; // next periodic test far ahead: nothing is lapsed in the main table

// One fixed baseline state per status. D1 and D2 are depots, C1 and C2 customer sites, R1 a repair shop.
const BASE: Record<Status | 'unregistered', BinState> = {
  unregistered: { status: null, siteId: null, siteKind: null, leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false, nextDue: null },
  available: { status: 'available', siteId: 'D1', siteKind: 'depot', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false, nextDue: NOT_DUE },
  prepared: { status: 'prepared', siteId: 'D1', siteKind: 'depot', leg: null, prepChecked: true, linerLotId: 'LOT-A', filled: false, tripOpen: false, nextDue: NOT_DUE },
  in_transit: { status: 'in_transit', siteId: null, siteKind: null, leg: 'outbound', prepChecked: false, linerLotId: 'LOT-A', filled: false, tripOpen: true, nextDue: NOT_DUE },
  on_hire: { status: 'on_hire', siteId: 'C1', siteKind: 'customer', leg: null, prepChecked: false, linerLotId: 'LOT-A', filled: false, tripOpen: true, nextDue: NOT_DUE },
  awaiting_collection: {
    status: 'awaiting_collection',
    siteId: 'C1',
    siteKind: 'customer',
    leg: null,
    prepChecked: false,
    linerLotId: null,
    filled: false,
    tripOpen: true,
    nextDue: NOT_DUE,
  },
  quarantine: { status: 'quarantine', siteId: 'D1', siteKind: 'depot', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false, nextDue: NOT_DUE },
  in_repair: { status: 'in_repair', siteId: 'D1', siteKind: 'depot', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false, nextDue: NOT_DUE },
  // last seen empty at customer C1 during an open trip
  missing: { status: 'missing', siteId: 'C1', siteKind: 'customer', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: true, nextDue: NOT_DUE },
  retired: { status: 'retired', siteId: 'D1', siteKind: 'depot', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false, nextDue: NOT_DUE },
};

const at = (role: Role, siteId: string | null, siteKind: ActionContext['siteKind'], extra: Partial<ActionContext> = {}): ActionContext => ({
  role,
  today: TODAY,
  siteId,
  siteKind,
  ...extra,
});
const DESK = (role: Role = 'planner') => at(role, null, null);

// Where and by whom each action is scanned in the main table: always a role allowed to do it.
// `fold` is scanned where the bin is (a prepared bin folds at its depot, an on-hire bin at the customer).
function scanFor(action: Action, state: BinState): ActionContext {
  switch (action) {
    case 'register':
      return at('planner', 'D1', 'depot');
    case 'receive':
      return at('yard', 'D2', 'depot'); // arrival at another depot than D1
    case 'prep_check':
      return at('yard', 'D1', 'depot', { prepResult: 'pass' });
    case 'fit_liner':
      return at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' });
    case 'dispatch':
      return at('yard', 'D1', 'depot', { purpose: 'hire' });
    case 'deliver':
      return at('customer', 'C1', 'customer');
    case 'fill_seal':
      return at('customer', 'C1', 'customer');
    case 'discharge':
      return at('customer', 'C1', 'customer');
    case 'fold':
      return at('yard', state.siteId, state.siteKind);
    case 'collect':
      return at('yard', 'C1', 'customer');
    case 'quarantine':
      return at('yard', 'D1', 'depot');
    case 'send_to_repair':
      return at('yard', 'D1', 'depot');
    case 'release':
      return DESK();
    case 'retire':
      return DESK();
    case 'mark_missing':
      return DESK();
    case 'mark_found':
      return at('yard', 'D1', 'depot');
    case 'inspect':
      return at('yard', 'D1', 'depot', { inspection: PASS_2_5 });
  }
}

// A passed 2.5-year inspection with a leakproofness test, and the schedule the scan service works out for it.
const SCHEDULE = {
  lastInspectionOn: TODAY,
  lastLeakTestOn: TODAY,
  lastFullInspectionOn: null,
  nextIntermediateDue: '2028-11-30',
  nextFullDue: '2029-01-31',
  nextDue: '2028-11-30',
};
const PASS_2_5 = { kind: 'intermediate' as const, outcome: 'pass' as const, scheduleAfter: SCHEDULE };

type Expect = `REFUSED:${string}` | [to: Status, inferred: Action[], trip: 'open' | 'close' | 'keep' | 'none'];
type Row = [from: Status | 'unregistered', action: Action, expected: Expect];
const NO = 'REFUSED:not_allowed_from_status' as const;

// prettier-ignore
const MAIN_TABLE: Row[] = [
  // not registered yet: only registration
  ['unregistered', 'register', ['available', [], 'none']],
  ['unregistered', 'receive', NO],
  ['unregistered', 'prep_check', NO],
  ['unregistered', 'fit_liner', NO],
  ['unregistered', 'dispatch', NO],
  ['unregistered', 'deliver', NO],
  ['unregistered', 'fill_seal', NO],
  ['unregistered', 'discharge', NO],
  ['unregistered', 'fold', NO],
  ['unregistered', 'collect', NO],
  ['unregistered', 'quarantine', NO],
  ['unregistered', 'send_to_repair', NO],
  ['unregistered', 'release', NO],
  ['unregistered', 'retire', NO],
  ['unregistered', 'mark_missing', NO],
  ['unregistered', 'mark_found', NO],
  ['unregistered', 'inspect', NO],

  // available: folded at D1, not yet prep-checked
  ['available', 'register', 'REFUSED:already_registered'],
  ['available', 'receive', ['available', [], 'none']], // a move from D1 to D2
  ['available', 'prep_check', ['available', [], 'none']],
  ['available', 'fit_liner', 'REFUSED:prep_check_needed'],
  ['available', 'dispatch', NO], // hire needs a prepared bin
  ['available', 'deliver', NO],
  ['available', 'fill_seal', NO],
  ['available', 'discharge', NO],
  ['available', 'fold', NO], // already folded
  ['available', 'collect', NO],
  ['available', 'quarantine', ['quarantine', [], 'none']],
  ['available', 'send_to_repair', NO],
  ['available', 'release', NO],
  ['available', 'retire', ['retired', [], 'none']],
  ['available', 'mark_missing', ['missing', [], 'none']],
  ['available', 'mark_found', NO],
  ['available', 'inspect', ['available', [], 'none']],

  // prepared: lined at D1
  ['prepared', 'register', 'REFUSED:already_registered'],
  ['prepared', 'receive', NO],
  ['prepared', 'prep_check', NO],
  ['prepared', 'fit_liner', NO],
  ['prepared', 'dispatch', ['in_transit', [], 'open']],
  ['prepared', 'deliver', ['on_hire', ['dispatch'], 'open']], // dispatch scan was missed
  ['prepared', 'fill_seal', NO],
  ['prepared', 'discharge', NO],
  ['prepared', 'fold', ['available', [], 'none']], // liner taken out again
  ['prepared', 'collect', NO],
  ['prepared', 'quarantine', ['quarantine', [], 'none']],
  ['prepared', 'send_to_repair', NO],
  ['prepared', 'release', NO],
  ['prepared', 'retire', NO],
  ['prepared', 'mark_missing', NO],
  ['prepared', 'mark_found', NO],
  ['prepared', 'inspect', NO],

  // in_transit: outbound to a customer, trip open
  ['in_transit', 'register', 'REFUSED:already_registered'],
  ['in_transit', 'receive', ['available', [], 'close']], // came back undelivered
  ['in_transit', 'prep_check', NO],
  ['in_transit', 'fit_liner', NO],
  ['in_transit', 'dispatch', NO],
  ['in_transit', 'deliver', ['on_hire', [], 'keep']],
  ['in_transit', 'fill_seal', ['on_hire', ['deliver'], 'keep']], // delivery confirmation was missed
  ['in_transit', 'discharge', NO],
  ['in_transit', 'fold', NO],
  ['in_transit', 'collect', NO],
  ['in_transit', 'quarantine', NO],
  ['in_transit', 'send_to_repair', NO],
  ['in_transit', 'release', NO],
  ['in_transit', 'retire', NO],
  ['in_transit', 'mark_missing', ['missing', [], 'keep']],
  ['in_transit', 'mark_found', NO],
  ['in_transit', 'inspect', NO],

  // on_hire: at customer C1, not filled, trip open
  ['on_hire', 'register', 'REFUSED:already_registered'],
  ['on_hire', 'receive', ['available', ['fold', 'collect'], 'close']],
  ['on_hire', 'prep_check', NO],
  ['on_hire', 'fit_liner', NO],
  ['on_hire', 'dispatch', NO],
  ['on_hire', 'deliver', NO],
  ['on_hire', 'fill_seal', ['on_hire', [], 'keep']],
  ['on_hire', 'discharge', 'REFUSED:not_filled'],
  ['on_hire', 'fold', ['awaiting_collection', [], 'keep']],
  ['on_hire', 'collect', ['in_transit', ['fold'], 'keep']],
  ['on_hire', 'quarantine', NO],
  ['on_hire', 'send_to_repair', NO],
  ['on_hire', 'release', NO],
  ['on_hire', 'retire', NO],
  ['on_hire', 'mark_missing', ['missing', [], 'keep']],
  ['on_hire', 'mark_found', NO],
  ['on_hire', 'inspect', NO],

  // awaiting_collection: folded at customer C1, trip open
  ['awaiting_collection', 'register', 'REFUSED:already_registered'],
  ['awaiting_collection', 'receive', ['available', ['collect'], 'close']],
  ['awaiting_collection', 'prep_check', NO],
  ['awaiting_collection', 'fit_liner', NO],
  ['awaiting_collection', 'dispatch', NO],
  ['awaiting_collection', 'deliver', NO],
  ['awaiting_collection', 'fill_seal', NO],
  ['awaiting_collection', 'discharge', NO],
  ['awaiting_collection', 'fold', NO],
  ['awaiting_collection', 'collect', ['in_transit', [], 'keep']],
  ['awaiting_collection', 'quarantine', NO],
  ['awaiting_collection', 'send_to_repair', NO],
  ['awaiting_collection', 'release', NO],
  ['awaiting_collection', 'retire', NO],
  ['awaiting_collection', 'mark_missing', ['missing', [], 'keep']],
  ['awaiting_collection', 'mark_found', NO],
  ['awaiting_collection', 'inspect', NO],

  // quarantine: held at D1
  ['quarantine', 'register', 'REFUSED:already_registered'],
  ['quarantine', 'receive', NO],
  ['quarantine', 'prep_check', NO],
  ['quarantine', 'fit_liner', NO],
  ['quarantine', 'dispatch', NO],
  ['quarantine', 'deliver', NO],
  ['quarantine', 'fill_seal', NO],
  ['quarantine', 'discharge', NO],
  ['quarantine', 'fold', NO],
  ['quarantine', 'collect', NO],
  ['quarantine', 'quarantine', NO],
  ['quarantine', 'send_to_repair', ['in_repair', [], 'none']],
  ['quarantine', 'release', ['available', [], 'none']],
  ['quarantine', 'retire', ['retired', [], 'none']],
  ['quarantine', 'mark_missing', NO],
  ['quarantine', 'mark_found', NO],
  ['quarantine', 'inspect', ['quarantine', [], 'none']],

  // in_repair: at D1 (in-house repair)
  ['in_repair', 'register', 'REFUSED:already_registered'],
  ['in_repair', 'receive', NO],
  ['in_repair', 'prep_check', NO],
  ['in_repair', 'fit_liner', NO],
  ['in_repair', 'dispatch', NO],
  ['in_repair', 'deliver', NO],
  ['in_repair', 'fill_seal', NO],
  ['in_repair', 'discharge', NO],
  ['in_repair', 'fold', NO],
  ['in_repair', 'collect', NO],
  ['in_repair', 'quarantine', NO],
  ['in_repair', 'send_to_repair', NO],
  ['in_repair', 'release', ['available', [], 'none']],
  ['in_repair', 'retire', ['retired', [], 'none']],
  ['in_repair', 'mark_missing', NO],
  ['in_repair', 'mark_found', NO],
  ['in_repair', 'inspect', ['in_repair', [], 'none']],

  // missing: last seen empty at C1, trip open
  ['missing', 'register', 'REFUSED:already_registered'],
  ['missing', 'receive', ['available', ['mark_found', 'collect'], 'close']],
  ['missing', 'prep_check', NO],
  ['missing', 'fit_liner', NO],
  ['missing', 'dispatch', NO],
  ['missing', 'deliver', NO],
  ['missing', 'fill_seal', NO],
  ['missing', 'discharge', NO],
  ['missing', 'fold', NO],
  ['missing', 'collect', NO],
  ['missing', 'quarantine', NO],
  ['missing', 'send_to_repair', NO],
  ['missing', 'release', NO],
  ['missing', 'retire', ['retired', [], 'close']], // written off: the hire settles
  ['missing', 'mark_missing', NO],
  ['missing', 'mark_found', ['available', ['collect'], 'close']], // turned up at depot D1
  ['missing', 'inspect', NO],

  // retired: terminal
  ['retired', 'register', 'REFUSED:already_registered'],
  ['retired', 'receive', NO],
  ['retired', 'prep_check', NO],
  ['retired', 'fit_liner', NO],
  ['retired', 'dispatch', NO],
  ['retired', 'deliver', NO],
  ['retired', 'fill_seal', NO],
  ['retired', 'discharge', NO],
  ['retired', 'fold', NO],
  ['retired', 'collect', NO],
  ['retired', 'quarantine', NO],
  ['retired', 'send_to_repair', NO],
  ['retired', 'release', NO],
  ['retired', 'retire', NO],
  ['retired', 'mark_missing', NO],
  ['retired', 'mark_found', NO],
  ['retired', 'inspect', NO],
];

function expectOutcome(state: BinState, action: Action, ctx: ActionContext, expected: Expect) {
  const d = decide(state, action, ctx);
  if (typeof expected === 'string') {
    expect(d.ok ? `OK:${d.to}` : `REFUSED:${d.code}`).toBe(expected);
    return d;
  }
  const [to, inferred, trip] = expected;
  expect(d.ok ? { to: d.to, inferred: d.inferred, trip: d.trip } : `REFUSED:${d.code}: ${d.reason}`).toEqual({ to, inferred, trip });
  return d;
}

describe('lifecycle: every status × action (main table)', () => {
  test('the table covers every status (and "not registered") with every action exactly once', () => {
    const keys = MAIN_TABLE.map(([from, action]) => `${from}/${action}`);
    expect(new Set(keys).size).toBe(keys.length);
    expect(keys.length).toBe((STATUSES.length + 1) * ACTIONS.length);
  });

  test.each(MAIN_TABLE)('%s → %s', (from, action, expected) => {
    const state = BASE[from];
    expectOutcome(state, action, scanFor(action, state), expected);
  });
});

describe('lifecycle: names fixed for the rest of the app', () => {
  test('statuses, actions and roles', () => {
    expect([...STATUSES]).toEqual(['available', 'prepared', 'in_transit', 'on_hire', 'awaiting_collection', 'quarantine', 'in_repair', 'missing', 'retired']);
    expect([...ACTIONS]).toEqual([
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
    ]);
    expect([...ROLES]).toEqual(['admin', 'planner', 'yard', 'customer']);
  });

  test('plain-English labels', () => {
    expect(STATUS_LABELS.available).toBe('Available');
    expect(STATUS_LABELS.on_hire).toBe('On hire');
    expect(STATUS_LABELS.awaiting_collection).toBe('Awaiting collection');
    expect(ACTION_LABELS.receive).toBe('Receive at depot');
    expect(ACTION_LABELS.prep_check).toBe('Prep check');
    expect(ACTION_LABELS.fit_liner).toBe('Fit liner');
    for (const s of STATUSES) expect(STATUS_LABELS[s]).toMatch(/^[A-Z][a-z ]+$/);
    for (const a of ACTIONS) expect(ACTION_LABELS[a]).toMatch(/^[A-Z][a-z ]+$/);
  });
});

describe('lifecycle: roles', () => {
  // Who may record what (design brief §2: yard in the depot, customer at its own sites, planner and
  // admin everywhere except the customer's own fill and discharge, which they may enter for them).
  // prettier-ignore
  const MAY: Record<Action, Role[]> = {
    register: ['admin', 'planner'],
    receive: ['admin', 'planner', 'yard'],
    prep_check: ['admin', 'planner', 'yard'],
    fit_liner: ['admin', 'planner', 'yard'],
    dispatch: ['admin', 'planner', 'yard'],
    deliver: ['admin', 'planner', 'yard', 'customer'],
    fill_seal: ['admin', 'planner', 'customer'],
    discharge: ['admin', 'planner', 'customer'],
    fold: ['admin', 'planner', 'yard', 'customer'],
    collect: ['admin', 'planner', 'yard'],
    quarantine: ['admin', 'planner', 'yard'],
    send_to_repair: ['admin', 'planner', 'yard'],
    release: ['admin', 'planner'],
    retire: ['admin', 'planner'],
    mark_missing: ['admin', 'planner'],
    mark_found: ['admin', 'planner', 'yard'],
    inspect: ['admin', 'planner', 'yard'],
  };
  // A state and a scan site where the action succeeds for an allowed role (customer actions at C1).
  // prettier-ignore
  const WHERE: Record<Action, [BinState, ActionContext['siteId'], ActionContext['siteKind'], Partial<ActionContext>?]> = {
    register: [BASE.unregistered, 'D1', 'depot'],
    receive: [BASE.in_transit, 'D1', 'depot'],
    prep_check: [BASE.available, 'D1', 'depot', { prepResult: 'pass' }],
    fit_liner: [{ ...BASE.available, prepChecked: true }, 'D1', 'depot', { linerLotId: 'LOT-B' }],
    dispatch: [BASE.prepared, 'D1', 'depot'],
    deliver: [BASE.in_transit, 'C1', 'customer'],
    fill_seal: [BASE.on_hire, 'C1', 'customer'],
    discharge: [{ ...BASE.on_hire, filled: true }, 'C1', 'customer'],
    fold: [BASE.on_hire, 'C1', 'customer'],
    collect: [BASE.awaiting_collection, 'C1', 'customer'],
    quarantine: [BASE.available, 'D1', 'depot'],
    send_to_repair: [BASE.quarantine, 'D1', 'depot'],
    release: [BASE.quarantine, null, null],
    retire: [BASE.available, null, null],
    mark_missing: [BASE.on_hire, null, null],
    mark_found: [BASE.missing, 'D1', 'depot'],
    inspect: [BASE.available, 'D1', 'depot', { inspection: PASS_2_5 }],
  };

  for (const action of ACTIONS) {
    test(`${action}: allowed for ${MAY[action].join(', ')} only`, () => {
      const [state, siteId, siteKind, extra] = WHERE[action];
      for (const role of ROLES) {
        const d = decide(state, action, at(role, siteId, siteKind, extra));
        if (MAY[action].includes(role)) {
          expect(d.ok, `${role} ${action}: ${d.ok ? '' : d.reason}`).toBe(true);
        } else {
          expect(d.ok ? 'ok' : d.code).toBe('role_not_allowed');
          if (!d.ok) expect(d.reason).toContain(role);
        }
      }
    });
  }

  // prettier-ignore
  const REFUSED: [Status | 'unregistered', Action, ActionContext][] = [
    ['unregistered', 'register', at('yard', 'D1', 'depot')],
    ['in_transit', 'receive', at('customer', 'C1', 'customer')],
    ['on_hire', 'fill_seal', at('yard', 'C1', 'customer')],
    ['quarantine', 'release', at('yard', 'D1', 'depot')],
    ['available', 'retire', at('yard', 'D1', 'depot')],
    ['on_hire', 'mark_missing', at('customer', 'C1', 'customer')],
    // a customer user records only at its own sites: folding a lined bin at a depot is yard work
    ['prepared', 'fold', at('customer', 'D1', 'depot')],
    // the role is checked before the status: even a retired bin answers "not your action"
    ['retired', 'send_to_repair', at('customer', 'C1', 'customer')],
  ];
  test.each(REFUSED)('%s → %s refused for the role', (from, action, ctx) => {
    const d = decide(BASE[from], action, ctx);
    expect(d.ok ? 'ok' : d.code).toBe('role_not_allowed');
    if (!d.ok) expect(d.reason).toContain(ctx.role);
  });
});

describe('lifecycle: periodic test lapsed (ADR/RID 4.1.2.2, 49 CFR 180.352)', () => {
  // ADR/RID 4.1.2.2 [published, REFERENCES §1]: an IBC may not be filled or offered for carriage after
  // its periodic test has lapsed; one filled before may still be carried (up to 3 months); an empty one
  // may travel to be tested. Lining and hire dispatch exist only to lead to a fill, so they are refused
  // too (policy); prep check is a condition check, not a use.
  const LAPSED = '2026-03-14';
  const lapsed = (s: BinState): BinState => ({ ...s, nextDue: LAPSED });
  const checked = lapsed({ ...BASE.available, prepChecked: true });
  // prettier-ignore
  const ROWS: [string, BinState, Action, ActionContext, Expect][] = [
    ['fit liner refused', checked, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }), 'REFUSED:inspection_lapsed'],
    ['hire dispatch refused', lapsed(BASE.prepared), 'dispatch', at('yard', 'D1', 'depot', { purpose: 'hire' }), 'REFUSED:inspection_lapsed'],
    ['fill and seal refused', lapsed(BASE.on_hire), 'fill_seal', at('customer', 'C1', 'customer'), 'REFUSED:inspection_lapsed'],
    ['fill of a never-confirmed delivery refused', lapsed(BASE.in_transit), 'fill_seal', at('customer', 'C1', 'customer'), 'REFUSED:inspection_lapsed'],
    ['prep check still allowed', lapsed(BASE.available), 'prep_check', at('yard', 'D1', 'depot', { prepResult: 'pass' }), ['available', [], 'none']],
    ['empty transfer allowed (to be tested)', lapsed(BASE.available), 'dispatch', at('yard', 'D1', 'depot', { purpose: 'transfer' }), ['in_transit', [], 'none']],
    ['filled bin may still be discharged', lapsed({ ...BASE.on_hire, filled: true }), 'discharge', at('customer', 'C1', 'customer'), ['on_hire', [], 'keep']],
    ['fold allowed', lapsed(BASE.on_hire), 'fold', at('customer', 'C1', 'customer'), ['awaiting_collection', [], 'keep']],
    ['collect allowed', lapsed(BASE.awaiting_collection), 'collect', at('yard', 'C1', 'customer'), ['in_transit', [], 'keep']],
    ['receive allowed', lapsed(BASE.in_transit), 'receive', at('yard', 'D2', 'depot'), ['available', [], 'close']],
    ['delivery of a bin already on the road allowed', lapsed(BASE.in_transit), 'deliver', at('customer', 'C1', 'customer'), ['on_hire', [], 'keep']],
    ['quarantine allowed', lapsed(BASE.prepared), 'quarantine', at('yard', 'D1', 'depot'), ['quarantine', [], 'none']],
    // boundaries: the due date itself is still inside the interval (policy); no regime, never lapsed
    ['due today: fit liner allowed', { ...checked, nextDue: TODAY }, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }), ['prepared', [], 'none']],
    ['due yesterday: refused', { ...checked, nextDue: '2026-05-03' }, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }), 'REFUSED:inspection_lapsed'],
    ['no periodic regime: allowed', { ...checked, nextDue: null }, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }), ['prepared', [], 'none']],
  ];
  test.each(ROWS)('%s', (_name, state, action, ctx, expected) => {
    expectOutcome(state, action, ctx, expected);
  });

  test('the refusal says when the test lapsed and what to do, and changes nothing (story 6)', () => {
    const withDates = { ...checked, inspection: { intermediateDue: LAPSED, fullDue: '2027-09-30', intermediateMonths: 30, fullMonths: 60 } };
    const d = decide(withDates, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }));
    expect(d).toEqual({ ok: false, action: 'fit_liner', code: 'inspection_lapsed', reason: expect.stringContaining('test lapsed on 2026-03-14; book a 2.5-year inspection') });
    expect('patch' in d).toBe(false);
  });

  // The refusal names the inspection inspectionLabel() names (ADR 6.5.4.4: the 5-year one also covers the
  // 2.5-year checks, so past the 5-year date only it will do). It used to say "2.5-year" whatever was due.
  test.each([
    ['the 2.5-year one is due first', { intermediateDue: LAPSED, fullDue: '2027-09-30', intermediateMonths: 30, fullMonths: 60 }, 'book a 2.5-year inspection'],
    ['the 5-year one falls due with it', { intermediateDue: LAPSED, fullDue: LAPSED, intermediateMonths: 30, fullMonths: 60 }, 'book a 5-year inspection'],
    ['past both dates', { intermediateDue: LAPSED, fullDue: '2026-04-30', intermediateMonths: 30, fullMonths: 60 }, 'book a 5-year inspection'],
    ['an own schedule of 18 and 36 months', { intermediateDue: LAPSED, fullDue: '2027-03-31', intermediateMonths: 18, fullMonths: 36 }, 'book an 18-month inspection'],
    ['no dates known', null, 'book its periodic inspection'],
  ])('lapse refusal when %s', (_name, inspection, words) => {
    const d = decide({ ...checked, inspection }, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }));
    expect(d.ok ? '' : d.reason).toContain(words);
  });

  test('lapsing is checked before the missing prep check (the check would not help)', () => {
    const d = decide(lapsed(BASE.available), 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }));
    expect(d.ok ? 'ok' : d.code).toBe('inspection_lapsed');
  });

  test('a prepared bin confirmed delivered after its test lapsed is accepted but flagged', () => {
    const d = decide(lapsed(BASE.prepared), 'deliver', at('customer', 'C1', 'customer'));
    expect(d.ok && d.flags).toEqual(['inferred_steps', 'inspection_lapsed']);
  });

  // prettier-ignore
  const DATES: [string | null, string, boolean][] = [
    ['2026-03-14', '2026-03-14', false],
    ['2026-03-14', '2026-03-15', true],
    ['2026-12-31', '2027-01-01', true],
    ['2028-02-29', '2028-02-28', false],
    [null, '2099-01-01', false],
  ];
  test.each(DATES)('isInspectionLapsed(%s, %s) = %s', (due, today, lapsedNow) => {
    expect(isInspectionLapsed(due, today)).toBe(lapsedNow);
  });
});

describe('lifecycle: prep check before lining', () => {
  test('not prep-checked: fitting a liner is refused', () => {
    const d = decide(BASE.available, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }));
    expect(d).toMatchObject({ ok: false, code: 'prep_check_needed' });
  });

  test('pass, then fit liner: prepared with the lot recorded', () => {
    const check = decide(BASE.available, 'prep_check', at('yard', 'D1', 'depot', { prepResult: 'pass' }));
    expect(check).toMatchObject({ ok: true, to: 'available', patch: { status: 'available', prepChecked: true } });
    const afterCheck: BinState = { ...BASE.available, prepChecked: true };
    const fit = decide(afterCheck, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }));
    expect(fit).toEqual({
      ok: true,
      action: 'fit_liner',
      from: 'available',
      to: 'prepared',
      inferred: [],
      patch: { status: 'prepared', linerLotId: 'LOT-B' },
      trip: 'none',
      flags: [],
    });
  });

  test('a failed prep check sends the bin to quarantine in the same step (story 1)', () => {
    const d = decide(BASE.available, 'prep_check', at('yard', 'D1', 'depot', { prepResult: 'fail' }));
    expect(d).toMatchObject({ ok: true, to: 'quarantine', patch: { status: 'quarantine', prepChecked: false, linerLotId: null } });
  });

  // prettier-ignore
  const ROWS: [string, BinState, Action, ActionContext, Expect][] = [
    ['no liner lot named', { ...BASE.available, prepChecked: true }, 'fit_liner', at('yard', 'D1', 'depot'), 'REFUSED:no_liner_lot'],
    ['no prep result given', BASE.available, 'prep_check', at('yard', 'D1', 'depot'), 'REFUSED:no_prep_result'],
    [
      'checked at D1 but now scanned at D2: the arrival is inferred and the check must be redone',
      { ...BASE.available, prepChecked: true },
      'fit_liner',
      at('yard', 'D2', 'depot', { linerLotId: 'LOT-B' }),
      'REFUSED:prep_check_needed',
    ],
    ['prep check at a customer site', BASE.available, 'prep_check', at('yard', 'C1', 'customer', { prepResult: 'pass' }), 'REFUSED:wrong_site_kind'],
  ];
  test.each(ROWS)('%s', (_name, state, action, ctx, expected) => {
    expectOutcome(state, action, ctx, expected);
  });

  test('arrival resets the check: received at D2, a checked bin is unchecked again', () => {
    const d = decide({ ...BASE.available, prepChecked: true }, 'receive', at('yard', 'D2', 'depot'));
    expect(d.ok && d.patch.prepChecked).toBe(false);
  });

  test('folding a prepared bin at its depot takes the liner out and voids the check', () => {
    const d = decide(BASE.prepared, 'fold', at('yard', 'D1', 'depot'));
    expect(d.ok && d.patch).toEqual({ status: 'available', linerLotId: null, prepChecked: false });
  });
});

describe('lifecycle: liner lot checks', () => {
  // First-expiry-first-out and "use by" up to and including the expiry date: common practice for
  // consumables with a shelf life; a recall outranks a hold (policy, design brief story 7).
  // prettier-ignore
  const ROWS: [status: 'released' | 'on_hold' | 'recalled', expiry: string, expected: 'ok' | 'lot_on_hold' | 'lot_recalled' | 'lot_expired'][] = [
    ['released', '2026-12-31', 'ok'],
    ['released', TODAY, 'ok'], // expires today: still usable today
    ['released', '2026-05-03', 'lot_expired'],
    ['on_hold', '2026-12-31', 'lot_on_hold'],
    ['recalled', '2026-12-31', 'lot_recalled'],
    ['recalled', '2025-01-31', 'lot_recalled'], // recalled and expired: the recall is what matters
    ['on_hold', '2025-01-31', 'lot_on_hold'],
  ];
  test.each(ROWS)('%s lot expiring %s → %s', (status, expiryDate, expected) => {
    const r = checkLinerLot({ status, expiryDate, lotNumber: 'L-0042' }, TODAY);
    expect(r.ok ? 'ok' : r.code).toBe(expected);
    if (!r.ok) expect(r.reason).toContain('L-0042');
  });

  test('the expiry reason names the date', () => {
    const r = checkLinerLot({ status: 'released', expiryDate: '2026-04-30', lotNumber: 'L-7' }, TODAY);
    expect(r).toEqual({ ok: false, code: 'lot_expired', reason: expect.stringContaining('2026-04-30') });
  });
});

describe('lifecycle: dispatch as a transfer of empties', () => {
  const transfer = at('yard', 'D1', 'depot', { purpose: 'transfer' });
  // prettier-ignore
  const ROWS: [Status | 'unregistered', Expect][] = [
    ['unregistered', NO],
    ['available', ['in_transit', [], 'none']],
    ['prepared', NO], // lined: fold it first, or dispatch it for hire
    ['in_transit', NO],
    ['on_hire', NO],
    ['awaiting_collection', NO],
    ['quarantine', NO],
    ['in_repair', NO],
    ['missing', NO],
    ['retired', NO],
  ];
  test.each(ROWS)('transfer from %s', (from, expected) => {
    expectOutcome(BASE[from], 'dispatch', transfer, expected);
  });

  test('the transfer leg: on a truck, no trip, and receiving it at D2 closes nothing', () => {
    const out = decide(BASE.available, 'dispatch', transfer);
    expect(out.ok && out.patch).toEqual({ status: 'in_transit', leg: 'transfer', siteId: null, siteKind: null, prepChecked: false });
    const onTruck: BinState = { ...BASE.available, status: 'in_transit', leg: 'transfer', siteId: null, siteKind: null };
    expectOutcome(onTruck, 'receive', at('yard', 'D2', 'depot'), ['available', [], 'none']);
    expectOutcome(onTruck, 'deliver', at('customer', 'C1', 'customer'), NO);
  });

  test('hire dispatch opens the trip and puts the bin on the road', () => {
    const d = decide(BASE.prepared, 'dispatch', at('yard', 'D1', 'depot', { purpose: 'hire' }));
    expect(d.ok && d.patch).toEqual({ status: 'in_transit', leg: 'outbound', siteId: null, siteKind: null, prepChecked: false, tripOpen: true });
  });

  // prettier-ignore
  const MORE: [string, BinState, ActionContext, Expect][] = [
    ['no purpose means hire: a folded empty is refused', BASE.available, at('yard', 'D1', 'depot'), NO],
    ['empties recorded at D2 sent from D1: their arrival at D1 is inferred', { ...BASE.available, siteId: 'D2' }, transfer, ['in_transit', ['receive'], 'none']],
    ['a lined bin recorded at D2 cannot leave D1 for hire', { ...BASE.prepared, siteId: 'D2' }, at('yard', 'D1', 'depot', { purpose: 'hire' }), 'REFUSED:wrong_site'],
    ['dispatch scanned at a customer site', BASE.prepared, at('yard', 'C1', 'customer', { purpose: 'hire' }), 'REFUSED:wrong_site_kind'],
  ];
  test.each(MORE)('%s', (_name, state, ctx, expected) => {
    expectOutcome(state, 'dispatch', ctx, expected);
  });
});

describe('lifecycle: missed scans are inferred in cycle order (story 10)', () => {
  const filled = (s: BinState): BinState => ({ ...s, filled: true });
  // prettier-ignore
  const ROWS: [string, BinState, Action, ActionContext, Expect][] = [
    ['on hire, received at a depot', BASE.on_hire, 'receive', at('yard', 'D2', 'depot'), ['available', ['fold', 'collect'], 'close']],
    ['on hire and filled, received at a depot', filled(BASE.on_hire), 'receive', at('yard', 'D2', 'depot'), ['available', ['discharge', 'fold', 'collect'], 'close']],
    ['awaiting collection, received at a depot', BASE.awaiting_collection, 'receive', at('yard', 'D2', 'depot'), ['available', ['collect'], 'close']],
    ['missing (last seen empty at a customer), received', BASE.missing, 'receive', at('yard', 'D2', 'depot'), ['available', ['mark_found', 'collect'], 'close']],
    [
      'missing (last seen filled at a customer), received',
      filled(BASE.missing),
      'receive',
      at('yard', 'D2', 'depot'),
      ['available', ['mark_found', 'discharge', 'fold', 'collect'], 'close'],
    ],
    [
      'missing (last seen at depot D1), received at D2',
      { ...BASE.missing, siteId: 'D1', siteKind: 'depot', tripOpen: false },
      'receive',
      at('yard', 'D2', 'depot'),
      ['available', ['mark_found'], 'none'],
    ],
    [
      'missing (last seen on a return truck), received',
      { ...BASE.missing, siteId: null, siteKind: null, leg: 'return' },
      'receive',
      at('yard', 'D2', 'depot'),
      ['available', ['mark_found'], 'close'],
    ],
    ['filled, folded', filled(BASE.on_hire), 'fold', at('customer', 'C1', 'customer'), ['awaiting_collection', ['discharge'], 'keep']],
    ['on hire, collected', BASE.on_hire, 'collect', at('yard', 'C1', 'customer'), ['in_transit', ['fold'], 'keep']],
    ['filled, collected', filled(BASE.on_hire), 'collect', at('yard', 'C1', 'customer'), ['in_transit', ['discharge', 'fold'], 'keep']],
    ['prepared, confirmed delivered', BASE.prepared, 'deliver', at('customer', 'C1', 'customer'), ['on_hire', ['dispatch'], 'open']],
    ['on the road, filled at the customer', BASE.in_transit, 'fill_seal', at('customer', 'C1', 'customer'), ['on_hire', ['deliver'], 'keep']],
    ['folded empty recorded at D1, prep-checked at D2', BASE.available, 'prep_check', at('yard', 'D2', 'depot', { prepResult: 'pass' }), ['available', ['receive'], 'none']],
    ['folded empty recorded at D1, quarantined at D2', BASE.available, 'quarantine', at('yard', 'D2', 'depot'), ['quarantine', ['receive'], 'none']],
    ['missing and filled, found at depot D1', filled(BASE.missing), 'mark_found', at('yard', 'D1', 'depot'), ['available', ['discharge', 'fold', 'collect'], 'close']],
    // no inference
    ['on the way back, received', { ...BASE.in_transit, leg: 'return', linerLotId: null }, 'receive', at('yard', 'D2', 'depot'), ['available', [], 'close']],
    ['missing, found at customer C2 empty', BASE.missing, 'mark_found', at('yard', 'C2', 'customer'), ['awaiting_collection', [], 'keep']],
    ['missing, found at customer C1 still filled', filled(BASE.missing), 'mark_found', at('yard', 'C1', 'customer'), ['on_hire', [], 'keep']],
  ];
  test.each(ROWS)('%s', (_name, state, action, ctx, expected) => {
    const d = expectOutcome(state, action, ctx, expected);
    // flagged for a planner exactly when something was inferred
    if (d.ok) expect(d.flags.includes('inferred_steps')).toBe(d.inferred.length > 0);
  });

  test('a received trip leaves the bin folded, empty, unlined and unchecked at the depot', () => {
    const d = decide(filled(BASE.on_hire), 'receive', at('yard', 'D2', 'depot'));
    expect(d).toEqual({
      ok: true,
      action: 'receive',
      from: 'on_hire',
      to: 'available',
      inferred: ['discharge', 'fold', 'collect'],
      trip: 'close',
      flags: ['inferred_steps'],
      patch: { status: 'available', siteId: 'D2', siteKind: 'depot', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false },
    });
  });
});

describe('lifecycle: specific refusals', () => {
  // prettier-ignore
  const ROWS: [string, BinState, Action, ActionContext, string][] = [
    ['register twice', BASE.available, 'register', at('planner', 'D1', 'depot'), 'REFUSED:already_registered'],
    ['register a retired bin', BASE.retired, 'register', at('planner', 'D1', 'depot'), 'REFUSED:already_registered'],
    ['register at a customer site', BASE.unregistered, 'register', at('planner', 'C1', 'customer'), 'REFUSED:wrong_site_kind'],
    ['receive where it already is', BASE.available, 'receive', at('yard', 'D1', 'depot'), 'REFUSED:already_here'],
    ['receive at a customer site', BASE.in_transit, 'receive', at('yard', 'C1', 'customer'), 'REFUSED:wrong_site_kind'],
    ['deliver at a depot', BASE.in_transit, 'deliver', at('yard', 'D2', 'depot'), 'REFUSED:wrong_site_kind'],
    ['deliver a bin on its way back', { ...BASE.in_transit, leg: 'return' }, 'deliver', at('customer', 'C1', 'customer'), 'REFUSED:not_allowed_from_status'],
    ['fill twice', { ...BASE.on_hire, filled: true }, 'fill_seal', at('customer', 'C1', 'customer'), 'REFUSED:already_filled'],
    ['discharge an empty bin', BASE.on_hire, 'discharge', at('customer', 'C1', 'customer'), 'REFUSED:not_filled'],
    ['fill at a depot', BASE.on_hire, 'fill_seal', at('planner', 'D1', 'depot'), 'REFUSED:wrong_site_kind'],
    ['collect at a depot', BASE.awaiting_collection, 'collect', at('yard', 'D1', 'depot'), 'REFUSED:wrong_site_kind'],
    ['quarantine at a customer site', BASE.available, 'quarantine', at('yard', 'C1', 'customer'), 'REFUSED:wrong_site_kind'],
    ['fold a lined bin recorded at another depot', BASE.prepared, 'fold', at('yard', 'D2', 'depot'), 'REFUSED:wrong_site'],
    ['mark found at a repair shop', BASE.missing, 'mark_found', at('yard', 'R1', 'repair'), 'REFUSED:wrong_site_kind'],
    ['send to repair from a customer site', BASE.quarantine, 'send_to_repair', at('yard', 'C1', 'customer'), 'REFUSED:wrong_site_kind'],
  ];
  test.each(ROWS)('%s', (_name, state, action, ctx, expected) => {
    const d = decide(state, action, ctx);
    expect(d.ok ? `OK:${d.to}` : `REFUSED:${d.code}`).toBe(expected);
  });

  // prettier-ignore
  const WORDS: [Status | 'unregistered', Action, ActionContext, string[]][] = [
    ['retired', 'receive', at('yard', 'D2', 'depot'), ['retired', 'left the pool']],
    ['on_hire', 'prep_check', at('yard', 'D1', 'depot', { prepResult: 'pass' }), ['Prep check', 'on hire', 'receive it']],
    ['available', 'quarantine', at('yard', 'C1', 'customer'), ['a depot', 'a customer site']],
    ['in_transit', 'quarantine', at('yard', 'D1', 'depot'), ['in transit', 'receive it at a depot first']],
    ['prepared', 'receive', at('yard', 'D2', 'depot'), ['prepared', 'dispatch it, or fold it']],
    ['quarantine', 'receive', at('yard', 'D2', 'depot'), ['in quarantine', 'release']],
    ['unregistered', 'fold', at('yard', 'D1', 'depot'), ['not registered', 'register it first']],
  ];
  test.each(WORDS)('%s → %s: the reason names the status and what to do', (from, action, ctx, phrases) => {
    const d = decide(BASE[from], action, ctx);
    expect(d.ok).toBe(false);
    for (const p of phrases) expect(d.ok ? '' : d.reason).toContain(p);
  });
});

describe('lifecycle: inspection at the test bench (ADR 6.5.4.4; 4.1.2.2 lets a lapsed empty bin go to its test)', () => {
  const LAPSED = { ...BASE.available, nextDue: '2026-04-30' };
  test('a pass moves the schedule the caller worked out, and keeps the status', () => {
    const d = decide(LAPSED, 'inspect', at('yard', 'D1', 'depot', { inspection: PASS_2_5 }));
    expect(d.ok && d.patch).toEqual({ status: 'available', schedule: SCHEDULE, nextDue: '2028-11-30' });
  });
  test('allowed after the test has lapsed (that is when it is needed); lining is still refused until it passes', () => {
    expect(decide(LAPSED, 'inspect', at('yard', 'D1', 'depot', { inspection: PASS_2_5 })).ok).toBe(true);
    expect(decide({ ...LAPSED, prepChecked: true }, 'fit_liner', at('yard', 'D1', 'depot', { linerLotId: 'LOT-B' }))).toMatchObject({ ok: false, code: 'inspection_lapsed' });
  });
  test('a fail or a repair finding quarantines the bin, liner out; in repair it stays in repair', () => {
    for (const outcome of ['fail', 'repair'] as const) {
      const d = decide(BASE.available, 'inspect', at('yard', 'D1', 'depot', { inspection: { kind: 'full', outcome, scheduleAfter: null } }));
      expect(d.ok && d.patch).toEqual({ status: 'quarantine', prepChecked: false, linerLotId: null });
    }
    const r = decide(BASE.in_repair, 'inspect', at('yard', 'D1', 'depot', { inspection: { kind: 'after_repair', outcome: 'fail', scheduleAfter: null } }));
    expect(r.ok && r.to).toBe('in_repair');
  });
  test('an after-repair pass puts a repaired bin back in service', () => {
    const d = decide(BASE.in_repair, 'inspect', at('yard', 'R1', 'repair', { inspection: { kind: 'after_repair', outcome: 'pass', scheduleAfter: SCHEDULE } }));
    expect(d.ok && d.patch).toEqual({ status: 'available', siteId: 'R1', siteKind: 'repair', schedule: SCHEDULE, nextDue: '2028-11-30', prepChecked: false });
  });
  test('refusals: no result, a lined bin, a customer site, a yard hand at a desk', () => {
    expect(decide(BASE.available, 'inspect', at('yard', 'D1', 'depot'))).toMatchObject({ ok: false, code: 'no_inspection_result' });
    expect(decide(BASE.prepared, 'inspect', at('yard', 'D1', 'depot', { inspection: PASS_2_5 }))).toMatchObject({
      ok: false,
      reason: expect.stringContaining('take the liner out first'),
    });
    expect(decide(BASE.available, 'inspect', at('yard', 'C1', 'customer', { inspection: PASS_2_5 }))).toMatchObject({ ok: false, code: 'wrong_site_kind' });
    expect(decide(BASE.available, 'inspect', at('yard', null, null, { inspection: PASS_2_5 }))).toMatchObject({ ok: false, code: 'wrong_site_kind' });
    expect(decide(BASE.available, 'inspect', DESK()).ok).toBe(false);
    expect(decide(BASE.available, 'inspect', at('planner', null, null, { inspection: PASS_2_5 })).ok).toBe(true); // an outside body's report entered at a desk
  });
});

describe('lifecycle: the bin page buttons', () => {
  // prettier-ignore
  const ROWS: [string, BinState, Omit<ActionContext, 'prepResult' | 'linerLotId' | 'purpose'>, Action[]][] = [
    [
      'yard at D1, folded bin not yet checked',
      BASE.available,
      { role: 'yard', today: TODAY, siteId: 'D1', siteKind: 'depot' },
      ['prep_check', 'dispatch', 'quarantine', 'inspect'],
    ],
    [
      'yard at D1, checked bin',
      { ...BASE.available, prepChecked: true },
      { role: 'yard', today: TODAY, siteId: 'D1', siteKind: 'depot' },
      ['prep_check', 'fit_liner', 'dispatch', 'quarantine', 'inspect'],
    ],
    ['yard at D1, prepared bin', BASE.prepared, { role: 'yard', today: TODAY, siteId: 'D1', siteKind: 'depot' }, ['dispatch', 'fold', 'quarantine']],
    ['yard at D2, bin on hire elsewhere', BASE.on_hire, { role: 'yard', today: TODAY, siteId: 'D2', siteKind: 'depot' }, ['receive']],
    ['customer at C1, empty bin on hire', BASE.on_hire, { role: 'customer', today: TODAY, siteId: 'C1', siteKind: 'customer' }, ['fill_seal', 'fold']],
    ['customer at C1, filled bin', { ...BASE.on_hire, filled: true }, { role: 'customer', today: TODAY, siteId: 'C1', siteKind: 'customer' }, ['discharge', 'fold']],
    ['planner at a desk, quarantined bin', BASE.quarantine, { role: 'planner', today: TODAY, siteId: null, siteKind: null }, ['send_to_repair', 'release', 'retire', 'inspect']],
    ['planner at a desk, bin on hire', BASE.on_hire, { role: 'planner', today: TODAY, siteId: null, siteKind: null }, ['fill_seal', 'fold', 'collect', 'mark_missing']],
    ['planner at a desk, retired bin', BASE.retired, { role: 'planner', today: TODAY, siteId: null, siteKind: null }, []],
  ];
  test.each(ROWS)('%s', (_name, state, ctx, expected) => {
    expect(allowedActions(state, ctx)).toEqual(expected);
  });
});

describe('lifecycle: invariants over every status × action × role', () => {
  const CYCLE: Action[] = ['mark_found', 'receive', 'prep_check', 'fit_liner', 'dispatch', 'deliver', 'fill_seal', 'discharge', 'fold', 'collect'];
  const states = Object.values(BASE);
  test('a refusal carries a reason and no change; a success patches the status it names', () => {
    for (const state of states)
      for (const action of ACTIONS)
        for (const role of ROLES) {
          for (const ctx of [scanFor(action, state), at(role, 'D1', 'depot'), at(role, 'C1', 'customer'), DESK(role)]) {
            const d = decide(state, action, { ...ctx, role });
            if (d.ok) {
              expect(d.patch.status).toBe(d.to);
              expect(d.from).toBe(state.status);
              // inferred steps are cycle steps, listed in the order the cycle runs (a find comes first:
              // it is what brings a missing bin back into the cycle)
              const order = d.inferred.map((a) => CYCLE.indexOf(a));
              expect(order.every((i, k) => i >= 0 && (k === 0 || i > order[k - 1]!))).toBe(true);
            } else {
              expect(d.reason.length).toBeGreaterThan(10);
              expect(Object.keys(d).sort()).toEqual(['action', 'code', 'ok', 'reason']);
            }
          }
        }
  });
});
