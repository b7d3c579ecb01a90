/**
 * Reads the primary UN mark of an IBC (UN Model Regulations 6.5.2.1.1; the
 * same text stands in ADR/RID 6.5.2.1.1), e.g. `11A/Y/02 99/NL/<maker>/5500/1500`:
 *   UN symbol · type code (6.5.1.4) · packing-group letter · month and year of
 *   manufacture · State (vehicle sign) · manufacturer · stacking test load kg ·
 *   maximum permissible gross mass kg.
 * Pure: no I/O, no clock, no libraries.
 */

// ---------------------------------------------------------------------------
// Type codes (6.5.1.4)
// ---------------------------------------------------------------------------

/** 6.5.1.4.1 (a): the two digits give form (rigid/flexible) and contents. */
export type IbcKindDigits = '11' | '21' | '31' | '13';

export interface IbcKind {
  digits: IbcKindDigits;
  form: 'rigid' | 'flexible';
  contents: 'solids-by-gravity' | 'solids-under-pressure' | 'liquids';
  meaning: string;
}

const KINDS: Record<IbcKindDigits, IbcKind> = {
  '11': { digits: '11', form: 'rigid', contents: 'solids-by-gravity', meaning: 'solids, filled or discharged by gravity' },
  '21': {
    digits: '21',
    form: 'rigid',
    contents: 'solids-under-pressure',
    meaning: 'solids, filled or discharged under pressure of more than 10 kPa',
  },
  '31': { digits: '31', form: 'rigid', contents: 'liquids', meaning: 'liquids' },
  // Flexible IBCs carry solids only, filled or discharged by gravity (the
  // 6.5.1.4.1 (a) table has no flexible code for pressure or liquids; from memory).
  '13': { digits: '13', form: 'flexible', contents: 'solids-by-gravity', meaning: 'solids, filled or discharged by gravity' },
};

/** 6.5.1.4.1 (b): material letters. */
export type IbcMaterialLetter = 'A' | 'B' | 'C' | 'D' | 'F' | 'G' | 'H' | 'L' | 'M' | 'N';

const IBC_MATERIALS: Readonly<Record<IbcMaterialLetter, string>> = {
  A: 'steel',
  B: 'aluminium',
  C: 'natural wood',
  D: 'plywood',
  F: 'reconstituted wood',
  G: 'fibreboard',
  H: 'plastics',
  L: 'textile',
  M: 'paper, multiwall',
  N: 'metal other than steel or aluminium',
};

function isMaterialLetter(letter: string): letter is IbcMaterialLetter {
  return Object.hasOwn(IBC_MATERIALS, letter);
}

export type IbcFamily = 'metal' | 'rigid-plastics' | 'composite' | 'fibreboard' | 'wooden' | 'flexible';

export interface IbcTypeCode {
  /** As written, upper case, including a trailing W when present. */
  code: string;
  kind: IbcKind;
  family: IbcFamily;
  /** Material of a single-material IBC, or of a composite's outer casing. */
  material: IbcMaterialLetter;
  materialName: string;
  /** Composite IBCs only: the inner receptacle's material (plastics). */
  innerMaterial?: IbcMaterialLetter;
  /** The trailing category digit, where the code has one. */
  category?: number;
  /** 6.5.1.4.4 (from memory): W = made to a different specification, accepted as equivalent. */
  equivalentSpecification: boolean;
  /** Readable English meaning, e.g. "Composite IBC for liquids: …". */
  meaning: string;
}

/**
 * One entry per code that 6.5.1.4.3 assigns. The table is written from memory
 * of the regulation's table (its structure is confirmed by the published
 * examples 11A and 31HA1): metal 11/21/31 A, B, N without category digit;
 * rigid plastics 11/21/31 H1 (fitted with structural equipment) and H2
 * (freestanding); composite 11/21/31 HZ1 (rigid plastics inner receptacle)
 * and HZ2 (flexible plastics inner receptacle), Z being the outer casing's
 * letter; fibreboard 11G; wooden 11C, 11D, 11F (with inner liner);
 * flexible 13H1–13H5, 13L1–13L4, 13M1–13M2.
 */
