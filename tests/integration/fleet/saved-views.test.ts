import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { resetDatabase, sequelize } from '../support/db';
import { baseWorld, makeUser } from '../support/fixtures';
import { callRoute, json, sessionUser } from '../support/route';
import { GET as listRoute, POST as createRoute } from '@/pages/api/fleet/views/index';
import { PATCH as patchRoute, DELETE as deleteRoute } from '@/pages/api/fleet/views/[id]';
import { BUILTIN_VIEWS } from '@/lib/fleet/grid-views';
import type { ViewSummary } from '@/lib/fleet/saved-views.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { User } from '@/models';

let ann: SessionUser; // planner who saves views
let ben: SessionUser; // another planner
let ada: SessionUser; // admin
let cus: SessionUser; // customer

beforeAll(async () => {
  await resetDatabase();
  const w = await baseWorld();
  const mk = async (role: 'planner' | 'admin' | 'customer', org: number, name: string) => {
    const u = await makeUser(role, org);
    await User.update({ name }, { where: { id: u.id } });
    return sessionUser({ id: u.id, role, organisationId: org }, name);
  };
  ann = await mk('planner', w.operator.id, 'Ann Planner');
  ben = await mk('planner', w.operator.id, 'Ben Planner');
  ada = await mk('admin', w.operator.id, 'Ada Admin');
  cus = await mk('customer', w.customer.id, 'Cus Tomer');
});
afterAll(async () => {
  await sequelize.close();
});

const STATE = {
  filterModel: { status: { filterType: 'set', values: ['on_hire'] } },
  sortModel: [{ colId: 'nextDue', sort: 'asc' }],
  columns: [
    { colId: 'grai', hide: false, width: 220 },
    { colId: 'serial', hide: true },
  ],
};

async function list(user: SessionUser): Promise<ViewSummary[]> {
  const res = await callRoute(listRoute, { user, path: '/api/fleet/views' });
  expect(res.status).toBe(200);
  return (await json<{ data: ViewSummary[] }>(res)).data;
}
async function create(user: SessionUser, body: unknown) {
  return callRoute(createRoute, { user, path: '/api/fleet/views', method: 'POST', body });
}
async function patch(user: SessionUser, id: string, body: unknown) {
  return callRoute(patchRoute, { user, path: `/api/fleet/views/${id}`, method: 'PATCH', body, params: { id } });
}
async function remove(user: SessionUser, id: string) {
  return callRoute(deleteRoute, { user, path: `/api/fleet/views/${id}`, method: 'DELETE', params: { id } });
}

describe('saved views', () => {
  let annView: ViewSummary;

  test('everyone with the grid starts with the four built-in views', async () => {
    const views = await list(ann);
    expect(views.map((v) => v.name)).toEqual(BUILTIN_VIEWS.map((v) => v.name));
    expect(views.map((v) => v.name)).toEqual(['Overdue back from customers', 'Due for test this month', 'In quarantine', 'Silent for 30+ days']);
    expect(views.every((v) => v.kind === 'builtin')).toBe(true);
  });

  test('a planner saves a private view; nobody else sees it', async () => {
    const res = await create(ann, { name: '  On hire   by due date ', state: STATE });
    expect(res.status).toBe(201);
    annView = (await json<{ data: ViewSummary }>(res)).data;
    expect(annView).toMatchObject({ name: 'On hire by due date', kind: 'own', shared: false, state: STATE });
    expect((await list(ann)).map((v) => v.name)).toContain('On hire by due date');
    expect((await list(ben)).map((v) => v.name)).not.toContain('On hire by due date');
    expect((await list(ada)).map((v) => v.name)).not.toContain('On hire by due date');
  });

  test('sharing makes it visible to every planner and admin, marked with the owner', async () => {
    const res = await patch(ann, annView.id, { shared: true, version: annView.version });
    expect(res.status).toBe(200);
    annView = (await json<{ data: ViewSummary }>(res)).data;
    for (const viewer of [ben, ada]) {
      const seen = (await list(viewer)).find((v) => v.id === annView.id)!;
      expect(seen).toMatchObject({ kind: 'shared', ownerName: 'Ann Planner', state: STATE });
    }
  });

  test('only the owner changes or deletes it', async () => {
    const res = await patch(ben, annView.id, { name: 'Mine now', version: annView.version });
    expect(res.status).toBe(403);
    expect((await json(res)).error!.message).toMatch(/Only the planner who saved this view/);
    expect((await remove(ben, annView.id)).status).toBe(403);
    expect((await remove(ada, annView.id)).status).toBe(403);
  });

  test('a stale version is refused; a second view with the same name (any case) is refused', async () => {
    expect((await patch(ann, annView.id, { name: 'Renamed', version: annView.version! - 1 })).status).toBe(409);
    const dup = await create(ann, { name: 'ON HIRE BY DUE DATE', state: STATE });
    expect(dup.status).toBe(409);
    expect((await json(dup)).error!.message).toMatch(/already have a view called/);
    // another planner may use the same name for their own view
    expect((await create(ben, { name: 'On hire by due date', state: STATE })).status).toBe(201);
  });

  test('a view naming a column outside the whitelist is refused with 400', async () => {
    const res = await create(ann, { name: 'Sneaky', state: { ...STATE, sortModel: [{ colId: 'password_hash', sort: 'asc' }] } });
    expect(res.status).toBe(400);
    expect((await json(res)).error).toMatchObject({ code: 'validation_failed' });
    const res2 = await patch(ann, annView.id, { state: { filterModel: { serial: { filterType: 'text', type: 'sql', filter: 'x' } } }, version: annView.version });
    expect(res2.status).toBe(400);
  });

  test('built-in views cannot be changed or deleted', async () => {
    const id = BUILTIN_VIEWS[0]!.id;
    expect((await patch(ann, id, { name: 'x', version: 0 })).status).toBe(403);
    expect((await remove(ann, id)).status).toBe(403);
  });

  test('the owner renames, unshares and deletes', async () => {
    let res = await patch(ann, annView.id, { name: 'Renamed', shared: false, version: annView.version });
    expect(res.status).toBe(200);
    annView = (await json<{ data: ViewSummary }>(res)).data;
    expect((await list(ben)).map((v) => v.id)).not.toContain(annView.id);
    res = await remove(ann, annView.id);
    expect(res.status).toBe(200);
    expect((await list(ann)).map((v) => v.id)).not.toContain(annView.id);
    expect((await remove(ann, annView.id)).status).toBe(404);
  });

  test('customers cannot reach saved views', async () => {
    expect((await callRoute(listRoute, { user: cus, path: '/api/fleet/views' })).status).toBe(403);
    expect((await create(cus, { name: 'x', state: STATE })).status).toBe(403);
  });
});
