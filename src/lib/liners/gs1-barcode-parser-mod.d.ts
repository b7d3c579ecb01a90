// The parts of gs1-barcode-parser-mod (plain JavaScript, no types of its own) that carton-label.ts uses.
declare module 'gs1-barcode-parser-mod' {
  export interface ParsedElement {
    ai: string;
    dataTitle: string;
    /** A string, a number, or a Date for date AIs (built at local midnight). */
    data: unknown;
    unit: string;
  }
  export function parseBarcode(barcode: string): { codeName: string; parsedCodeItems: ParsedElement[] };
}
