// Looking at the start of a recorder file before parsing it: where the header row is, which
// delimiter and decimal mark it uses, what the columns are called and what the first rows hold.
// Runs in the browser for the column mapper and on the server when no mapping is given.
import Papa from 'papaparse';
import { burndownMapping, delimiterLabels, delimiters, guessMapping, headerSignature, type ColumnMapping, type Delimiter } from './mapping';

/** Lines before the header that are skipped: blank lines and comment lines starting with '#'. */
const isPreamble = (line: string) => line.trim() === '' || line.trimStart().startsWith('#');

export interface Layout {
	delimiter: Delimiter;
	decimal: '.' | ',';
	newline: '\r\n' | '\n' | '\r';
	/** The delimiter a spreadsheet's "sep=" first line names, when the file has one. */
	sep?: Delimiter;
}

const SEP_LINE = /^"?sep=(.*?)"?$/i;

/**
 * A spreadsheet's first line "sep=;" (also "sep=," and "sep=" with a tab) says which delimiter
 * the rest of the file uses. The delimiter it names, its text when it names one we do not read,
 * or null when the line is not such a hint.
 */
export function sepHint(line: string): { delimiter: Delimiter } | { unknown: string } | null {
	const text = stripBom(line).replace(/[\r\n]+$/, '');
	const m = SEP_LINE.exec(text);
	if (!m) return null;
	// A spreadsheet that saved the file again may pad the hint row with delimiters: "sep=;;;;".
	const value = m[1] === '\\t' ? '\t' : /^(.)\1+$/.test(m[1]) ? m[1][0] : m[1];
	return (delimiters as readonly string[]).includes(value) ? { delimiter: value as Delimiter } : { unknown: text.trim() };
}

/**
 * Our format recognised from the header, read with the file's layout. Our format is
 * comma-separated with decimal points; a spreadsheet that saved it again with a "sep=" line
 * (semicolons and decimal commas, in many locales) said what it used instead, and that is read.
 */
export function burndownMappingFor(headers: readonly string[], layout: Pick<Layout, 'sep' | 'decimal'>): ReturnType<typeof burndownMapping> {
	const found = burndownMapping(headers);
	return 'mapping' in found ? { mapping: burndownWithLayout(found.mapping, layout) } : found;
}

/** Our format's mapping with the delimiter a "sep=" line named and the decimal mark seen. */
export function burndownWithLayout(m: ColumnMapping, layout: Pick<Layout, 'sep' | 'decimal'>): ColumnMapping {
	return layout.sep ? { ...m, delimiter: layout.sep, decimal: layout.decimal } : m;
}

/** What is wrong with a hint we cannot follow, naming it. */
export function sepProblem(text: string): string {
	return `Line 1 is a delimiter hint (${text}), but Burndown reads only ${delimiters.map((d) => delimiterLabels[d]).join(', ')} between the cells; save the file again with one of these, or remove that line.`;
}

export interface Preview extends Layout {
	/** 1-based line number of the header row. */
	headerLine: number;
	headers: string[];
	signature: string;
	/** The first data rows as cells, for the mapper's table. */
	rows: string[][];
	/** Our own format recognised from the header, or why not. */
	burndown: { mapping: ColumnMapping } | { missing: string[]; message: string };
	/** A starting point for the mapper when the file is not in our format. */
	guess: ReturnType<typeof guessMapping>;
	/** Problems visible already: empty file, a header that looks like data. */
	warnings: string[];
}

