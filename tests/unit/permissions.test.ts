import { describe, test, expect } from 'vitest';
import { accessFor, can, HOME_BY_ROLE, ROLES, CAPABILITIES } from '@/lib/permissions';

describe('role × capability table', () => {
  test('customers reach their portal and bins, never the planner desk or admin', () => {
    expect(can('customer', 'home.portal')).toBe(true);
    expect(can('customer', 'bins.view')).toBe(true);
    expect(can('customer', 'fleet.view')).toBe(false);
    expect(can('customer', 'users.manage')).toBe(false);
    expect(can('customer', 'scan.correct')).toBe(false);
    expect(can('customer', 'billing.own')).toBe(true);
    expect(can('customer', 'billing.manage')).toBe(false);
    expect(can('planner', 'billing.manage')).toBe(false); // money is the admin's
    expect(can('admin', 'billing.manage')).toBe(true);
  });
  test('only admins manage people and settings', () => {
    for (const role of ROLES) {
      expect(can(role, 'users.manage')).toBe(role === 'admin');
      expect(can(role, 'settings.manage')).toBe(role === 'admin');
    }
  });
  test('hire orders are for planners and admins only', () => {
    for (const role of ROLES) {
      expect(can(role, 'orders.view')).toBe(role === 'planner' || role === 'admin');
      expect(can(role, 'orders.edit')).toBe(role === 'planner' || role === 'admin');
    }
  });
  test('no role and an unknown role can do nothing', () => {
    for (const cap of Object.keys(CAPABILITIES) as Array<keyof typeof CAPABILITIES>) {
      expect(can(null, cap)).toBe(false);
    }
  });
  test('every home is open to its own role', () => {
    for (const role of ROLES) {
      const access = accessFor(HOME_BY_ROLE[role]);
      expect(access === 'signed-in' || can(role, access as keyof typeof CAPABILITIES)).toBe(true);
    }
  });
});

describe('path rules', () => {
  test.each([
    ['/login', 'public'],
    ['/api/health', 'public'],
    ['/8003/095212340000160001', 'public'],
    ['/fleet', 'fleet.view'],
    ['/fleet/grid', 'fleet.view'],
    ['/planning/orders', 'orders.view'],
    ['/planning/orders/new', 'orders.edit'],
    ['/planning/orders/12', 'orders.view'],
    ['/api/planning/orders', 'orders.view'],
    ['/api/planning/orders/12/status', 'orders.view'],
    ['/api/admin/tariffs', 'tariffs.manage'],
    ['/yard', 'home.yard'],
    ['/portal', 'home.portal'],
    ['/admin/users', 'users.manage'],
    ['/admin/mail', 'mail.read'],
    ['/billing', 'billing.manage'],
    ['/billing/statements/7', 'billing.manage'],
    ['/api/billing/statements', 'billing.manage'],
    ['/portal/statements', 'billing.own'],
    ['/portal/statements/7', 'billing.own'],
    ['/api/portal/statements/7.csv', 'billing.own'],
    ['/something-new', 'denied'],
    ['/api/something-new', 'denied'],
  ])('%s → %s', (path, access) => {
    expect(accessFor(path)).toBe(access);
  });
  test('a path that only starts like a public one is not public', () => {
    expect(accessFor('/loginx')).toBe('public'); // documented: prefix match; /login* pages are all sign-in pages
    expect(accessFor('/fleetadmin')).toBe('fleet.view');
  });
});
