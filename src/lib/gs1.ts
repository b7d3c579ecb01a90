/**
 * GS1 Global Returnable Asset Identifier (GRAI, Application Identifier 8003).
 *
 * The AI 8003 value is: one filler digit `0`, then the GS1 Company Prefix and
 * the asset type (12 digits together), a mod-10 check digit, and an optional
 * serial of up to 16 characters from GS1 AI encodable character set 82.
 * Loopfold reads it from three written forms: the bare element string (as
 * typed from a label), a GS1 Digital Link URI (as scanned from the QR) and an
 * EPC pure-identity URI (as exchanged in EPCIS events).
 *
 * Pure: no I/O, no clock, no libraries.
 */

const GRAI_AI = '8003';

/** Filler digit + 12 digits of company prefix and asset type + check digit. */
const FIXED_LENGTH = 14;
const BODY_LENGTH = 12;
const MAX_SERIAL_LENGTH = 16;

/**
 * GS1 Company Prefix lengths that an EPC URI can carry: the Tag Data Standard
 * partition tables run from 6 to 12 digits (from memory of the TDS tables).
 */
const MIN_COMPANY_PREFIX_LENGTH = 6;
const MAX_COMPANY_PREFIX_LENGTH = 12;

/**
 * GS1 AI encodable character set 82: `! " % & ' ( ) * + , - . /`, digits,
 * `: ; < = > ?`, capital letters, `_`, small letters. No space, `#`, `$`, `@`,
 * brackets, backslash, `^`, backquote, braces, `|` or `~`.
 */
const CS82_CHAR = /^[!"%&'()*+,\-./0-9:;<=>?A-Z_a-z]$/;

export function isGs1Cs82Char(ch: string): boolean {
  return CS82_CHAR.test(ch);
}

export type GraiErrorCode =
  | 'empty'
  | 'wrong-ai'
  | 'missing-filler'
  | 'non-digit'
  | 'too-short'
  | 'too-long'
  | 'bad-serial-char'
  | 'check-digit'
  | 'serial-required'
  | 'bad-company-prefix-length'
  | 'bad-digital-link'
  | 'bad-epc-uri';

export interface GraiError {
  code: GraiErrorCode;
  message: string;
}

export interface GraiParts {
  /** Canonical AI 8003 value: filler 0 + 12 digits + check digit + serial. */
  value: string;
  /** Company prefix and asset type together (always known). */
  prefixAndAssetType: string;
  /** Only when the company prefix length is known (given, or from an EPC URI). */
  companyPrefix?: string;
  /** Only when the company prefix length is known; may be '' for a 12-digit prefix. */
  assetType?: string;
  checkDigit: number;
  /** '' when the GRAI carries no serial. */
  serial: string;
}

export type GraiParseResult = { ok: true; grai: GraiParts } | { ok: false; error: GraiError };

export interface GraiParseOptions {
  /** GS1 Company Prefix length (6–12), when known; an EPC URI's own split wins. */
  companyPrefixLength?: number;
}

/** Parts to build a GRAI from: prefix and asset type apart, or together as parsed. */
export type GraiBuildParts = { companyPrefix: string; assetType: string; serial?: string } | { prefixAndAssetType: string; serial?: string };

function fail(code: GraiErrorCode, message: string): { ok: false; error: GraiError } {
  return { ok: false, error: { code, message } };
}

/**
 * GS1 mod-10 check digit over data digits: weights 3, 1, 3, 1… starting from
 * the rightmost data digit; the check digit tops the sum up to a multiple of 10.
 */
export function gs1CheckDigit(digits: string): number {
  if (!/^\d+$/.test(digits)) throw new RangeError(`Check digit needs digits only, got "${digits}"`);
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    const digit = digits.charCodeAt(digits.length - 1 - i) - 48;
    sum += i % 2 === 0 ? 3 * digit : digit;
  }
  return (10 - (sum % 10)) % 10;
}

function isValidPrefixLength(length: number): boolean {
  return Number.isInteger(length) && length >= MIN_COMPANY_PREFIX_LENGTH && length <= MAX_COMPANY_PREFIX_LENGTH;
}

function prefixLengthError(length: number): { ok: false; error: GraiError } {
  return fail('bad-company-prefix-length', `A GS1 Company Prefix has ${MIN_COMPANY_PREFIX_LENGTH} to ${MAX_COMPANY_PREFIX_LENGTH} digits, not ${length}`);
}

function describeChar(ch: string): string {
  const code = ch.codePointAt(0) ?? 0;
  return code > 0x20 && code < 0x7f ? `"${ch}"` : `U+${code.toString(16).toUpperCase().padStart(4, '0')}`;
}

