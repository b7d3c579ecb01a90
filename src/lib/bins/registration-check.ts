// What makes a bin registration acceptable, checked without the database: the
// GRAI (check digit, serial), the UN mark, the months, and whether the bin type
// and depot that were looked up fit. Shared by the one-bin form, the CSV
// import and the edit form, so all three refuse the same things with the same
// words. src/lib/bins/bin-register.server.ts adds what needs the database.
//
// Pure: no I/O, no clock.
import { formatGrai, parseSerialisedGrai } from '@/lib/gs1';
import { parseUnMarking } from './un-marking';

export interface RegisterBinInput {
  grai: string;
  binTypeId: number;
  siteId: number;
  /** 'YYYY-MM'; may be left out when a UN mark gives it. */
  manufactureMonth?: string | null;
  unMarking?: string | null;
  lastIntermediateTestMonth?: string | null;
  lastFullInspectionMonth?: string | null;
  /** 'YYYY-MM' the inner receptacle was made, for a type under ADR 4.1.1.15; left out: the bin's own month. */
  innerMadeMonth?: string | null;
}

export interface RegisterIssue {
  field: string;
  message: string;
}

const YEAR_MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;

export function isMonth(value: string): boolean {
  return YEAR_MONTH.test(value);
}

/**
 * A month as typed or exported: 'YYYY-MM' stays; a spreadsheet that turned
 * the cell into a date ('2024-03-01') is read as that month. Anything else is
 * returned trimmed for the checks to refuse with a reason.
 */
export function normaliseMonth(text: string | null | undefined): string {
  const value = (text ?? '').trim();
  const asDate = /^(\d{4}-\d{2})-\d{2}$/.exec(value);
  return asDate ? asDate[1]! : value;
}

/** Checks one registration without writing; returns the problems found (empty = fine). */
export function checkRegistration(
  input: Omit<RegisterBinInput, 'binTypeId' | 'siteId'>,
  prefixLength: number,
): { issues: RegisterIssue[]; grai?: string; serial?: string; manufactureMonth?: string } {
  const issues: RegisterIssue[] = [];
  const parsed = parseSerialisedGrai(input.grai, { companyPrefixLength: prefixLength });
  if (!parsed.ok) issues.push({ field: 'grai', message: parsed.error.message });
  let manufactureMonth = input.manufactureMonth ?? undefined;
  if (input.unMarking) {
    const mark = parseUnMarking(input.unMarking);
    if (!mark.ok) issues.push({ field: 'unMarking', message: mark.error.message });
    else {
      const fromMark = `${mark.marking.manufacture.year}-${String(mark.marking.manufacture.month).padStart(2, '0')}`;
      if (manufactureMonth && manufactureMonth !== fromMark) {
        issues.push({ field: 'manufactureMonth', message: `The UN mark says manufactured ${fromMark}, not ${manufactureMonth}.` });
      }
      manufactureMonth ??= fromMark;
    }
  }
  if (!manufactureMonth) issues.push({ field: 'manufactureMonth', message: 'Give the month of manufacture (YYYY-MM) or a UN mark that carries it.' });
  else if (!isMonth(manufactureMonth)) issues.push({ field: 'manufactureMonth', message: 'Month of manufacture must look like 2024-03.' });
  if (input.innerMadeMonth && !isMonth(input.innerMadeMonth)) {
    issues.push({ field: 'innerMadeMonth', message: 'The inner receptacle’s month looks like 2024-03.' });
  }
  for (const key of ['lastIntermediateTestMonth', 'lastFullInspectionMonth'] as const) {
    const v = input[key];
    if (v && (!isMonth(v) || (manufactureMonth && v < manufactureMonth))) {
      issues.push({ field: key, message: 'A test month looks like 2025-06 and is not before manufacture.' });
    }
  }
  return parsed.ok ? { issues, grai: parsed.grai.value, serial: parsed.grai.serial, manufactureMonth } : { issues, manufactureMonth };
}

/**
 * The GRAI of a bin from the operator's company prefix, the bin type's GRAI
 * asset type and the bin's serial; the check digit is computed. The asset
 * type fills the digits the prefix leaves of the 12 (leading zeros pad it).
 */
