/**
 * The one CSV writer of every CSV Tacksheet hands out (the weld log, the turnover set's
 * files): RFC 4180 quoting with CRLF line ends, and text a spreadsheet would run as a formula
 * (a cell starting with `=`, `+`, `-`, `@`, a tab or a carriage return) written with a leading
 * `'`, so it opens as the text it is. Numbers stay numbers, negative ones too.
 */
import { stringify } from 'csv-stringify/sync';

export type CsvCell = string | number | null | undefined;

const OPTIONS = {
	escape_formulas: true,
	record_delimiter: 'windows',
	// A lone line feed or carriage return inside a cell is quoted too, not only a CRLF pair.
	quoted_match: /[\r\n]/,
	eof: true
} as const;

/** Rows as CSV text, each ended by CRLF. */
export function csvRows(rows: readonly (readonly CsvCell[])[]): string {
	return rows.length === 0 ? '' : stringify(rows as CsvCell[][], OPTIONS);
}

/** One row as a CSV line, ended by CRLF. */
export function csvLine(cells: readonly CsvCell[]): string {
	return csvRows([cells]);
}
