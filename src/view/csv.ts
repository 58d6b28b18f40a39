/**
 * CSV (RFC 4180) for the download links: comma-separated, CRLF line ends, fields quoted when they hold a comma, a
 * quote, a line break or edge spaces. Text cells that a spreadsheet would run as a formula (starting with = + - @,
 * tab or carriage return) get a leading single quote, so the file opens as data (OWASP "CSV injection").
 * Numeric cells are written as numbers: a negative number such as -170 is data, not a formula.
 */

export type CsvCell = string | number | null | undefined;

/** Characters that start a formula in common spreadsheets. */
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * One field. Numbers: shortest round-trip form (no thousands separators); null/undefined/NaN: empty. Text: formula
 * starts neutralised with a leading "'", then quoted if needed.
 * @example csvField("=SUM(A1:A2)") // "'=SUM(A1:A2)"
 * @example csvField('say "hi", then go') // '"say ""hi"", then go"'
 * @example csvField(-170) // "-170"
 */
export function csvField(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") {
    if (!Number.isFinite(value)) return "";
    return String(Object.is(value, -0) ? 0 : value);
  }
  let text = value;
  if (FORMULA_START.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) || /^\s|\s$/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** One record. */
export function csvLine(cells: readonly CsvCell[]): string {
  return cells.map(csvField).join(",");
}

/**
 * A whole file: the header row, then the rows; CRLF after every record (RFC 4180 §2).
 * @throws RangeError when a row's length differs from the header's
 */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  let out = `${csvLine(header)}\r\n`;
  rows.forEach((row, i) => {
    if (row.length !== header.length)
      throw new RangeError(`invalid row ${i}: ${row.length} cells for ${header.length} columns`);
    out += `${csvLine(row)}\r\n`;
  });
  return out;
}

/** Rounds to `decimals` for a CSV cell (keeps null). */
export function csvRound(value: number | null | undefined, decimals: number): number | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null;
  return Number(value.toFixed(decimals)) + 0;
}
