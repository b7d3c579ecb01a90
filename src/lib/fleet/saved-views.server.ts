// Saved views of the fleet grid: each planner's own, those others shared, and the built-in ones.
// Anyone with the grid may read shared views; only the owner renames, changes, shares or deletes one.
import { Op, UniqueConstraintError } from 'sequelize';
import { GridView, User } from '@/models';
import { AppError } from '@/lib/api-errors';
import { BUILTIN_VIEWS, FLEET_GRID, cleanViewName, parseViewState, type ViewState } from './grid-views';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { checkGrid } from './fleet-grid.server';

export interface ViewSummary {
  id: string;
  name: string;
  kind: 'builtin' | 'own' | 'shared';
  shared: boolean;
  ownerName: string | null;
  description: string | null;
  state: ViewState;
  version: number | null;
}

function summary(v: GridView & { owner?: User | null }, viewerId: number): ViewSummary {
  const own = v.ownerId === viewerId;
  return {
    id: String(v.id),
    name: v.name,
    kind: own ? 'own' : 'shared',
    shared: v.shared,
    ownerName: own ? null : (v.owner?.name ?? null),
    description: null,
    // Re-checked on the way out: a view saved before a column was renamed loses only that part.
    state: safeState(v.state),
    version: v.version,
  };
}

function safeState(state: unknown): ViewState {
  try {
    return parseViewState(state);
  } catch {
    return { filterModel: {}, sortModel: [], columns: [] };
  }
}

export async function listViews(user: Pick<SessionUser, 'id'>): Promise<ViewSummary[]> {
  const rows = await GridView.findAll({
    where: { grid: FLEET_GRID, [Op.or]: [{ ownerId: user.id }, { shared: true }] },
    include: [{ model: User, as: 'owner', attributes: ['name'] }],
    order: [
      ['name', 'ASC'],
      ['id', 'ASC'],
    ],
  });
  const builtins: ViewSummary[] = BUILTIN_VIEWS.map((b) => ({
    id: b.id,
    name: b.name,
    kind: 'builtin',
    shared: true,
    ownerName: null,
    description: b.description,
    state: b.state,
    version: null,
  }));
  const own = rows.filter((r) => r.ownerId === user.id).map((r) => summary(r, user.id));
  const shared = rows.filter((r) => r.ownerId !== user.id).map((r) => summary(r, user.id));
  return [...builtins, ...own, ...shared];
}

export interface ViewInput {
  name: string;
  shared: boolean;
  state: unknown;
}

async function ownView(user: Pick<SessionUser, 'id'>, id: number): Promise<GridView> {
  const view = await GridView.findOne({ where: { id, grid: FLEET_GRID } });
  if (!view || (view.ownerId !== user.id && !view.shared)) throw new AppError('not_found', 'There is no such saved view.');
  if (view.ownerId !== user.id) throw new AppError('forbidden', 'Only the planner who saved this view can change or delete it. Save a copy under your own name instead.');
  return view;
}

async function nameTaken<T>(name: string, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new AppError('duplicate', `You already have a view called “${name}”. Choose another name.`);
    throw err;
  }
}

export async function createView(user: Pick<SessionUser, 'id'>, input: ViewInput): Promise<ViewSummary> {
  const state = checkGrid(() => parseViewState(input.state));
  const name = cleanViewName(input.name);
  const view = await nameTaken(name, () => GridView.create({ ownerId: user.id, grid: FLEET_GRID, name, shared: input.shared, state }));
  return summary(view, user.id);
}

export async function updateView(user: Pick<SessionUser, 'id'>, id: number, patch: Partial<ViewInput> & { version: number }): Promise<ViewSummary> {
  const view = await ownView(user, id);
  if (view.version !== patch.version) throw new AppError('changed_meanwhile', 'This view was changed meanwhile (perhaps in another tab). Reload and try again.');
  if (patch.name !== undefined) view.name = cleanViewName(patch.name);
  if (patch.shared !== undefined) view.shared = patch.shared;
  if (patch.state !== undefined) view.state = checkGrid(() => parseViewState(patch.state));
  await nameTaken(view.name, () => view.save());
  return summary(view, user.id);
}

export async function deleteView(user: Pick<SessionUser, 'id'>, id: number): Promise<void> {
  const view = await ownView(user, id);
  await view.destroy();
}
