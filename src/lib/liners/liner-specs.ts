/**
 * Liner specs: what a liner is, and whether it suits a bin type. Pure, no I/O.
 *
 * A bin type lists the specs that fit it (admin page). A lot whose spec is not listed is refused at the
 * fit, and the reason names what differs from the specs that are listed, in the order a yard hand would
 * check it: the capacity (a liner sized for another bin folds or overstretches), then the bottom valve
 * (type and size must mate with the bin's outlet), then the top gland (the fill opening). A bin type
 * with no specs listed takes any liner (not set up yet), and a lot recorded before specs existed
 * (no spec) is not checked.
 */

export const VALVE_TYPES = ['none', 'butterfly', 'ball', 'spout'] as const;
export type ValveType = (typeof VALVE_TYPES)[number];
export const VALVE_TYPE_LABEL: Record<ValveType, string> = {
  none: 'no bottom valve (top discharge)',
  butterfly: 'butterfly valve',
  ball: 'ball valve',
  spout: 'plain spout',
};

/** A connection size as written on the part: a flange DN (DN50, DN80 …) or a thread, S + diameter x pitch in mm (S60x6). */
export const SIZE_PATTERN = /^(DN[0-9]{2,3}|S[0-9]{2,3}x[0-9]{1,2})$/;

/** Normalises a typed size ("dn 50", "s60X6") to the written form, or null when it is not one. */
export function connectionSize(text: string): string | null {
  const t = text
    .trim()
    .replace(/\s+/g, '')
    .toUpperCase()
    .replace(/^(S[0-9]{2,3})X/, '$1x');
  return SIZE_PATTERN.test(t) ? t : null;
}

export interface SpecFacts {
  id: number;
  code: string;
  nominalCapacityL: number;
  valveType: ValveType;
  valveSize: string | null;
  glandSize: string;
}

export type SpecFit = { ok: true } | { ok: false; code: 'liner_capacity' | 'liner_valve' | 'liner_gland' | 'liner_not_listed'; reason: string };

const litres = (n: number) => `${n.toLocaleString('en-GB')} L`;
const valve = (s: Pick<SpecFacts, 'valveType' | 'valveSize'>) => (s.valveType === 'none' ? VALVE_TYPE_LABEL.none : `${s.valveSize} ${VALVE_TYPE_LABEL[s.valveType]}`);
const list = (items: string[]) => [...new Set(items)].join(' or ');

/** May a liner of `spec` go into a bin of this type, given the specs the type lists? */
export function specFitsBinType(spec: SpecFacts | null, binTypeName: string, listed: readonly SpecFacts[]): SpecFit {
  if (!spec || listed.length === 0 || listed.some((s) => s.id === spec.id)) return { ok: true };
  const lead = `Liner spec ${spec.code} does not fit ${binTypeName}:`;
  const sameCapacity = listed.filter((s) => s.nominalCapacityL === spec.nominalCapacityL);
  if (!sameCapacity.length) {
    return {
      ok: false,
      code: 'liner_capacity',
      reason: `${lead} it is a ${litres(spec.nominalCapacityL)} liner; this bin takes ${list(listed.map((s) => litres(s.nominalCapacityL)))}. Take a liner from another lot.`,
    };
  }
  const sameValve = sameCapacity.filter((s) => s.valveType === spec.valveType && s.valveSize === spec.valveSize);
  if (!sameValve.length) {
    return {
      ok: false,
      code: 'liner_valve',
      reason: `${lead} its valve is ${valve(spec)}; this bin's outlet takes ${list(sameCapacity.map(valve))}. Take a liner from another lot.`,
    };
  }
  const sameGland = sameValve.filter((s) => s.glandSize === spec.glandSize);
  if (!sameGland.length) {
    return {
      ok: false,
      code: 'liner_gland',
      reason: `${lead} its fill gland is ${spec.glandSize}; this bin's lid takes ${list(sameValve.map((s) => s.glandSize))}. Take a liner from another lot.`,
    };
  }
  return {
    ok: false,
    code: 'liner_not_listed',
    reason: `${lead} the spec is not listed for this bin type (its capacity, valve and gland match a listed spec; ask a planner to list it). Take a liner from another lot.`,
  };
}

/** A one-line description of a spec, as lists and the fit form show it. */
export function describeSpec(s: SpecFacts & { material: string; layers: number; foodContact: boolean; maxFillTempC: number | null }): string {
  const grade = s.foodContact ? `food contact${s.maxFillTempC === null ? '' : ` to ${s.maxFillTempC} °C`}` : 'not for food';
  return `${litres(s.nominalCapacityL)} ${s.material}, ${s.layers} layer${s.layers === 1 ? '' : 's'}, ${valve(s)}, gland ${s.glandSize}, ${grade}`;
}

/** Does a spec meet the liner grade a hire order asks for (food contact; filling temperature)? */
export function specMeetsGrade(s: { foodContact: boolean; maxFillTempC: number | null }, need: { foodContact: boolean; maxFillTempC: number | null }): boolean {
  if (need.foodContact && !s.foodContact) return false;
  if (need.maxFillTempC !== null && (s.maxFillTempC === null || s.maxFillTempC < need.maxFillTempC)) return false;
  return true;
}
