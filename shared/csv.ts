/**
 * CSV that is safe to open in a spreadsheet. A cell a spreadsheet would read as a formula (starting with = + - @,
 * or a tab or carriage return that some programs skip before looking for one) is neutralised with a leading
 * apostrophe, which spreadsheets show as text. Every cell is quoted, quotes doubled (RFC 4180), lines end in CRLF.
 * Numbers the product writes itself (a negative amount) are passed as numbers and kept as they are.
 */

/** A decimal amount the product wrote itself (money as a string, "-205.76"), kept exactly as written. */
export interface CsvDecimal {
  readonly decimal: string;
}

export type CsvValue = string | number | CsvDecimal | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;
const DECIMAL = /^-?\d{1,15}(\.\d{1,4})?$/;

/**
 * Marks a decimal amount (a money string) to be written as a number, with all its decimals. Anything that is not a
 * plain decimal is treated as text, and neutralised like any other text.
 */
export const csvDecimal = (value: string | null | undefined): CsvDecimal | null => (value === null || value === undefined ? null : { decimal: value });

/** One cell's text, neutralised when it could start a formula. */
export function safeCell(value: CsvValue): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'object') return DECIMAL.test(value.decimal) ? value.decimal : safeCell(value.decimal);
  return FORMULA_START.test(value) ? `'${value}` : value;
}

function quote(text: string): string {
  return `"${text.replace(/"/g, '""')}"`;
}

/** The whole file: a header row then the rows, each cell made safe and quoted. */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  return [header, ...rows].map((row) => row.map((v) => quote(safeCell(v))).join(',')).join('\r\n') + '\r\n';
}
