// CSV through papaparse (RFC 4180): read the core's tables, write the page's own.

import Papa from 'papaparse';

/** Parses RFC 4180 CSV into rows of cells (blank lines skipped). */
export function parseCsv(text: string): string[][] {
  return Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
}

/** Rows as objects keyed by the header (the header is the first row: the core writes no
 * line before it). */
export function csvObjects(text: string): Record<string, string>[] {
  return Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;
}

/** Text cells a spreadsheet would read as a formula: the core's rule (export/csv_safe.rs):
 * a lead of = + - @ tab or CR, unless the cell is a plain number such as -3.5. */
export const FORMULA_CELL = /^(?![+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$)[=+\-@\t\r]/;

/** Writes a table as CSV text, formula-like text cells neutralised with a leading `'`. */
export function toCsv(header: string[], rows: unknown[][]): string {
  const cells = rows.map((r) => r.map((v) => (v === null || v === undefined ? '' : typeof v === 'number' ? v : String(v))));
  return Papa.unparse({ fields: header, data: cells }, { escapeFormulae: FORMULA_CELL, newline: '\r\n' }) + '\r\n';
}
