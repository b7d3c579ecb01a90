// Is an uploaded file really CSV text? Decided from its bytes, never from its
// name or the type the browser claims: a workbook renamed to .csv, a photo or
// a UTF-16 export is refused with what to do instead.
//
// Pure: no I/O.

export type CsvSniff = { ok: true; text: string } | { ok: false; reason: string };

const SAVE_AS = 'In your spreadsheet choose "Save as" → "CSV UTF-8 (comma delimited)" and upload that file.';

const MAGIC: Array<{ bytes: number[]; what: string }> = [
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: 'an Excel workbook (.xlsx) or another zip archive' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], what: 'an old Excel workbook (.xls)' },
  { bytes: [0x25, 0x50, 0x44, 0x46], what: 'a PDF document' },
  { bytes: [0x89, 0x50, 0x4e, 0x47], what: 'a PNG image' },
  { bytes: [0xff, 0xd8, 0xff], what: 'a JPEG image' },
  { bytes: [0x47, 0x49, 0x46, 0x38], what: 'a GIF image' },
  { bytes: [0x1f, 0x8b], what: 'a gzip archive' },
];

function startsWith(bytes: Uint8Array, prefix: number[]): boolean {
  return prefix.every((b, i) => bytes[i] === b);
}

/** Control characters no CSV text carries (tab, line feed and carriage return are fine). */
function hasStrayControl(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if ((c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d) || c === 0x7f) return true;
  }
  return false;
}

/** Decodes an upload as UTF-8 CSV text (a byte-order mark is dropped) or says why it is not one. */
export function decodeCsvUpload(bytes: Uint8Array): CsvSniff {
  if (bytes.length === 0) return { ok: false, reason: 'The file is empty.' };
  const magic = MAGIC.find((m) => startsWith(bytes, m.bytes));
  if (magic) return { ok: false, reason: `This file is ${magic.what}, not CSV text. ${SAVE_AS}` };
  if (startsWith(bytes, [0xff, 0xfe]) || startsWith(bytes, [0xfe, 0xff])) {
    return { ok: false, reason: `This file is saved as UTF-16 ("Unicode text"), not UTF-8. ${SAVE_AS}` };
  }
  if (bytes.includes(0)) return { ok: false, reason: `This file contains binary data (NUL bytes), so it is not CSV text. ${SAVE_AS}` };
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
  } catch {
    return { ok: false, reason: `This file is not UTF-8 text (perhaps an older "CSV" export in a regional encoding). ${SAVE_AS}` };
  }
  if (hasStrayControl(text)) return { ok: false, reason: `This file contains control characters that CSV text never has, so it looks binary. ${SAVE_AS}` };
  return { ok: true, text };
}