interface CodeEntry {
  family: IbcFamily;
  material: IbcMaterialLetter;
  innerMaterial?: IbcMaterialLetter;
  category?: number;
  detail: string;
}

/**
 * Composite outer casings: the regulation replaces Z by any material letter;
 * we accept the rigid ones only, since a composite IBC's outer casing is rigid
 * structural equipment (our reading; textile and paper are left out).
 */
const COMPOSITE_OUTER: readonly IbcMaterialLetter[] = ['A', 'B', 'C', 'D', 'F', 'G', 'H', 'N'];

const FLEXIBLE_DETAILS: Record<string, string> = {
  H1: 'woven plastics, without coating or liner',
  H2: 'woven plastics, coated',
  H3: 'woven plastics, with liner',
  H4: 'woven plastics, coated and with liner',
  H5: 'plastics film',
  L1: 'textile, without coating or liner',
  L2: 'textile, coated',
  L3: 'textile, with liner',
  L4: 'textile, coated and with liner',
  M1: 'paper, multiwall',
  M2: 'paper, multiwall, water resistant',
};

function buildCodeTable(): Map<string, CodeEntry> {
  const table = new Map<string, CodeEntry>();
  const rigidKinds: IbcKindDigits[] = ['11', '21', '31'];
  for (const kind of rigidKinds) {
    for (const metal of ['A', 'B', 'N'] as const) {
      table.set(`${kind}${metal}`, { family: 'metal', material: metal, detail: IBC_MATERIALS[metal] });
    }
    table.set(`${kind}H1`, { family: 'rigid-plastics', material: 'H', category: 1, detail: 'fitted with structural equipment' });
    table.set(`${kind}H2`, { family: 'rigid-plastics', material: 'H', category: 2, detail: 'freestanding' });
    for (const outer of COMPOSITE_OUTER) {
      for (const category of [1, 2]) {
        const inner = category === 1 ? 'rigid' : 'flexible';
        table.set(`${kind}H${outer}${category}`, {
          family: 'composite',
          material: outer,
          innerMaterial: 'H',
          category,
          detail: `${inner} plastics inner receptacle, ${IBC_MATERIALS[outer]} outer casing`,
        });
      }
    }
  }
  table.set('11G', { family: 'fibreboard', material: 'G', detail: 'fibreboard' });
  for (const wood of ['C', 'D', 'F'] as const) {
    table.set(`11${wood}`, { family: 'wooden', material: wood, detail: `${IBC_MATERIALS[wood]}, with inner liner` });
  }
  for (const [suffix, detail] of Object.entries(FLEXIBLE_DETAILS)) {
    const material = suffix.charAt(0) as IbcMaterialLetter;
    table.set(`13${suffix}`, { family: 'flexible', material, category: Number(suffix.slice(1)), detail });
  }
  return table;
}

const CODE_TABLE = buildCodeTable();

const FAMILY_NOUN: Record<IbcFamily, string> = {
  metal: 'Metal IBC',
  'rigid-plastics': 'Rigid plastics IBC',
  composite: 'Composite IBC',
  fibreboard: 'Fibreboard IBC',
  wooden: 'Wooden IBC',
  flexible: 'Flexible IBC',
};

export type UnMarkingErrorCode =
  | 'empty'
  | 'missing-field'
  | 'unknown-type-code'
  | 'bad-packing-group'
  | 'packing-group-not-allowed'
  | 'bad-month'
  | 'bad-year'
  | 'bad-state'
  | 'non-numeric-mass'
  | 'zero-gross-mass'
  | 'stack-load-without-gross-mass';

export interface UnMarkingError {
  code: UnMarkingErrorCode;
  message: string;
}

type Failure = { ok: false; error: UnMarkingError };

function fail(code: UnMarkingErrorCode, message: string): Failure {
  return { ok: false, error: { code, message } };
}

