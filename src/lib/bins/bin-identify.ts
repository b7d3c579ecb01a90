// What a yard hand typed, or what a camera or photo decoded, as a bin identity.
// Typed text may be a GRAI (any written form parseGrai reads) or the serial
// printed under the code; a decoded QR must carry a GRAI, because every
// Loopfold label encodes a GS1 Digital Link URI (…/8003/<GRAI>) and a serial
// alone in a QR would be some other label. Pure: no I/O.
import { parseGrai } from '@/lib/gs1';

export interface Identified {
  /** Canonical GRAI when the text was one; otherwise null and `serial` says what was typed. */
  grai: string | null;
  serial: string | null;
}

export type IdentifyResult = Identified | { error: string };

export function isIdentified(r: IdentifyResult): r is Identified {
  return !('error' in r);
}

/** Typed (or pasted) text: a GRAI, a label link, or a serial. */
export function identify(text: string, prefixLength: number): IdentifyResult {
  const t = text.trim();
  if (!t) return { error: 'Type the GRAI from the label, or the serial under the code.' };
  const parsed = parseGrai(t, { companyPrefixLength: prefixLength });
  if (parsed.ok) {
    if (!parsed.grai.serial) return { error: 'This GRAI has no serial part; a bin’s label always carries one.' };
    return { grai: parsed.grai.value, serial: null };
  }
  const digits = t.replace(/[\s.·()-]/g, '');
  if (/^\d{13,}$/.test(digits) || t.includes('8003') || t.startsWith('urn:')) return { error: parsed.error.message };
  if (/^[!-~]{1,16}$/.test(t)) return { grai: null, serial: t };
  return { error: 'That is neither a GRAI nor a serial.' };
}

/** Text decoded from a QR code (camera or photo): only a GRAI with a serial identifies a bin. */
export function identifyDecoded(text: string, prefixLength: number): IdentifyResult {
  const t = text.trim();
  if (!t) return { error: 'The code was empty. Try again, or type the GRAI printed under it.' };
  const parsed = parseGrai(t, { companyPrefixLength: prefixLength });
  if (!parsed.ok) {
    const shown = t.length > 60 ? `${t.slice(0, 57)}…` : t;
    return { error: `This code is not a bin label (${parsed.error.message}). It reads “${shown}”. Type the GRAI printed under the bin’s code instead.` };
  }
  if (!parsed.grai.serial) return { error: 'This code names a bin type, not one bin (its GRAI has no serial). Type the GRAI printed on the bin’s own label.' };
  return { grai: parsed.grai.value, serial: null };
}
