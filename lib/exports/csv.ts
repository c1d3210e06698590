/**
 * CSV writing per RFC 4180 (§2): fields separated by commas, records by CRLF; a field that holds
 * a comma, a double quote, a CR or an LF is enclosed in double quotes, and a double quote inside
 * it is written twice. Every other field is written as it is.
 *
 * A field that starts with `=`, `+`, `-` or `@` would be read as a formula by spreadsheet
 * programs (common practice: "CSV injection"); such a field is prefixed with an apostrophe unless
 * it is a plain number (a negative margin such as -0.12 stays a number).
 */

const NEEDS_QUOTES = /[",\r\n]/;
const FORMULA_START = /^[=+\-@]/;
const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** One field as RFC 4180 writes it. */
export function csvField(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '';
  let s = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
  if (FORMULA_START.test(s) && !PLAIN_NUMBER.test(s)) s = `'${s}`;
  return NEEDS_QUOTES.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Records as CSV text: CRLF between records and after the last one (RFC 4180 §2.1–2.2). */
export function csvText(rows: Array<Array<string | number | null | undefined>>): string {
  return rows.map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}