/** Checks a decoded serial: length and character set. Returns null when fine. */
function serialError(serial: string): { ok: false; error: GraiError } | null {
  const chars = Array.from(serial);
  if (chars.length > MAX_SERIAL_LENGTH) {
    return fail('too-long', `Too long: the serial has ${chars.length} characters; a GRAI serial has at most ${MAX_SERIAL_LENGTH}`);
  }
  const bad = chars.findIndex((ch) => !isGs1Cs82Char(ch));
  if (bad >= 0) {
    return fail('bad-serial-char', `Serial character ${describeChar(chars[bad] ?? '')} (position ${bad + 1} of the serial) is outside GS1 AI encodable character set 82`);
  }
  return null;
}

/** Assembles checked parts; the check digit is computed, never trusted. */
function buildParts(body: string, serial: string, prefixLength: number | undefined): GraiParts {
  const checkDigit = gs1CheckDigit(body);
  const parts: GraiParts = {
    value: `0${body}${checkDigit}${serial}`,
    prefixAndAssetType: body,
    checkDigit,
    serial,
  };
  if (prefixLength !== undefined) {
    parts.companyPrefix = body.slice(0, prefixLength);
    parts.assetType = body.slice(prefixLength);
  }
  return parts;
}

/** Grouping marks people write between digit groups; none of them is a digit. */
const FIXED_GROUPING = /[\s.\u00B7\u2022\u2219-]/;
/** Grouping marks that are never serial characters (space and dots-as-bullets). */
const SERIAL_GROUPING = /[\s\u00B7\u2022\u2219]/g;
/** Barcode scanners may prefix a symbology identifier, e.g. `]C1` (GS1-128), `]Q3` (QR), `]d2` (DataMatrix). */
const SYMBOLOGY_ID = /^\][A-Za-z][0-9]/;
const GROUP_SEPARATOR = '\u001D';

/**
 * Validates an AI 8003 value. With `grouped`, spaces, dots, middle dots and
 * hyphens between the fixed digits are read as grouping (as on a label).
 */
function parseValue(raw: string, prefixLength: number | undefined, grouped: boolean): GraiParseResult {
  let fixed = '';
  let i = 0;
  const marksUsed = new Set<string>();
  for (; i < raw.length && fixed.length < FIXED_LENGTH; i++) {
    const ch = raw[i] ?? '';
    if (grouped && FIXED_GROUPING.test(ch)) {
      marksUsed.add(ch);
      continue;
    }
    if (ch < '0' || ch > '9') {
      return fail(
        'non-digit',
        `Character ${describeChar(ch)} at position ${fixed.length + 1} is not a digit: the first ${FIXED_LENGTH} characters (filler 0, company prefix, asset type, check digit) are digits only`,
      );
    }
    if (fixed.length === 0 && ch !== '0') {
      return fail('missing-filler', `A GRAI value starts with the filler digit 0, not ${ch}: the filler digit looks missing`);
    }
    fixed += ch;
  }
  if (fixed.length < FIXED_LENGTH) {
    return fail(
      'too-short',
      `Too short: a GRAI needs ${FIXED_LENGTH} digits before the serial (filler 0, ${BODY_LENGTH} digits of company prefix and asset type, check digit); got ${fixed.length}`,
    );
  }
  const body = fixed.slice(1, 1 + BODY_LENGTH);
  const givenCheck = Number(fixed[FIXED_LENGTH - 1]);
  const expected = gs1CheckDigit(body);
  if (givenCheck !== expected) {
    return fail('check-digit', `Wrong check digit: ${givenCheck} given, ${expected} expected for ${body}`);
  }
  let rest = raw.slice(i);
  if (grouped) {
    // The gap before the serial: spaces or middle dots, or else one dot or
    // hyphen when those grouped the digits too. Dots and hyphens are serial
    // characters, so a serial may still start with one after a spaced gap.
    const gap = /^[\s\u00B7\u2022\u2219]+/.exec(rest);
    if (gap) rest = rest.slice(gap[0].length);
    else if (marksUsed.has(rest.charAt(0))) rest = rest.slice(1);
    rest = rest.replace(SERIAL_GROUPING, '');
  }
  return serialError(rest) ?? { ok: true, grai: buildParts(body, rest, prefixLength) };
}

