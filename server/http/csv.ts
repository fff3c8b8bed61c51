import Papa from 'papaparse';

/**
 * Spreadsheets run a cell that starts with = + - @, a tab or a carriage return as a formula
 * (OWASP, "CSV Injection"). Papa.unparse's `escapeFormulae` puts a single quote before such a
 * cell and quotes it (Papa Parse docs, "Unparse config"). Papa's own default pattern ends in
 * `.*$`, which misses a cell with a line break in it, so the pattern here checks only the start.
 * Numbers are written as they are: Papa never escapes a number, so -3 stays -3.
 */
export const FORMULA_START = /^[=+\-@\t\r]/;

/** A CSV file for download: a header row, then one row per entry, CRLF line ends (RFC 4180). */
export function toCsv(fields: readonly string[], data: readonly (readonly (string | number)[])[]): string {
  return Papa.unparse({ fields: [...fields], data: data.map((row) => [...row]) }, { newline: '\r\n', escapeFormulae: FORMULA_START });
}