/** Explains why a code is not in the table, naming the nearest thing that is wrong. */
function unknownCode(code: string): Failure {
  const shape = /^(\d{2})([A-Z]{1,2})(\d?)$/.exec(code);
  const kindDigits = shape?.[1];
  if (!shape || kindDigits === undefined) {
    return fail('unknown-type-code', `"${code}" is not shaped like an IBC code (two digits, material letter(s), category digit)`);
  }
  if (!Object.hasOwn(KINDS, kindDigits)) {
    return fail('unknown-type-code', `"${code}": ${kindDigits} is not an IBC type (11, 21, 31 rigid; 13 flexible)`);
  }
  const letters = shape[2] ?? '';
  const badLetter = Array.from(letters).find((letter) => !isMaterialLetter(letter));
  if (badLetter !== undefined) {
    return fail('unknown-type-code', `"${code}": ${badLetter} is not an IBC material letter (A B C D F G H L M N)`);
  }
  const sameMaterial = [...CODE_TABLE.keys()].filter((known) => known.slice(2).replace(/\d$/, '') === letters);
  const hint = sameMaterial.length > 0 ? `; codes with ${letters}: ${sameMaterial.join(', ')}` : '';
  return fail('unknown-type-code', `"${code}" is not an IBC code assigned in 6.5.1.4.3${hint}`);
}

/** Reads a type code such as 11A, 31H2, 31HA1 or 13H3, with an optional trailing W. */
export function parseUnTypeCode(text: string): { ok: true; typeCode: IbcTypeCode } | Failure {
  const written = text.trim().toUpperCase();
  if (written === '') return fail('missing-field', 'No IBC type code given');
  const equivalentSpecification = written.length > 3 && written.endsWith('W');
  const code = equivalentSpecification ? written.slice(0, -1) : written;
  const entry = CODE_TABLE.get(code);
  if (!entry) return unknownCode(code);
  const kind = KINDS[code.slice(0, 2) as IbcKindDigits];
  const contents = kind.form === 'flexible' ? 'solids' : kind.meaning.replace(/, filled or discharged/, ' filled or discharged');
  const w = equivalentSpecification ? ' (W: made to a different specification, accepted as equivalent)' : '';
  const typeCode: IbcTypeCode = {
    code: written,
    kind,
    family: entry.family,
    material: entry.material,
    materialName: IBC_MATERIALS[entry.material],
    equivalentSpecification,
    meaning: `${FAMILY_NOUN[entry.family]} for ${contents}: ${entry.detail}${w}`,
  };
  if (entry.innerMaterial !== undefined) typeCode.innerMaterial = entry.innerMaterial;
  if (entry.category !== undefined) typeCode.category = entry.category;
  return { ok: true, typeCode };
}

/**
 * Readable English meaning of a type code, e.g. 31HA1 → "Composite IBC for
 * liquids: rigid plastics inner receptacle, steel outer casing";
 * undefined for a code 6.5.1.4.3 does not assign.
 */
export function describeUnCode(code: string): string | undefined {
  const result = parseUnTypeCode(code);
  return result.ok ? result.typeCode.meaning : undefined;
}

// ---------------------------------------------------------------------------
// Packing-group letter (6.5.2.1.1 (c))
// ---------------------------------------------------------------------------

export type PackingGroupLetter = 'X' | 'Y' | 'Z';

export interface PackingGroupApproval {
  letter: PackingGroupLetter;
  /** Packing groups (I = 1, II = 2, III = 3) the design type is approved for. */
  packingGroups: readonly (1 | 2 | 3)[];
  meaning: string;
}

const PACKING_GROUPS: Record<PackingGroupLetter, PackingGroupApproval> = {
  X: { letter: 'X', packingGroups: [1, 2, 3], meaning: 'packing groups I, II and III (IBCs for solids only)' },
  Y: { letter: 'Y', packingGroups: [2, 3], meaning: 'packing groups II and III' },
  Z: { letter: 'Z', packingGroups: [3], meaning: 'packing group III only' },
};

// ---------------------------------------------------------------------------
// The whole mark
// ---------------------------------------------------------------------------

