/**
 * How full a bin may be filled, and whether a planned fill fits: the degree of
 * filling of ADR/RID 4.1.1.4 (by the formula or by the initial boiling point),
 * volume from mass and density, the gross-mass check against the bin type's
 * maximum, and for dangerous goods the product's packing group against the
 * mark's letter and the code's contents. Pure: no I/O, no clock.
 *
 * Sources: ADR/RID 4.1.1.4 (98 % at a mean bulk temperature of 50 °C; (a) the
 * boiling-point table for filling at 15 °C; (b) 98 / (1 + α(50 − tF)) with
 * α = (d15 − d50) / (35 × d50)); UN Model Regulations 6.5.2.1.1 (X/Y/Z) and
 * 6.5.1.4 (type codes), read by `@/lib/un-marking`.
 */
import { parseUnMarking } from '@/lib/bins/un-marking';

export type Result<T> = ({ ok: true } & T) | { ok: false; message: string };

/** Never above this at a mean bulk temperature of 50 °C (ADR 4.1.1.4). */
const MAX_FILL_AT_50C_PERCENT = 98;

export interface FormulaInput {
  /** Relative density (g/mL) at 15 °C and at 50 °C. */
  d15: number;
  d50: number;
  /** Mean liquid temperature at filling, °C. */
  fillTempC: number;
}

/** Fill temperatures the formula is used for here: colder is outside the product range, hotter than the 50 °C reference is not covered. */
const FILL_TEMP_RANGE_C = { min: -40, max: 50 } as const;

