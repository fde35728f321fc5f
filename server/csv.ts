// CSV downloads (an import's rejects.csv, and any other): written with papaparse, every text field quoted,
// and a field that a spreadsheet would read as a formula neutralised as the OWASP "CSV Injection" guidance
// says — a field starting with =, +, -, @, a tab or a carriage return gets a leading single quote (and,
// being text, is quoted), so the spreadsheet shows the characters instead of running them.
import Papa from 'papaparse';

/**
 * The characters that make a spreadsheet treat a field as a formula (OWASP CSV Injection). papaparse's own
 * `escapeFormulae: true` pattern ends in `.*$`, which misses a field whose second line starts the formula
 * text ("=1\n…" is not matched); only the first character matters.
 */
export const formulaStart = /^[=+\-@\t\r]/;

export type CsvValue = string | number | null;

/** One CSV record and its CRLF (RFC 4180): numbers as they are, text quoted and neutralised, null empty. */
export function csvRecord(values: readonly CsvValue[]): string {
  return `${Papa.unparse([[...values]], { escapeFormulae: formulaStart, quotes: (value: unknown) => typeof value === 'string', newline: '\r\n' })}\r\n`;
}
