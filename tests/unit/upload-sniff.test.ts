import { describe, test, expect } from 'vitest';
import { decodeCsvUpload } from '@/lib/upload-sniff';

const bytes = (...values: number[]) => new Uint8Array(values);
const text = (s: string) => new TextEncoder().encode(s);

describe('decodeCsvUpload', () => {
  test('UTF-8 text passes; a byte-order mark is dropped', () => {
    expect(decodeCsvUpload(text('grai,depot\r\n'))).toEqual({ ok: true, text: 'grai,depot\r\n' });
    expect(decodeCsvUpload(bytes(0xef, 0xbb, 0xbf, ...text('a,b')))).toEqual({ ok: true, text: 'a,b' });
    expect(decodeCsvUpload(text('Maker Ångström, "Zürich"\tx'))).toMatchObject({ ok: true });
  });
  test('an empty file is refused', () => {
    expect(decodeCsvUpload(bytes())).toEqual({ ok: false, reason: 'The file is empty.' });
  });
  // File signatures: zip local file header "PK\3\4" (PKWARE APPNOTE.TXT 4.3.7), OLE2 compound file
  // D0 CF 11 E0 (MS-CFB 2.2), "%PDF" (ISO 32000-1 7.5.2), PNG 89 50 4E 47 (PNG spec 5.2), JPEG SOI FF D8 (ITU T.81).
  test.each([
    ['an .xlsx workbook (zip)', [0x50, 0x4b, 0x03, 0x04, 0x14, 0x00], /Excel workbook \(\.xlsx\)/],
    ['an .xls workbook', [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1], /old Excel workbook/],
    ['a PDF', [...text('%PDF-1.7\n')], /PDF document/],
    ['a PNG', [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a], /PNG image/],
    ['a JPEG', [0xff, 0xd8, 0xff, 0xe0], /JPEG image/],
  ])('%s is refused by its signature', (_name, signature, reason) => {
    const r = decodeCsvUpload(bytes(...signature));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.reason).toMatch(reason);
      expect(r.reason).toContain('CSV UTF-8');
    }
  });
  test('UTF-16 (FF FE byte-order mark, Unicode BOM) is refused with what to save instead', () => {
    expect(decodeCsvUpload(bytes(0xff, 0xfe, 0x61, 0x00))).toMatchObject({ ok: false, reason: expect.stringContaining('UTF-16') });
  });
  test('NUL bytes mean binary data', () => {
    expect(decodeCsvUpload(bytes(...text('grai,'), 0, ...text('x')))).toMatchObject({ ok: false, reason: expect.stringContaining('NUL') });
  });
  test('bytes that are not UTF-8 (Latin-1 é = E9) are refused', () => {
    expect(decodeCsvUpload(bytes(...text('caf'), 0xe9, ...text(',x')))).toMatchObject({ ok: false, reason: expect.stringContaining('not UTF-8') });
  });
  test('other control characters mean binary data', () => {
    expect(decodeCsvUpload(bytes(...text('a,b'), 0x07, ...text('c')))).toMatchObject({ ok: false, reason: expect.stringContaining('control characters') });
  });
});