function finite(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/**
 * ADR 4.1.1.4 (b): degree of filling = 98 / (1 + α(50 − tF)) % of capacity,
 * α = (d15 − d50) / (35 × d50), the mean coefficient of cubic expansion
 * between 15 °C and 50 °C.
 */
export function maxFillPercentByFormula(input: FormulaInput): Result<{ percent: number; alphaPerK: number; basis: string }> {
  const { d15, d50, fillTempC } = input;
  if (!finite(d15) || !finite(d50) || d15 <= 0 || d50 <= 0) {
    return { ok: false, message: 'Both densities, at 15 °C and at 50 °C, must be numbers above 0 (g/mL)' };
  }
  if (d15 < d50) {
    return {
      ok: false,
      message: `The density at 15 °C (${d15}) is below the density at 50 °C (${d50}): a liquid expands when warmed, so check the figures`,
    };
  }
  if (!finite(fillTempC) || fillTempC < FILL_TEMP_RANGE_C.min || fillTempC > FILL_TEMP_RANGE_C.max) {
    return {
      ok: false,
      message: `The filling temperature must be between ${FILL_TEMP_RANGE_C.min} °C and ${FILL_TEMP_RANGE_C.max} °C (hot filling above the 50 °C reference is not covered here)`,
    };
  }
  const alphaPerK = (d15 - d50) / (35 * d50);
  const percent = MAX_FILL_AT_50C_PERCENT / (1 + alphaPerK * (50 - fillTempC));
  return { ok: true, percent, alphaPerK, basis: 'ADR 4.1.1.4 (b): 98 / (1 + α(50 − tF))' };
}

/**
 * ADR 4.1.1.4 (a), for filling at a mean liquid temperature of 15 °C, by the
 * initial boiling point. Each band includes its lower edge.
 */
const BOILING_POINT_BANDS: readonly { fromC: number; belowC: number; percent: number }[] = [
  { fromC: -Infinity, belowC: 60, percent: 90 },
  { fromC: 60, belowC: 100, percent: 92 },
  { fromC: 100, belowC: 200, percent: 94 },
  { fromC: 200, belowC: 300, percent: 96 },
  { fromC: 300, belowC: Infinity, percent: 98 },
];

/** The (a) table: only for filling at 15 °C; at other temperatures use the formula. */
export function maxFillPercentByBoilingPoint(initialBoilingPointC: number): Result<{ percent: number; basis: string }> {
  if (!finite(initialBoilingPointC)) return { ok: false, message: 'The initial boiling point must be a number (°C)' };
  const band = BOILING_POINT_BANDS.find((b) => initialBoilingPointC >= b.fromC && initialBoilingPointC < b.belowC);
  if (!band) return { ok: false, message: 'The initial boiling point must be a number (°C)' };
  const range = band.fromC === -Infinity ? `below ${band.belowC} °C` : band.belowC === Infinity ? `${band.fromC} °C or above` : `${band.fromC} °C to below ${band.belowC} °C`;
  return {
    ok: true,
    percent: band.percent,
    basis: `ADR 4.1.1.4 (a): initial boiling point ${range}, filled at 15 °C`,
  };
}

/** Litres from kilograms and the density at the filling temperature (kg/L = g/mL). */
export function volumeFromMass(massKg: number, densityKgPerL: number): number {
  return massKg / densityKgPerL;
}

function massFromVolume(volumeL: number, densityKgPerL: number): number {
  return volumeL * densityKgPerL;
}

export interface GrossMassCheck {
  grossKg: number;
  maxGrossKg: number;
  /** Positive when under the maximum. */
  marginKg: number;
  fits: boolean;
  message: string;
}

/** Tare + contents against the bin type's maximum permissible gross mass. */
export function checkGrossMass(tareKg: number, contentsKg: number, maxGrossKg: number): GrossMassCheck {
  const grossKg = round1(tareKg + contentsKg);
  const marginKg = round1(maxGrossKg - grossKg);
  const fits = marginKg >= 0;
  return {
    grossKg,
    maxGrossKg,
    marginKg,
    fits,
    message: fits
      ? `Gross ${fmt(grossKg)} kg, ${fmt(marginKg)} kg under the maximum of ${fmt(maxGrossKg)} kg`
      : `Gross ${fmt(grossKg)} kg is ${fmt(-marginKg)} kg over the maximum of ${fmt(maxGrossKg)} kg`,
  };
}

export type PackingGroup = 1 | 2 | 3;
export const PACKING_GROUP_NAMES: Readonly<Record<PackingGroup, string>> = { 1: 'I', 2: 'II', 3: 'III' };

/** Said every time a dangerous-goods check is shown. */
export const DG_NOT_CHECKED =
  'Only the packing group and the liquid code are checked here. The packing instruction, special provisions, ' +
  "material compatibility and the product's other conditions are not checked: confirm them with the " +
  "product's safety data sheet and your dangerous goods safety adviser.";

export interface DangerousGoodsCheck {
  fits: boolean;
  problems: string[];
  notChecked: string;
}

/**
 * A liquid of packing group `packingGroup` in a bin with this UN mark: the
 * mark's letter must admit the group (X: I–III, Y: II–III, Z: III; 6.5.2.1.1)
 * and the type code must be one for liquids (31…, 6.5.1.4).
 */
export function checkDangerousGoods(unMarking: string | null | undefined, packingGroup: PackingGroup): DangerousGoodsCheck {
  const problems: string[] = [];
  if (!unMarking) {
    problems.push('The bin has no UN mark: it may not carry dangerous goods');
    return { fits: false, problems, notChecked: DG_NOT_CHECKED };
  }
  const parsed = parseUnMarking(unMarking);
  if (!parsed.ok) {
    problems.push(`The bin's UN mark cannot be read: ${parsed.error.message}`);
    return { fits: false, problems, notChecked: DG_NOT_CHECKED };
  }
  const { typeCode, packingGroup: approval } = parsed.marking;
  if (typeCode.kind.contents !== 'liquids') {
    problems.push(`${typeCode.code} is an IBC for ${typeCode.kind.meaning}, not for liquids (a liquid needs a 31… code)`);
  }
  if (!approval.packingGroups.includes(packingGroup)) {
    problems.push(`Packing group ${PACKING_GROUP_NAMES[packingGroup]} is not allowed by the mark's letter ${approval.letter} (${approval.meaning})`);
  }
  return { fits: problems.length === 0, problems, notChecked: DG_NOT_CHECKED };
}

/** The cautions every fill screen shows. */
export const FILL_CAUTIONS: readonly string[] = [
  'Never fill above the safe fill level shown here; leave the space the liquid needs to expand.',
  "Follow the product's safety data sheet: wear the protective equipment it names and check the product suits the liner.",
  'Check the liner is seated, the bottom valve is closed and the bin stands level before filling.',
  "Local regulations and the site's licensed procedures come first; this plan is an aid, not an approval.",
];

export type FillLimitBasis = { method: 'formula'; d15: number; d50: number } | { method: 'boiling-point'; initialBoilingPointC: number };

export interface FillPlanInput {
  capacityL: number;
  tareKg: number;
  maxGrossKg: number;
  unMarking?: string | null;
  fillTempC: number;
  /** Density at the filling temperature, kg/L. */
  densityKgPerL: number;
  limit: FillLimitBasis;
  /** The target as a volume or a mass of product. */
  target: { volumeL: number } | { massKg: number };
  /** The liner's maximum filling temperature, when known. */
  linerMaxFillTempC?: number | null;
  /** Dangerous goods only: the product's packing group. */
  packingGroup?: PackingGroup | null;
}

export interface FillPlan {
  maxFillPercent: number;
  maxFillL: number;
  maxFillKg: number;
  limitBasis: string;
  targetL: number;
  targetKg: number;
  targetPercent: number;
  /** True when the target is within the fill limit, the gross mass, the liner and (when given) the dangerous goods check. */
  fits: boolean;
  problems: string[];
  gross: GrossMassCheck;
  /** Most product by mass the bin takes under both limits. */
  maxProductKg: number;
  dangerousGoods?: DangerousGoodsCheck;
  cautions: readonly string[];
}

function round1(value: number): number {
  return Math.round(value * 10) / 10;
}

function fmt(value: number): string {
  return value.toLocaleString('en-GB', { maximumFractionDigits: 1 });
}

/** One fill of one bin: the maximum fill, whether the target fits, and why not. */
export function planFill(input: FillPlanInput): Result<{ plan: FillPlan }> {
  const { capacityL, tareKg, maxGrossKg, fillTempC, densityKgPerL } = input;
  if (!finite(capacityL) || capacityL <= 0) return { ok: false, message: 'The bin capacity must be above 0 L' };
  if (!finite(tareKg) || tareKg < 0 || !finite(maxGrossKg) || maxGrossKg <= tareKg) {
    return { ok: false, message: 'The bin type needs a tare of 0 kg or more and a maximum gross mass above it' };
  }
  if (!finite(densityKgPerL) || densityKgPerL <= 0) {
    return { ok: false, message: 'The density at the filling temperature must be above 0 kg/L' };
  }
  let limit: Result<{ percent: number; basis: string }>;
  if (input.limit.method === 'formula') {
    limit = maxFillPercentByFormula({ d15: input.limit.d15, d50: input.limit.d50, fillTempC });
  } else {
    if (fillTempC !== 15) {
      return {
        ok: false,
        message: `The boiling-point table of ADR 4.1.1.4 (a) is for filling at 15 °C; at ${fillTempC} °C give the densities at 15 °C and 50 °C for the formula`,
      };
    }
    limit = maxFillPercentByBoilingPoint(input.limit.initialBoilingPointC);
  }
  if (!limit.ok) return limit;

  const targetL = 'volumeL' in input.target ? input.target.volumeL : volumeFromMass(input.target.massKg, densityKgPerL);
  if (!finite(targetL) || targetL <= 0) return { ok: false, message: 'The target must be a volume or a mass above 0' };
  const targetKg = 'massKg' in input.target ? input.target.massKg : massFromVolume(targetL, densityKgPerL);

  const maxFillL = (capacityL * limit.percent) / 100;
  const maxFillKg = massFromVolume(maxFillL, densityKgPerL);
  const maxProductKg = Math.min(maxFillKg, maxGrossKg - tareKg);
  const gross = checkGrossMass(tareKg, targetKg, maxGrossKg);
  const problems: string[] = [];
  if (targetL > maxFillL + 1e-9) {
    problems.push(`${fmt(round1(targetL))} L is over the maximum fill of ${fmt(round1(maxFillL))} L (${limit.percent.toFixed(2)} % of ${capacityL} L)`);
  }
  if (!gross.fits) problems.push(gross.message);
  if (input.linerMaxFillTempC !== undefined && input.linerMaxFillTempC !== null && fillTempC > input.linerMaxFillTempC) {
    problems.push(`Filling at ${fillTempC} °C is above the liner's maximum of ${input.linerMaxFillTempC} °C`);
  }
  let dangerousGoods: DangerousGoodsCheck | undefined;
  if (input.packingGroup) {
    dangerousGoods = checkDangerousGoods(input.unMarking, input.packingGroup);
    problems.push(...dangerousGoods.problems);
  }
  const plan: FillPlan = {
    maxFillPercent: limit.percent,
    maxFillL,
    maxFillKg,
    limitBasis: limit.basis,
    targetL,
    targetKg,
    targetPercent: (targetL / capacityL) * 100,
    fits: problems.length === 0,
    problems,
    gross,
    maxProductKg,
    cautions: FILL_CAUTIONS,
  };
  if (dangerousGoods) plan.dangerousGoods = dangerousGoods;
  return { ok: true, plan };
}
