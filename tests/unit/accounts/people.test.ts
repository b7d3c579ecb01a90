import { describe, test, expect } from 'vitest';
import { assignmentProblems, personStatus } from '@/lib/accounts/people';
import { inviteSchema, personPatchSchema } from '@/lib/accounts/people-schemas';

const depot = { kind: 'depot', operatorOwned: true };

describe('who may be assigned what', () => {
  test('staff belong to the operator, customers to a customer organisation', () => {
    expect(assignmentProblems({ role: 'planner', organisationKind: 'operator', homeSite: null, qualifiedInspector: false })).toEqual([]);
    expect(assignmentProblems({ role: 'customer', organisationKind: 'customer', homeSite: null, qualifiedInspector: false })).toEqual([]);
    expect(assignmentProblems({ role: 'admin', organisationKind: 'customer', homeSite: null, qualifiedInspector: false }).map((p) => p.path)).toEqual(['organisationId']);
    expect(assignmentProblems({ role: 'customer', organisationKind: 'operator', homeSite: null, qualifiedInspector: false }).map((p) => p.path)).toEqual(['organisationId']);
    expect(assignmentProblems({ role: 'customer', organisationKind: null, homeSite: null, qualifiedInspector: false }).map((p) => p.path)).toEqual(['organisationId']);
  });
  test('yard staff need a home depot of the operator; others may have one', () => {
    expect(assignmentProblems({ role: 'yard', organisationKind: 'operator', homeSite: null, qualifiedInspector: true }).map((p) => p.path)).toEqual(['homeSiteId']);
    expect(assignmentProblems({ role: 'yard', organisationKind: 'operator', homeSite: depot, qualifiedInspector: true })).toEqual([]);
    expect(assignmentProblems({ role: 'planner', organisationKind: 'operator', homeSite: depot, qualifiedInspector: false })).toEqual([]);
    expect(
      assignmentProblems({ role: 'yard', organisationKind: 'operator', homeSite: { kind: 'customer', operatorOwned: false }, qualifiedInspector: false }).map((p) => p.path),
    ).toEqual(['homeSiteId']);
    expect(
      assignmentProblems({ role: 'yard', organisationKind: 'operator', homeSite: { kind: 'repair', operatorOwned: true }, qualifiedInspector: false }).map((p) => p.path),
    ).toEqual(['homeSiteId']);
  });
  test('customers get neither a depot nor the inspector flag', () => {
    expect(assignmentProblems({ role: 'customer', organisationKind: 'customer', homeSite: depot, qualifiedInspector: true }).map((p) => p.path)).toEqual([
      'homeSiteId',
      'qualifiedInspector',
    ]);
  });
});

describe('status of a person', () => {
  const now = new Date('2027-01-10T12:00:00Z');
  test.each([
    [{ active: false, hasPassword: true, inviteExpiresAt: null }, 'deactivated'],
    [{ active: true, hasPassword: true, inviteExpiresAt: null }, 'active'],
    [{ active: true, hasPassword: false, inviteExpiresAt: '2027-01-12T00:00:00Z' }, 'invited'],
    [{ active: true, hasPassword: false, inviteExpiresAt: '2027-01-10T11:59:59Z' }, 'invite_lapsed'],
    [{ active: true, hasPassword: false, inviteExpiresAt: null }, 'invite_lapsed'],
  ] as const)('%o → %s', (p, status) => {
    expect(personStatus(p, now)).toBe(status);
  });
});

describe('input shapes', () => {
  test('an invitation normalises the e-mail and defaults the optional fields', () => {
    expect(inviteSchema.parse({ name: ' Ada ', email: ' Ada@X.Example', role: 'planner', organisationId: 1 })).toEqual({
      name: 'Ada',
      email: 'ada@x.example',
      role: 'planner',
      organisationId: 1,
      homeSiteId: null,
      qualifiedInspector: false,
    });
    expect(inviteSchema.safeParse({ name: 'A', email: 'a@x.example', role: 'driver', organisationId: 1 }).success).toBe(false);
  });
  test('a change needs a version and at least one field', () => {
    expect(personPatchSchema.safeParse({ version: 2 }).success).toBe(false);
    expect(personPatchSchema.safeParse({ active: false }).success).toBe(false);
    expect(personPatchSchema.parse({ version: 2, homeSiteId: null })).toEqual({ version: 2, homeSiteId: null });
  });
});