export function stripBom(text: string): string {
	return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

export function detectNewline(text: string): Layout['newline'] {
	const n = text.indexOf('\n');
	const r = text.indexOf('\r');
	if (n < 0 && r >= 0) return '\r';
	if (n > 0 && r === n - 1) return '\r\n';
	return '\n';
}

/**
 * Index in `text` where the header row starts, and its line number; -1 when there is none yet.
 * A "sep=" first line is skipped like a comment, and what it says is returned as `sep`.
 */
export function findHeader(text: string, newline: Layout['newline']): { start: number; line: number; sep: ReturnType<typeof sepHint> } {
	let start = 0;
	let line = 1;
	let sep: ReturnType<typeof sepHint> = null;
	for (;;) {
		const end = text.indexOf(newline, start);
		const content = end < 0 ? text.slice(start) : text.slice(start, end);
		const hint = line === 1 ? sepHint(content) : null;
		if (hint) sep = hint;
		else if (!isPreamble(content)) return { start, line, sep };
		if (end < 0) return { start: -1, line, sep };
		start = end + newline.length;
		line++;
	}
}

/** Cells of the first `max` lines; a last line without its line break is left out unless `whole`. */
function splitLines(text: string, delimiter: string, newline: Layout['newline'], max: number, whole = false): string[][] {
	const res = new Papa.Parser({ delimiter, newline, quoteChar: '"' }).parse(text, 0, !whole) as Papa.ParseResult<string[]>;
	return res.data.slice(0, max);
}

/** The delimiter that splits the header and the next lines into the same, largest number of cells. */
export function detectDelimiter(text: string, newline: Layout['newline']): Delimiter {
	let best: Delimiter = ',';
	let bestScore = -1;
	for (const d of delimiters) {
		const rows = splitLines(text, d, newline, 20, true).filter((r) => !(r.length === 1 && r[0].trim() === ''));
		if (rows.length === 0) continue;
		const width = rows[0].length;
		if (width < 2) continue;
		const consistent = rows.filter((r) => r.length === width).length / rows.length;
		const score = consistent * 1000 + width;
		if (score > bestScore) {
			bestScore = score;
			best = d;
		}
	}
	return best;
}

const DECIMAL_COMMA_CELL = /^\s*[+-]?\d+,\d+\s*$/;
const DECIMAL_POINT_CELL = /^\s*[+-]?\d+\.\d+\s*$/;

export function detectDecimal(rows: readonly (readonly string[])[], delimiter: Delimiter): '.' | ',' {
	if (delimiter === ',') return '.';
	let comma = 0;
	let point = 0;
	for (const r of rows)
		for (const cell of r) {
			if (DECIMAL_COMMA_CELL.test(cell)) comma++;
			else if (DECIMAL_POINT_CELL.test(cell)) point++;
		}
	return comma > point ? ',' : '.';
}

/**
 * Everything the column mapper shows about a file, from its first few kilobytes. `whole` says
 * the sample is the entire file, so its last line counts even without a line break; `delimiter`
 * overrides the detected one (the user's choice in the mapper).
 */
export function previewCsv(sample: string, options: { whole?: boolean; maxRows?: number; delimiter?: Delimiter } = {}): Preview {
	const { whole = false, maxRows = 10 } = options;
	const text = stripBom(sample);
	const newline = detectNewline(text);
	const warnings: string[] = [];
	const { start, line, sep } = findHeader(text, newline);
	const body = start < 0 ? '' : text.slice(start);
	if (sep && 'unknown' in sep) warnings.push(sepProblem(sep.unknown));
	const named = sep && 'delimiter' in sep ? sep.delimiter : undefined;
	const delimiter = options.delimiter ?? named ?? detectDelimiter(body, newline);
	const all = splitLines(body, delimiter, newline, maxRows + 1, whole);
	const headers = (all[0] ?? []).map((h) => h.trim());
	const rows = all.slice(1).filter((r) => !(r.length === 1 && r[0].trim() === ''));
	if (headers.length === 0) warnings.push('The file is empty.');
	else if (headers.every((h) => /^[+-]?[\d.,:\-TZ ]+$/.test(h)))
		warnings.push('The first line looks like data, not a header row with column names.');
	if (headers.length > 0 && rows.length === 0) warnings.push('No data rows after the header.');
	const decimal = detectDecimal(rows, delimiter);
	return {
		delimiter,
		decimal,
		newline,
		...(named ? { sep: named } : {}),
		headerLine: line,
		headers,
		signature: headerSignature(headers),
		rows,
		burndown: burndownMappingFor(headers, { sep: named, decimal }),
		guess: guessMapping(headers, rows[0] ?? [], { delimiter, decimal }),
		warnings
	};
}
