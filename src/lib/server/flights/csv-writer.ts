// Writing the exports' CSV with papaparse's unparse, safe to open in a spreadsheet. Text from
// people (a flight title, a pilot's name, a waypoint) could start with a formula; OWASP's "CSV
// Injection" guidance: a text cell that begins with =, +, -, @, tab or carriage return gets a
// leading single quote, and is quoted. Numbers are passed as numbers, never as text, so a negative
// figure stays a number. Lines end in CRLF (RFC 4180), and a file may start with a UTF-8 byte-order
// mark, which spreadsheets read as "this is UTF-8".
import Papa from 'papaparse';

/** A cell: text, a number (written as it is, so never escaped), or empty. */
export type Cell = string | number | null | undefined;

/**
 * Characters that make a spreadsheet read a cell as a formula (OWASP, CSV Injection). Our own
 * pattern: papaparse's default (/^[=+\-@\t\r].*$/) misses a formula followed by a line break.
 */
export const FORMULA_START = /^[=+\-@\t\r]/;

/** U+FEFF, the UTF-8 byte-order mark. */
export const BOM = '\uFEFF';

/** A number rounded to `digits` decimals, or null (an empty cell) when it is not finite. */
export function numberCell(x: number | null | undefined, digits: number): number | null {
	if (x === null || x === undefined || !Number.isFinite(x)) return null;
	const rounded = Number(x.toFixed(digits));
	// -0 would print as "0" anyway; keep it plain.
	return rounded === 0 ? 0 : rounded;
}

/** CSV lines for the rows, each ending in CRLF (an empty string for no rows). */
export function csvLines(rows: readonly (readonly Cell[])[]): string {
	if (rows.length === 0) return '';
	return Papa.unparse(rows as Cell[][], { escapeFormulae: FORMULA_START, newline: '\r\n', quotes: false, header: false }) + '\r\n';
}
