import { describe, test, expect } from 'vitest';
import {
  ORDER_STATUSES,
  availableCommands,
  countsAsDemand,
  decideCommand,
  remaining,
  statusFromLoads,
  type OrderCommand,
  type OrderProgress,
  type OrderStatus,
} from '@/lib/planning/order-status';

// Every expectation is written out by hand; the rule table in order-status.ts is the thing under test.

const NONE: OrderProgress = { quantity: 24, loaded: 0, dispatched: 0 };
const SOME: OrderProgress = { quantity: 24, loaded: 10, dispatched: 0 };
const ALL: OrderProgress = { quantity: 24, loaded: 24, dispatched: 24 };

type Row = [from: OrderStatus, command: OrderCommand, progress: OrderProgress, expected: OrderStatus | 'REFUSED'];
const COMMANDS: Row[] = [
  ['draft', 'confirm', NONE, 'confirmed'],
  ['draft', 'cancel', NONE, 'cancelled'],
  ['draft', 'close', NONE, 'REFUSED'],
  ['confirmed', 'confirm', NONE, 'REFUSED'],
  ['confirmed', 'cancel', NONE, 'cancelled'],
  ['confirmed', 'close', NONE, 'REFUSED'],
  ['loading', 'confirm', SOME, 'REFUSED'],
  ['loading', 'cancel', SOME, 'REFUSED'], // bins are on a truck
  ['loading', 'cancel', NONE, 'cancelled'], // every loaded bin was voided
  ['loading', 'close', SOME, 'closed'], // close short
  ['loading', 'close', NONE, 'REFUSED'],
  ['dispatched', 'confirm', ALL, 'REFUSED'],
  ['dispatched', 'cancel', ALL, 'REFUSED'],
  ['dispatched', 'close', ALL, 'closed'],
  ['closed', 'confirm', ALL, 'REFUSED'],
  ['closed', 'cancel', ALL, 'REFUSED'],
  ['closed', 'close', ALL, 'REFUSED'],
  ['cancelled', 'confirm', NONE, 'REFUSED'],
  ['cancelled', 'cancel', NONE, 'REFUSED'],
  ['cancelled', 'close', NONE, 'REFUSED'],
];

describe('planner commands, the whole table', () => {
  test('every status × command is listed', () => {
    const seen = new Set(COMMANDS.map(([s, c]) => `${s}:${c}`));
    for (const s of ORDER_STATUSES) for (const c of ['confirm', 'cancel', 'close'] as const) expect(seen.has(`${s}:${c}`), `${s}:${c}`).toBe(true);
  });
  test.each(COMMANDS)('%s + %s (%o) → %s', (from, command, progress, expected) => {
    const decision = decideCommand(from, command, progress);
    if (expected === 'REFUSED') {
      expect(decision.ok).toBe(false);
      if (!decision.ok) expect(decision.reason).toMatch(/cannot be/);
    } else {
      expect(decision).toMatchObject({ ok: true, to: expected });
    }
  });
  test('a refusal says why', () => {
    expect(decideCommand('loading', 'cancel', SOME)).toEqual({
      ok: false,
      reason: 'A loading order cannot be cancelled: bins are already loaded for it; void those scans first.',
    });
  });
  test('the buttons offered are the allowed commands', () => {
    expect(availableCommands('draft', NONE).map((c) => c.command)).toEqual(['confirm', 'cancel']);
    expect(availableCommands('loading', SOME)).toEqual([{ command: 'close', label: 'Close short' }]);
    expect(availableCommands('closed', ALL)).toEqual([]);
  });
});

describe('the status follows the loads', () => {
  const cases: [OrderStatus, OrderProgress, OrderStatus][] = [
    ['draft', SOME, 'draft'], // drafts are never loaded; nothing moves them
    ['confirmed', NONE, 'confirmed'],
    ['confirmed', SOME, 'loading'],
    ['confirmed', { quantity: 24, loaded: 24, dispatched: 0 }, 'loading'], // all on the truck, truck not gone
    ['confirmed', ALL, 'dispatched'], // single dispatch scans: loading and dispatched at once
    ['loading', { quantity: 24, loaded: 24, dispatched: 23 }, 'loading'],
    ['loading', ALL, 'dispatched'],
    ['loading', { quantity: 24, loaded: 30, dispatched: 30 }, 'dispatched'],
    ['dispatched', ALL, 'dispatched'],
    ['closed', ALL, 'closed'],
    ['cancelled', NONE, 'cancelled'],
    // Voided scans take bins off the order again: the status steps back.
    ['dispatched', { quantity: 24, loaded: 24, dispatched: 23 }, 'loading'],
    ['dispatched', NONE, 'confirmed'], // the only dispatch scan was voided
    ['loading', NONE, 'confirmed'],
    ['closed', NONE, 'closed'], // planner-owned: a void after closing leaves it closed
  ];
  test.each(cases)('%s with %o → %s', (from, progress, expected) => {
    expect(statusFromLoads(from, progress)).toBe(expected);
  });
});

describe('what counts as demand', () => {
  test('confirmed and loading only; drafts count nowhere', () => {
    expect(ORDER_STATUSES.filter(countsAsDemand)).toEqual(['confirmed', 'loading']);
  });
  test('bins still to send', () => {
    expect(remaining(SOME)).toBe(24);
    expect(remaining({ quantity: 24, loaded: 20, dispatched: 20 })).toBe(4);
    expect(remaining({ quantity: 24, loaded: 30, dispatched: 30 })).toBe(0);
  });
});
