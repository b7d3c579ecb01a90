// A small reader of RFC 4180 CSV written for the tests, so checks of the app's
// CSV writer (which uses papaparse) do not lean on the same library. Returns
// each cell's text and whether it was quoted.
export interface ReadCell {
  text: string;
  quoted: boolean;
}

export function readCsv(input: string): ReadCell[][] {
  const text = input.startsWith('\uFEFF') ? input.slice(1) : input;
  const rows: ReadCell[][] = [];
  let row: ReadCell[] = [];
  let i = 0;
  const endRow = () => {
    rows.push(row);
    row = [];
  };
  while (i < text.length) {
    let cell = '';
    let quoted = false;
    if (text[i] === '"') {
      quoted = true;
      i++;
      for (;;) {
        if (i >= text.length) throw new Error('unterminated quoted field');
        if (text[i] === '"') {
          if (text[i + 1] === '"') {
            cell += '"';
            i += 2;
            continue;
          }
          i++;
          break;
        }
        cell += text[i++];
      }
    } else {
      while (i < text.length && text[i] !== ',' && text[i] !== '\r' && text[i] !== '\n') cell += text[i++];
    }
    row.push({ text: cell, quoted });
    if (text[i] === ',') {
      i++;
      if (i === text.length) row.push({ text: '', quoted: false });
      continue;
    }
    if (text[i] === '\r' && text[i + 1] === '\n') i += 2;
    else if (text[i] === '\n') i++;
    else if (i < text.length) throw new Error(`unexpected ${JSON.stringify(text[i])} after a field at ${i}`);
    endRow();
  }
  if (row.length) endRow();
  return rows;
}

/** OWASP "CSV Injection": a cell a spreadsheet would run as a formula. A plain decimal number is a constant. */
export function runsAsFormula(cell: string): boolean {
  return /^[=+\-@\t\r]/.test(cell) && !/^-?\d+(\.\d+)?$/.test(cell);
}
