/**
 * What the planner sets on the repositioning page (in its query string, so a plan can be linked): the horizon, the
 * cost of a truck per road km and the road factor over great-circle distance. The defaults are common practice
 * figures, not sourced; the operator's own haulage rates belong here.
 */
import { z } from 'zod';
import { DEFAULT_ROAD_FACTOR } from './lane-costs';

export const PLAN_DEFAULTS = { horizonDays: 14, costPerKm: 1.6, roadFactor: DEFAULT_ROAD_FACTOR } as const;
/** The solver's limits per stage: the page answers within a few seconds even on a large pool. */
export const PLAN_TIME_LIMIT_SECONDS = 4;
export const PLAN_MIP_REL_GAP = 0.01;

const number = (min: number, max: number, what: string) =>
  z.coerce
    .number({ invalid_type_error: `${what} must be a number` })
    .min(min, `${what} is at least ${min}`)
    .max(max, `${what} is at most ${max}`);

export const planSettingsSchema = z.object({
  horizonDays: number(1, 60, 'The horizon').int('The horizon is a whole number of days').default(PLAN_DEFAULTS.horizonDays),
  costPerKm: number(0.05, 20, 'The cost per km').default(PLAN_DEFAULTS.costPerKm),
  roadFactor: number(1, 3, 'The road factor').default(PLAN_DEFAULTS.roadFactor),
});

export interface PlanSettings extends z.infer<typeof planSettingsSchema> {
  timeLimitSeconds: number;
  mipRelGap: number;
}

/** The page's settings from its query string, or the problems with them (empty fields take the defaults). */
export function parsePlanSettings(params: URLSearchParams): { ok: true; settings: PlanSettings } | { ok: false; problems: string[]; settings: PlanSettings } {
  const raw = Object.fromEntries(['horizonDays', 'costPerKm', 'roadFactor'].flatMap((k) => (params.get(k)?.trim() ? [[k, params.get(k)!.trim()]] : [])));
  const parsed = planSettingsSchema.safeParse(raw);
  const limits = { timeLimitSeconds: PLAN_TIME_LIMIT_SECONDS, mipRelGap: PLAN_MIP_REL_GAP };
  if (parsed.success) return { ok: true, settings: { ...parsed.data, ...limits } };
  return { ok: false, problems: parsed.error.issues.map((i) => i.message), settings: { ...PLAN_DEFAULTS, ...limits } };
}
