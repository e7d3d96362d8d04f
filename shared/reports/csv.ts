/**
 * CSV as RFC 4180 describes it: comma-separated, CRLF line ends, a field quoted when it holds a comma,
 * a quote, CR or LF, and quotes inside doubled.
 *
 * Text that a spreadsheet would run as a formula (starting with =, +, -, @, tab or CR) gets a leading
 * apostrophe, as the OWASP "CSV Injection" page recommends: a customer name typed as "=HYPERLINK(…)"
 * must not become a live formula in the accountant's spreadsheet. Numbers are written as numbers and
 * never prefixed, so negative amounts stay numeric; so is text that is only a decimal number ("-12.50", a
 * credit written as an amount), which no spreadsheet runs as a formula.
 */
export type CsvCell = string | number | boolean | null | undefined | Date;

const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_DECIMAL = /^-\d+(\.\d+)?$/;

export function csvField(value: CsvCell): string {
  if (value == null) return '';
  let text: string;
  if (typeof value === 'number') text = Number.isFinite(value) ? String(value) : '';
  else if (typeof value === 'boolean') text = value ? 'true' : 'false';
  else if (value instanceof Date) text = value.toISOString();
  else text = FORMULA_START.test(value) && !PLAIN_DECIMAL.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(header: string[], rows: CsvCell[][]): string {
  return [header, ...rows].map((row) => row.map(csvField).join(',')).join('\r\n') + '\r\n';
}
