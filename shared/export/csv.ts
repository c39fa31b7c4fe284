import Papa from 'papaparse';

/**
 * CSV injection (OWASP "CSV Injection"): a text cell that begins with = + - @ tab or carriage return is
 * read as a formula by spreadsheets, so it gets a leading apostrophe and is quoted. Numbers (and text that
 * is only a number, such as "-0.42") stay as they are, so R and Python read them as numbers.
 */
export const FORMULA_START = /^(?![+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$)[=+\-@\t\r]/;

export type CsvCell = string | number | boolean | null | undefined;

/** The text a cell is written as (before quoting): neutralised if it could start a formula. */
export function neutraliseCell(v: CsvCell): string {
  if (v == null) return '';
  if (typeof v !== 'string') return String(v);
  return FORMULA_START.test(v) ? `'${v}` : v;
}

/** The reader's inverse: the original text of a cell this module neutralised. */
export function restoreCell(text: string): string {
  return text.startsWith("'") && FORMULA_START.test(text.slice(1)) ? text.slice(1) : text;
}

/** Rows to CSV (header from the first row's keys, or the columns given), every text cell neutralised. */
export function toCsv(rows: ReadonlyArray<Record<string, CsvCell>>, columns?: readonly string[]): string {
  const fields = columns ? [...columns] : Object.keys(rows[0] ?? {});
  const data = rows.map((r) => fields.map((f) => r[f] ?? ''));
  return Papa.unparse({ fields, data }, { newline: '\n', escapeFormulae: FORMULA_START }) + '\n';
}
