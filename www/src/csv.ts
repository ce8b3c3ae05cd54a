// CSV through papaparse (RFC 4180): read the core's tables, write the page's own.

import Papa from 'papaparse';

/** Parses RFC 4180 CSV into rows of cells (blank lines skipped). */
export function parseCsv(text: string): string[][] {
  return Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
}

/** A CSV table held as its text: the header, and where each row's line lies, by the value of
 * the `key` column; a row is parsed from its own line when asked, so a county's table is not
 * kept as hundreds of thousands of row objects. `each` sees every row's cells once. */
export class CsvLines {
  header: string[] = [];
  private spans = new Map<string, [number, number]>();

  constructor(private text: string, key: string, each: (cells: string[], col: (name: string) => string) => void) {
    let at = 0;
    let index = new Map<string, number>();
    Papa.parse<string[]>(text, {
      skipEmptyLines: true,
      step: (r) => {
        const start = at;
        at = r.meta.cursor;
        const cells = r.data;
        if (!this.header.length) {
          this.header = cells;
          index = new Map(cells.map((h, i) => [h, i]));
          return;
        }
        const col = (name: string) => cells[index.get(name) ?? -1] ?? '';
        if (index.has(key)) this.spans.set(col(key), [start, at]);
        each(cells, col);
      },
    });
  }

  /** The row whose key column is `id`, keyed by the header (empty when there is none). */
  row(id: string): Record<string, string> {
    const span = this.spans.get(id);
    if (!span) return {};
    const cells = Papa.parse<string[]>(this.text.slice(span[0], span[1]), { skipEmptyLines: true }).data[0] ?? [];
    return Object.fromEntries(this.header.map((h, i) => [h, cells[i] ?? '']));
  }
}

/** Text cells a spreadsheet would read as a formula: the core's rule (export/csv_safe.rs):
 * a lead of = + - @ tab or CR, unless the cell is a plain number such as -3.5. */
export const FORMULA_CELL = /^(?![+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$)[=+\-@\t\r]/;

/** Writes a table as CSV text, formula-like text cells neutralised with a leading `'`. */
export function toCsv(header: string[], rows: unknown[][]): string {
  const cells = rows.map((r) => r.map((v) => (v === null || v === undefined ? '' : typeof v === 'number' ? v : String(v))));
  return Papa.unparse({ fields: header, data: cells }, { escapeFormulae: FORMULA_CELL, newline: '\r\n' }) + '\r\n';
}