function parseElementString(text: string, prefixLength: number | undefined): GraiParseResult {
  let s = text.replace(SYMBOLOGY_ID, '');
  // In a scanned GS1 element string, a group separator ends a variable-length value.
  const gs = s.indexOf(GROUP_SEPARATOR);
  if (gs >= 0) s = s.slice(0, gs);
  s = s.trim();
  const ai = /^\(\s*(\d{2,4})\s*\)\s*/.exec(s);
  if (ai) {
    if (ai[1] !== GRAI_AI) return fail('wrong-ai', `This is AI (${ai[1]}), not a GRAI (${GRAI_AI})`);
    s = s.slice(ai[0].length);
  } else if (/^8003[\s.\u00B7-]*0/.test(s)) {
    // A GRAI value starts with 0, so a leading 8003 followed by 0 can only be the AI.
    s = s.slice(GRAI_AI.length);
  }
  if (s === '') return fail('empty', 'No GRAI value after the AI (8003)');
  return parseValue(s, prefixLength, true);
}

function parseDigitalLink(text: string, prefixLength: number | undefined): GraiParseResult {
  const url = /^https?:\/\/([^/?#]+)([^?#]*)/i.exec(text);
  if (!url || url[1] === undefined) return fail('bad-digital-link', 'Not a Digital Link URI: no host after http(s)://');
  const segments = (url[2] ?? '').split('/').filter((segment) => segment !== '');
  const at = segments.indexOf(GRAI_AI);
  if (at < 0) return fail('bad-digital-link', `This Digital Link URI has no /${GRAI_AI}/ path segment, so it carries no GRAI`);
  const encoded = segments[at + 1];
  if (encoded === undefined) return fail('empty', `Nothing follows /${GRAI_AI}/ in this Digital Link URI`);
  let value: string;
  try {
    value = decodeURIComponent(encoded);
  } catch {
    return fail('bad-digital-link', `The GRAI segment "${encoded}" has a broken percent-escape`);
  }
  return parseValue(value, prefixLength, false);
}

/**
 * EPC URI escapes (Tag Data Standard, GS3A3 component; from memory): these
 * character-set-82 characters are written as %HH, the rest of the set as is.
 */
const EPC_ESCAPED: Record<string, string> = {
  '"': '%22',
  '%': '%25',
  '&': '%26',
  '/': '%2F',
  '<': '%3C',
  '>': '%3E',
  '?': '%3F',
};
/** Characters that stand unescaped in a GS3A3 component. */
const EPC_PLAIN_CHAR = /^[A-Za-z0-9!'()*+,\-.:;=_]$/;

function decodeEpcSerial(encoded: string): string | { ok: false; error: GraiError } {
  let out = '';
  for (let i = 0; i < encoded.length; i++) {
    const ch = encoded[i] ?? '';
    if (ch === '%') {
      const hex = encoded.slice(i + 1, i + 3);
      if (!/^[0-9A-Fa-f]{2}$/.test(hex)) return fail('bad-epc-uri', `Broken escape "%${hex}" in the EPC URI serial`);
      out += String.fromCharCode(parseInt(hex, 16));
      i += 2;
    } else if (EPC_PLAIN_CHAR.test(ch)) {
      out += ch;
    } else {
      const hint = EPC_ESCAPED[ch] ? `; write it as ${EPC_ESCAPED[ch]}` : '';
      return fail('bad-epc-uri', `Character ${describeChar(ch)} may not stand unescaped in an EPC URI serial${hint}`);
    }
  }
  return out;
}

function parseEpcUri(text: string): GraiParseResult {
  const scheme = /^urn:epc:id:grai:/i.exec(text);
  if (!scheme) {
    return fail('bad-epc-uri', 'Only the pure-identity GRAI EPC URI (urn:epc:id:grai:…) carries a GRAI here');
  }
  const rest = text.slice(scheme[0].length);
  const m = /^(\d+)\.(\d*)\.(.*)$/.exec(rest);
  if (!m) return fail('bad-epc-uri', 'A GRAI EPC URI reads urn:epc:id:grai:<company prefix>.<asset type>.<serial>, digits before the serial');
  const [, prefix = '', assetType = '', encodedSerial = ''] = m;
  if (!isValidPrefixLength(prefix.length)) return prefixLengthError(prefix.length);
  if (prefix.length + assetType.length !== BODY_LENGTH) {
    const length = prefix.length + assetType.length;
    return fail(length < BODY_LENGTH ? 'too-short' : 'too-long', `Company prefix and asset type must have ${BODY_LENGTH} digits together; this EPC URI has ${length}`);
  }
  if (encodedSerial === '') return fail('serial-required', 'A GRAI is an EPC only with a serial; this EPC URI has none');
  const serial = decodeEpcSerial(encodedSerial);
  if (typeof serial !== 'string') return serial;
  return serialError(serial) ?? { ok: true, grai: buildParts(prefix + assetType, serial, prefix.length) };
}

/**
 * Reads a GRAI from an element string (`(8003)0…`, `8003 0…`, `0…`, grouped
 * with spaces, dots or middle dots), a GS1 Digital Link URI on any host
 * (`https://host/…/8003/<value>[/…][?…]`) or an EPC URI
 * (`urn:epc:id:grai:<prefix>.<asset type>.<serial>`). In an EPC URI the dot
 * fixes the company prefix length, whatever `opts` says.
 */
export function parseGrai(text: string, opts: GraiParseOptions = {}): GraiParseResult {
  const prefixLength = opts.companyPrefixLength;
  if (prefixLength !== undefined && !isValidPrefixLength(prefixLength)) return prefixLengthError(prefixLength);
  const trimmed = text.trim();
  if (trimmed === '') return fail('empty', 'No GRAI given');
  if (/^urn:epc:/i.test(trimmed)) return parseEpcUri(trimmed);
  if (/^https?:\/\//i.test(trimmed)) return parseDigitalLink(trimmed, prefixLength);
  return parseElementString(trimmed, prefixLength);
}

/** Like parseGrai, but refuses a GRAI without serial: each Loopfold bin is one individual asset. */
export function parseSerialisedGrai(text: string, opts: GraiParseOptions = {}): GraiParseResult {
  const result = parseGrai(text, opts);
  if (result.ok && result.grai.serial === '') {
    return fail('serial-required', 'This GRAI has no serial: it names an asset type, not one bin; each bin needs its own serial');
  }
  return result;
}

function parseOrThrow(grai: string, opts: GraiParseOptions = {}): GraiParts {
  const result = parseGrai(grai, opts);
  if (!result.ok) throw new RangeError(result.error.message);
  return result.grai;
}

/** Canonical AI 8003 value from its parts; the check digit is computed. Throws on bad parts. */
export function formatGrai(parts: GraiBuildParts): string {
  const body = 'prefixAndAssetType' in parts ? parts.prefixAndAssetType : parts.companyPrefix + parts.assetType;
  if (!/^\d{12}$/.test(body)) {
    throw new RangeError(`Company prefix and asset type must be ${BODY_LENGTH} digits together, got "${body}"`);
  }
  const serial = parts.serial ?? '';
  const problem = serialError(serial);
  if (problem) throw new RangeError(problem.error.message);
  return `0${body}${gs1CheckDigit(body)}${serial}`;
}

/** makeGrai('9520123', '45678', '000417') → '0952012345678' + check digit + '000417'. */
export function makeGrai(companyPrefix: string, assetType: string, serial: string): string {
  return formatGrai({ companyPrefix, assetType, serial });
}

/**
 * Grouping for reading aloud or printing under a barcode:
 * `0 9520123 45678 8 · 000417` (filler, company prefix, asset type, check
 * digit, then the serial). parseGrai reads it back.
 */
export function groupGrai(value: string, companyPrefixLength: number): string {
  const grai = parseOrThrow(value, { companyPrefixLength });
  const groups = ['0', grai.companyPrefix ?? '', grai.assetType ?? '', String(grai.checkDigit)].filter((g) => g !== '');
  return groups.join(' ') + (grai.serial === '' ? '' : ` \u00B7 ${grai.serial}`);
}

/**
 * Digital Link path segments keep only RFC 3986 unreserved characters; every
 * other character of set 82 is percent-encoded (GS1 Digital Link standard,
 * from memory). encodeURIComponent would leave ! ' ( ) * bare, hence our own.
 */
function encodeDigitalLinkSegment(value: string): string {
  return value.replace(/[^A-Za-z0-9\-._~]/g, (ch) => `%${ch.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')}`);
}

/** `graiToDigitalLink(value, 'https://id.example.org')` → `https://id.example.org/8003/<value>`. */
export function graiToDigitalLink(grai: string, baseUrl: string): string {
  if (!/^https?:\/\/[^/?#]+[^?#]*$/i.test(baseUrl)) {
    throw new RangeError(`Digital Link base must be an http(s) URL without query or fragment, got "${baseUrl}"`);
  }
  const { value } = parseOrThrow(grai);
  return `${baseUrl.replace(/\/+$/, '')}/${GRAI_AI}/${encodeDigitalLinkSegment(value)}`;
}

/**
 * EPC pure-identity URI: `urn:epc:id:grai:<prefix>.<asset type>.<serial>`.
 * Drops filler and check digit; only a serialised GRAI is an EPC.
 */
export function graiToEpcUri(grai: string, companyPrefixLength: number): string {
  const parts = parseOrThrow(grai, { companyPrefixLength });
  if (parts.serial === '') throw new RangeError('A GRAI without serial cannot be written as an EPC URI');
  const serial = Array.from(parts.serial, (ch) => EPC_ESCAPED[ch] ?? ch).join('');
  return `urn:epc:id:grai:${parts.companyPrefix ?? ''}.${parts.assetType ?? ''}.${serial}`;
}
