// Writing CSV cells that are safe to open in a spreadsheet. Text from people (a flight title, a
// pilot's name, a waypoint) could start with a formula; OWASP's "CSV Injection" guidance: a cell
// that begins with =, +, -, @, tab or carriage return gets a leading single quote, and the cell
// is quoted with its quotes doubled. Numbers we format ourselves are written as they are, so a
// negative figure stays a number.

/** Characters that make a spreadsheet read a cell as a formula (OWASP, CSV Injection). */
const FORMULA_START = /^[=+\-@\t\r]/;
const NEEDS_QUOTES = /[",\n\r]/;

/** A text cell: neutralised when it could be read as a formula, quoted when it must be. */
export function textCell(s: string): string {
	if (FORMULA_START.test(s)) return `"'${s.replace(/"/g, '""')}"`;
	return NEEDS_QUOTES.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** A number cell with `digits` decimals; empty when the value is not a finite number. */
export function numberCell(x: number | null | undefined, digits: number): string {
	return x === null || x === undefined || !Number.isFinite(x) ? '' : x.toFixed(digits);
}

/** One CSV line from cells already written with textCell / numberCell. */
export const csvLine = (cells: readonly string[]): string => cells.join(',');