export interface UnIbcMarking {
  typeCode: IbcTypeCode;
  packingGroup: PackingGroupApproval;
  /** Month (1–12) and four-digit year of manufacture. */
  manufacture: { month: number; year: number };
  /** Distinguishing sign for vehicles in international road traffic, e.g. NL, D. */
  state: string;
  /** Manufacturer's name or symbol and identification, as written. */
  manufacturer: string;
  /** 0 = not designed for stacking. */
  stackingTestLoadKg: number;
  maxGrossMassKg: number;
  /** How many IBCs of the same maximum gross mass may stand on this one (6.5.6.6.4). */
  maxIbcsStackedOnTop: number;
}

export type UnMarkingResult = { ok: true; marking: UnIbcMarking } | Failure;

export interface UnMarkingOptions {
  /**
   * Year the mark is read in: a two-digit year is taken as the latest year not
   * after it. Without it, 90–99 are 1990s and 00–89 are 2000s (our fixed
   * window; no UN IBC mark predates 1990).
   */
  referenceYear?: number;
}

/** The UN packaging symbol written as text: "UN", "(UN)", "(u n)", "u n". */
const UN_SYMBOL = /^\s*(?:\(\s*u\s*n\s*\)|u\s?n(?=[\s/(]|\d|$))[\s/]*/i;

function fullYear(twoDigits: number, referenceYear: number | undefined): number {
  if (referenceYear === undefined) return twoDigits >= 90 ? 1900 + twoDigits : 2000 + twoDigits;
  const century = Math.floor(referenceYear / 100) * 100;
  const candidate = century + twoDigits;
  return candidate > referenceYear ? candidate - 100 : candidate;
}

function readDate(monthText: string, yearText: string, opts: UnMarkingOptions): { month: number; year: number } | Failure {
  if (!/^\d{1,2}$/.test(monthText)) return fail('bad-month', `Month of manufacture "${monthText}" is not a number 01–12`);
  const month = Number(monthText);
  if (month < 1 || month > 12) return fail('bad-month', `Month of manufacture ${monthText} is outside 01–12`);
  if (/^\d{4}$/.test(yearText)) return { month, year: Number(yearText) };
  if (!/^\d{2}$/.test(yearText)) {
    return fail('bad-year', `Year of manufacture "${yearText}" is not its last two digits`);
  }
  return { month, year: fullYear(Number(yearText), opts.referenceYear) };
}

function readMass(text: string, what: string): number | Failure {
  if (!/^\d+$/.test(text)) return fail('non-numeric-mass', `${what} "${text}" is not a whole number of kilograms`);
  return Number(text);
}

/** The eight fields of a mark as written, before they are checked. */
interface RawFields {
  typeCode: string;
  packingGroup: string;
  month: string;
  year: string;
  state: string;
  manufacturer: string;
  stackLoad: string;
  grossMass: string;
}

const FIELD_NAMES = 'type code, packing-group letter, month and year, State, manufacturer, stacking test load, maximum gross mass';

/**
 * With slashes (as in the published examples) fields are `/`-separated; month
 * and year share a field (space) or stand in two. Without slashes, fields are
 * taken by position from both ends, so there a missing number cannot be told
 * from a numeric manufacturer identification: prefer slashes.
 */
function splitFields(mark: string): RawFields | Failure {
  const slashMode = mark.includes('/');
  const fields = slashMode ? mark.split('/').map((field) => field.trim().replace(/\s+/g, ' ')) : mark.split(/\s+/);
  const empty = fields.indexOf('');
  if (empty >= 0) return fail('missing-field', `Field ${empty + 1} of the mark is empty; expected ${FIELD_NAMES}`);
  const [typeCode = '', packingGroup = '', dateField = ''] = fields;
  const dateParts = slashMode ? dateField.split(' ') : [dateField];
  const dateInOneField = dateParts.length === 2;
  const needed = dateInOneField ? 7 : 8;
  if (fields.length < needed) {
    return fail('missing-field', `The mark has ${fields.length} fields; a complete one has ${needed}: ${FIELD_NAMES}`);
  }
  const rest = fields.slice(dateInOneField ? 3 : 4);
  return {
    typeCode,
    packingGroup,
    month: dateInOneField ? (dateParts[0] ?? '') : dateField,
    year: dateInOneField ? (dateParts[1] ?? '') : (fields[3] ?? ''),
    state: rest[0] ?? '',
    manufacturer: rest.slice(1, -2).join(slashMode ? '/' : ' '),
    stackLoad: rest[rest.length - 2] ?? '',
    grossMass: rest[rest.length - 1] ?? '',
  };
}

/**
 * Marks are often printed over several lines: with slashes in the text a line
 * break separates fields like a slash, without slashes like a space.
 */
function joinLines(text: string): string {
  const joiner = text.includes('/') ? '/' : ' ';
  return text
    .split(/\r?\n/)
    .map((line) =>
      line
        .trim()
        .replace(/^\/|\/$/g, '')
        .trim(),
    )
    .filter((line) => line !== '')
    .join(joiner);
}

function isFailure(value: unknown): value is Failure {
  return typeof value === 'object' && value !== null && 'ok' in value && value.ok === false;
}

/**
 * Stacking test load = 1.8 × combined maximum gross mass of the IBCs that may
 * be stacked on top (6.5.6.6.4), so the number on top is
 * floor(load / (1.8 × gross)); worked in integers (×10/18) to stay exact.
 */
export function ibcsStackableOnTop(stackingTestLoadKg: number, maxGrossMassKg: number): number {
  if (stackingTestLoadKg <= 0 || maxGrossMassKg <= 0) return 0;
  return Math.floor((stackingTestLoadKg * 10) / (maxGrossMassKg * 18));
}

/**
 * Reads a UN IBC mark such as `UN 31HA1/Y/05 01/D/<maker>/10800/1200`.
 * The leading UN symbol text is optional.
 */
export function parseUnMarking(text: string, opts: UnMarkingOptions = {}): UnMarkingResult {
  const mark = joinLines(text)
    .replace(UN_SYMBOL, '')
    .replace(/^[\s/]+|[\s/]+$/g, '');
  if (mark === '') return fail('empty', 'No UN mark given');
  const raw = splitFields(mark);
  if (isFailure(raw)) return raw;

  const type = parseUnTypeCode(raw.typeCode);
  if (!type.ok) return type;
  const { typeCode } = type;

  const letter = raw.packingGroup.toUpperCase();
  if (!Object.hasOwn(PACKING_GROUPS, letter)) {
    return fail('bad-packing-group', `Packing-group letter "${raw.packingGroup}" is not X, Y or Z`);
  }
  const packingGroup = PACKING_GROUPS[letter as PackingGroupLetter];
  if (letter === 'X' && typeCode.kind.contents === 'liquids') {
    return fail('packing-group-not-allowed', `X is for IBCs for solids only; ${typeCode.code} is an IBC for liquids`);
  }

  const manufacture = readDate(raw.month, raw.year, opts);
  if (isFailure(manufacture)) return manufacture;

  const state = raw.state.toUpperCase();
  if (!/^[A-Z]{1,3}$/.test(state)) {
    return fail('bad-state', `State "${raw.state}" is not a vehicle distinguishing sign (1–3 letters)`);
  }

  const stackingTestLoadKg = readMass(raw.stackLoad, 'Stacking test load');
  if (isFailure(stackingTestLoadKg)) return stackingTestLoadKg;
  const maxGrossMassKg = readMass(raw.grossMass, 'Maximum permissible gross mass');
  if (isFailure(maxGrossMassKg)) return maxGrossMassKg;
  if (maxGrossMassKg === 0) {
    return stackingTestLoadKg > 0
      ? fail('stack-load-without-gross-mass', `A stacking test load of ${stackingTestLoadKg} kg is given but the maximum gross mass is 0`)
      : fail('zero-gross-mass', 'The maximum permissible gross mass is 0 kg');
  }

  return {
    ok: true,
    marking: {
      typeCode,
      packingGroup,
      manufacture,
      state,
      manufacturer: raw.manufacturer,
      stackingTestLoadKg,
      maxGrossMassKg,
      maxIbcsStackedOnTop: ibcsStackableOnTop(stackingTestLoadKg, maxGrossMassKg),
    },
  };
}
