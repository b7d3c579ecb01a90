// What a liner carton's barcode says (pure): GS1 element strings — bracketed "(01)…(10)…", or raw with the
// group separator (FNC1) as a scanner hands them over — parsed by gs1-barcode-parser-mod, and GS1 Digital Link
// URIs (…/01/<GTIN>/10/<lot>?17=YYMMDD), turned into an element string first. Anything else is taken as the lot
// number typed or read as plain text. AIs (GS1 General Specifications): 01 GTIN, 10 batch/lot, 11 production
// date, 17 expiry date, 30 / 37 count of items.
import { parseBarcode } from 'gs1-barcode-parser-mod';

export interface CartonLabel {
  lotNumber: string | null;
  gtin: string | null;
  manufacturedOn: string | null;
  expiryDate: string | null;
  quantity: number | null;
  /** How the text was read. */
  read: 'gs1' | 'digital_link' | 'plain';
}

const iso = (d: unknown): string | null => {
  if (!(d instanceof Date) || Number.isNaN(d.getTime())) return null;
  // The parser builds dates at local midnight: read them back in local time.
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
};

function fromElements(text: string, read: CartonLabel['read']): CartonLabel | null {
  let items: Array<{ ai: string; data: unknown }>;
  try {
    items = parseBarcode(text).parsedCodeItems;
  } catch {
    return null;
  }
  const get = (ai: string) => items.find((i) => i.ai === ai)?.data;
  const count = get('30') ?? get('37');
  const lot = get('10');
  if (items.length === 0) return null;
  return {
    lotNumber: typeof lot === 'string' && lot.trim() ? lot.trim() : null,
    gtin: typeof get('01') === 'string' ? (get('01') as string) : null,
    manufacturedOn: iso(get('11')),
    expiryDate: iso(get('17')),
    quantity: count === undefined || count === null || Number.isNaN(Number(count)) ? null : Number(count),
    read,
  };
}

const DL_KEYS = ['01', '10', '11', '17', '30', '37', '21'];

/** A Digital Link URI as a bracketed element string, or null when it is not one. */
export function digitalLinkElements(text: string): string | null {
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    return null;
  }
  const parts = url.pathname.split('/').filter(Boolean).map(decodeURIComponent);
  const at = parts.indexOf('01');
  if (at < 0 || !/^\d{14}$/.test(parts[at + 1] ?? '')) return null;
  const out: string[] = [];
  for (let i = at; i + 1 < parts.length; i += 2) if (DL_KEYS.includes(parts[i]!)) out.push(`(${parts[i]})${parts[i + 1]}`);
  for (const [k, v] of url.searchParams) if (DL_KEYS.includes(k) && v) out.push(`(${k})${v}`);
  return out.join('');
}

const GROUP_SEPARATOR = String.fromCharCode(29);

/** Text that is a carton's code rather than a lot number typed by hand (brackets, the separator, a URI, AI 01 first). */
export function looksLikeCartonCode(text: string): boolean {
  const t = text.trim();
  return t.startsWith('(') || t.startsWith(']') || t.includes(GROUP_SEPARATOR) || /^https?:\/\//.test(t) || /^01\d{14}/.test(t);
}

export function readCartonLabel(raw: string): CartonLabel | null {
  const text = raw.trim();
  if (!text) return null;
  const dl = digitalLinkElements(text);
  if (dl) return fromElements(dl, 'digital_link');
  if (looksLikeCartonCode(text)) {
    const parsed = fromElements(text, 'gs1');
    if (parsed) return parsed;
  }
  // Plain text: a lot number as printed (letters, digits, - / .), nothing else known.
  if (/^[A-Za-z0-9][A-Za-z0-9\-/.]{0,39}$/.test(text)) return { lotNumber: text, gtin: null, manufacturedOn: null, expiryDate: null, quantity: null, read: 'plain' };
  return null;
}