export function graiFromSerial(companyPrefix: string, assetType: string, serial: string): { ok: true; grai: string } | { ok: false; message: string } {
  const trimmed = serial.trim();
  if (trimmed === '') return { ok: false, message: "Give the bin's serial (as printed on its plate)." };
  const width = 12 - companyPrefix.length;
  if (assetType.length > width) {
    return {
      ok: false,
      message: `The bin type's GRAI asset type ${assetType} has ${assetType.length} digits; with a ${companyPrefix.length}-digit company prefix it may have ${width}.`,
    };
  }
  try {
    return { ok: true, grai: formatGrai({ companyPrefix, assetType: assetType.padStart(width, '0'), serial: trimmed }) };
  } catch (e) {
    return { ok: false, message: (e as Error).message };
  }
}

export interface BinTypeRef {
  id: number;
  code: string;
  unCode: string | null;
  active: boolean;
}

export interface SiteRef {
  id: number;
  code: string;
  kind: string;
  active: boolean;
}

/** A UN mark's type code must be the bin type's own, when the bin type names one. */
export function checkMarkAgainstType(unMarking: string | null | undefined, binType: BinTypeRef): RegisterIssue | null {
  if (!unMarking || !binType.unCode) return null;
  const mark = parseUnMarking(unMarking);
  if (!mark.ok) return null; // the mark's own problem is reported by checkRegistration
  const code = mark.marking.typeCode.equivalentSpecification ? mark.marking.typeCode.code.slice(0, -1) : mark.marking.typeCode.code;
  if (code === binType.unCode.toUpperCase()) return null;
  return { field: 'unMarking', message: `The mark's type code is ${code}, but bin type ${binType.code} is ${binType.unCode}.` };
}

/** A bin type to register (or re-type) a bin with: it must exist and still be in use. */
export function checkBinType(binType: BinTypeRef | undefined, label: string): RegisterIssue | null {
  if (!binType) return { field: 'binTypeId', message: `Unknown bin type${label ? ` "${label}"` : ''}.` };
  if (!binType.active) return { field: 'binTypeId', message: `Bin type ${binType.code} is no longer in use; choose a current one.` };
  return null;
}

/** The site a new bin stands at: it must be an open depot. */
export function checkDepot(site: SiteRef | undefined, label: string): RegisterIssue | null {
  if (!site) return { field: 'siteId', message: `Unknown depot${label ? ` "${label}"` : ''}.` };
  if (site.kind !== 'depot') return { field: 'siteId', message: `${site.code} is a ${site.kind} site; bins are registered at a depot.` };
  if (!site.active) return { field: 'siteId', message: `Depot ${site.code} is closed; choose an open depot.` };
  return null;
}

/**
 * The inspection columns a bin keeps from the two test months (as marked on
 * the bin): the last leakproofness test (the 2.5-year clock), the last 5-year
 * inspection, and the later of the two as the last inspection of any kind,
 * each as the first day of its month. Each clock restarts only from its own
 * test (inspection-due.ts).
 */
export function testColumns(
  lastIntermediateTestMonth: string | null | undefined,
  lastFullInspectionMonth: string | null | undefined,
): { lastInspectionOn: string | null; lastLeakTestOn: string | null; lastFullInspectionOn: string | null } {
  const latest = [lastIntermediateTestMonth, lastFullInspectionMonth]
    .filter((m): m is string => !!m)
    .sort()
    .pop();
  return {
    lastInspectionOn: latest ? `${latest}-01` : null,
    lastLeakTestOn: lastIntermediateTestMonth ? `${lastIntermediateTestMonth}-01` : null,
    lastFullInspectionOn: lastFullInspectionMonth ? `${lastFullInspectionMonth}-01` : null,
  };
}

/** The two test months as the edit form shows them, read back from a bin's columns. */
export function testMonthsOf(bin: { lastLeakTestOn: string | null; lastFullInspectionOn: string | null }): {
  lastIntermediateTestMonth: string | null;
  lastFullInspectionMonth: string | null;
} {
  return { lastIntermediateTestMonth: bin.lastLeakTestOn?.slice(0, 7) ?? null, lastFullInspectionMonth: bin.lastFullInspectionOn?.slice(0, 7) ?? null };
}

/**
 * The inner receptacle's month stored for a bin: what was given, else — for a type under ADR 4.1.1.15 — the bin's
 * own manufacture month (a composite's inner receptacle is usually made with it; common practice), else none.
 */
export function innerMadeMonthFor(given: string | null | undefined, manufactureMonth: string, serviceLifeApplies: boolean): string | null {
  if (given) return given;
  return serviceLifeApplies ? manufactureMonth : null;
}
