// Streaming parse of a whole recorder file: text (or UTF-8 bytes) in, canonical rows out in
// batches, and a report of every problem with its line, column and value. Pure: no database,
// no HTTP, so the upload route, scripts and tests all call the same function.
import Papa from 'papaparse';
import { MAX_LISTED_PROBLEMS } from './format';
import { burndownMappingFor, burndownWithLayout, detectDecimal, detectDelimiter, detectNewline, findHeader, sepProblem, stripBom, type Layout } from './detect';
import { delimiterLabels } from './mapping';
import { burndownMapping, headerSignature, type ColumnMapping, type Delimiter } from './mapping';
import { createRowReader, type RecorderRow, type RowProblem, type RowReader, type RowReaderOptions } from './row';

export type CsvInput = string | Iterable<string | Uint8Array> | AsyncIterable<string | Uint8Array>;

export interface CsvHeader {
	/** 1-based line number of the header row. */
	line: number;
	names: string[];
	signature: string;
	/** Layout seen in the first lines (the mapping's own delimiter and decimal mark win). */
	layout: Layout;
}

/** Where the mapping came from, for the parse report. */
export interface MappingOrigin {
	kind: 'given' | 'burndown' | 'profile';
	profileId?: string;
	profileName?: string;
}

export type MappingChoice = { mapping: ColumnMapping; origin: MappingOrigin } | { problem: RowProblem };
/** Picks the mapping once the header is known (our format, a saved profile, or an error). */
export type MappingResolver = (header: CsvHeader) => MappingChoice | Promise<MappingChoice>;

export interface ParseOptions extends RowReaderOptions {
	/** Problems listed in the summary (all are counted). Default 50. */
	maxProblems?: number;
	/** Rows per onRows call. Default 4096. */
	batchRows?: number;
	/**
	 * Receives the rows in order while the file is still being read. It stops being called at the
	 * first problem, but rows before it have been delivered: a caller that must not store part of
	 * a bad file keeps them provisional until the summary says ok.
	 */
	onRows?: (rows: RecorderRow[]) => void | Promise<void>;
	/** Called after each chunk of input with the lines read and rows accepted so far. */
	onProgress?: (progress: { lines: number; rows: number }) => void;
	/** Fewer good samples than this is a problem. Default 2 (a flight); a live batch may take 1. */
	minSamples?: number;
	/**
	 * The uploader chose to store the file without its bad lines: up to MAX_DROPPED_LINES lines
	 * whose only problem is their own content (not the header, the mapping or the encoding) are
	 * left out and listed in `dropped` instead of refusing the file. Off unless asked for.
	 */
	dropBadLines?: boolean;
}

/** Said of a bad last line that ends without a line break. */
export const CUT_OFF_HINT = ' The file ends inside this line: it was probably cut off when the recorder lost power at shutdown.';

/** The most bad lines a file may lose when its uploader chose to leave them out. */
export const MAX_DROPPED_LINES = 20;

export interface ParseSummary {
	/** True when every row was good and there are at least two samples. */
	ok: boolean;
	header: CsvHeader | null;
	mapping: ColumnMapping | null;
	origin: MappingOrigin | null;
	/** Rows accepted (before the first problem, when there is one). */
	rowCount: number;
	/** Lines read in all, header and blank lines included. */
	lineCount: number;
	blankLines: number;
	firstTMs: number | null;
	lastTMs: number | null;
	/** Blank cells per quantity: samples where it was not recorded. */
	blankCells: { flow: number; gs: number; dtg: number; alt: number };
	ignoredColumns: string[];
	problems: RowProblem[];
	problemCount: number;
	/** Lines left out at the uploader's choice (dropBadLines), each with its problem. */
	dropped: RowProblem[];
	/**
	 * Whether a refused file could be stored by leaving out its bad lines: every problem is a line
	 * of its own (no header, mapping or encoding problem) and there are at most MAX_DROPPED_LINES.
	 */
	droppable: boolean;
}

/** A line longer than this is not a recorder row: the file is not a CSV (or has no line breaks). */
export const MAX_LINE_CHARS = 1 << 20;
/** Text is parsed in pieces of about this size, so memory stays flat whatever the file size. */
const SLICE_CHARS = 1 << 20;

class DecodeError extends Error {}

/** Text pieces from any input; bytes are decoded as UTF-8 and refused when they are not. */
async function* textOf(input: CsvInput): AsyncGenerator<string> {
	if (typeof input === 'string') {
		for (let i = 0; i < input.length; i += SLICE_CHARS) yield input.slice(i, i + SLICE_CHARS);
		return;
	}
	const decoder = new TextDecoder('utf-8', { fatal: true });
	let first = true;
	for await (const chunk of input as AsyncIterable<string | Uint8Array>) {
		if (typeof chunk === 'string') {
			yield chunk;
			continue;
		}
		if (first && chunk.length >= 2 && ((chunk[0] === 0xff && chunk[1] === 0xfe) || (chunk[0] === 0xfe && chunk[1] === 0xff)))
			throw new DecodeError('The file is UTF-16 text; save or export it as UTF-8.');
		first = false;
		try {
			const text = decoder.decode(chunk, { stream: true });
			if (text) yield text;
		} catch {
			throw new DecodeError('The file is not UTF-8 text (it may be a spreadsheet or a binary log); export it as CSV in UTF-8.');
		}
	}
	try {
		const rest = decoder.decode();
		if (rest) yield rest;
	} catch {
		throw new DecodeError('The file ends in the middle of a UTF-8 character.');
	}
}

/** The mapping for files that must be in our own format (a "sep=" line's delimiter honoured). */
export const burndownFormatOnly: MappingResolver = (header) => {
	const found = burndownMappingFor(header.names, header.layout);
	if ('mapping' in found) return { mapping: found.mapping, origin: { kind: 'burndown' } };
	return { problem: { line: header.line, column: '', value: header.names.join(header.layout.delimiter).slice(0, 200), message: `${found.message} Map the columns or choose an import profile.` } };
};

/**
 * Parses a recorder file. `mapping` is a fixed column mapping, a resolver called with the header,
 * or null for the Burndown recorder CSV. Never throws for bad content: everything wrong with the
 * file comes back in `problems`. Errors thrown by the input itself (a size limit, a closed
 * connection) pass through.
 */
export async function parseRecorderCsv(
	input: CsvInput,
	mapping: ColumnMapping | MappingResolver | null,
	options: ParseOptions = {}
): Promise<ParseSummary> {
	const maxProblems = options.maxProblems ?? MAX_LISTED_PROBLEMS;
	const batchRows = options.batchRows ?? 4096;
	const summary: ParseSummary = {
		ok: false,
		header: null,
		mapping: null,
		origin: null,
		rowCount: 0,
		lineCount: 0,
		blankLines: 0,
		firstTMs: null,
		lastTMs: null,
		blankCells: { flow: 0, gs: 0, dtg: 0, alt: 0 },
		ignoredColumns: [],
		problems: [],
		problemCount: 0,
		dropped: [],
		droppable: false
	};
	// Problems of the file as a whole (header, mapping, encoding, too few samples) are never dropped.
	let wholeFileProblem = false;
	const report = (p: RowProblem, ofLine = false) => {
		if (!ofLine) wholeFileProblem = true;
		summary.problemCount++;
		if (summary.problems.length < maxProblems) summary.problems.push(p);
	};

	let buf = '';
	/** Line number of the first line in buf. */
	let line = 1;
	let reader: RowReader | null = null;
	let parser: Papa.Parser | null = null;
	let newline: Layout['newline'] = '\n';
	let batch: RecorderRow[] = [];
	let fatal = false;

	const flush = async () => {
		if (batch.length === 0) return;
		const rows = batch;
		batch = [];
		if (summary.problemCount === 0 && options.onRows) await options.onRows(rows);
	};

	/** Finds the header once enough text is in; false while more is needed. */
	const startBody = async (final: boolean): Promise<boolean> => {
		if (buf.length < 65_536 && !final) return false;
		newline = detectNewline(buf);
		const { start, line: headerLine, sep } = findHeader(buf, newline);
		if (sep && 'unknown' in sep) {
			report({ line: 1, column: '', value: sep.unknown, message: sepProblem(sep.unknown) });
			fatal = true;
			return true;
		}
		const named = sep?.delimiter;
		if (start < 0) {
			if (!final) return false;
			report({ line: 1, column: '', value: '', message: 'The file is empty: no header row and no samples.' });
			fatal = true;
			return true;
		}
		const end = buf.indexOf(newline, start);
		const headerText = end < 0 ? buf.slice(start) : buf.slice(start, end);
		const rest = end < 0 ? '' : buf.slice(end + newline.length);
		const sniffDelimiter = named ?? detectDelimiter(buf.slice(start, start + 65_536), newline);
		const delimiter = typeof mapping === 'object' && mapping !== null ? mapping.delimiter : sniffDelimiter;
		const names = (Papa.parse<string[]>(headerText, { delimiter, newline }).data[0] ?? []).map((h) => h.trim());
		const previewRows = new Papa.Parser({ delimiter, newline }).parse(rest.slice(0, 16_384), 0, true).data as string[][];
		const layout: Layout = { delimiter, decimal: detectDecimal(previewRows, delimiter), newline, ...(named ? { sep: named } : {}) };
		const header: CsvHeader = { line: headerLine, names, signature: headerSignature(names), layout };
		summary.header = header;

		let chosen: MappingChoice;
		if (mapping === null) chosen = await burndownFormatOnly(header);
		else if (typeof mapping === 'function') chosen = await mapping(header);
		else chosen = { mapping, origin: { kind: 'given' } };
		if ('problem' in chosen) {
			report(chosen.problem);
			fatal = true;
			return true;
		}
		// Whichever resolver recognised our format (the upload's own does too), the hint is honoured.
		if (chosen.origin.kind === 'burndown') chosen = { ...chosen, mapping: burndownWithLayout(chosen.mapping, layout) };
		if (named && chosen.mapping.delimiter !== named) {
			const says = delimiterLabels[named];
			const splits = delimiterLabels[chosen.mapping.delimiter];
			report({ line: 1, column: '', value: `sep=${named}`, message: `Line 1 says the cells are separated by a ${says} (sep=${named === '\t' ? 'tab' : named}), but the column mapping splits them on a ${splits}; choose the ${says} in the mapping.` });
			fatal = true;
			return true;
		}
		summary.mapping = chosen.mapping;
		summary.origin = chosen.origin;
		const built = createRowReader(chosen.mapping, names, headerLine, options);
		if ('problems' in built) {
			built.problems.forEach((p) => report(p));
			fatal = true;
			return true;
		}
		reader = built.reader;
		summary.ignoredColumns = reader.ignoredColumns;
		parser = new Papa.Parser({ delimiter: chosen.mapping.delimiter, newline, quoteChar: '"' });
		buf = rest;
		line = headerLine + 1;
		return true;
	};

	// A line's own problem: left out when the uploader chose so (up to the limit), else reported.
	// Past the limit every line left out so far is reported too, and the file is refused.
	const lineProblem = (p: RowProblem) => {
		if (options.dropBadLines && summary.problemCount === 0) {
			if (summary.dropped.length < MAX_DROPPED_LINES) {
				summary.dropped.push(p);
				return;
			}
			for (const d of summary.dropped) report(d, true);
			summary.dropped = [];
		}
		report(p, true);
	};

	const parseBuffered = async (final: boolean) => {
		const r = reader!;
		// A file that ends inside its last line: that line was probably cut off at shutdown.
		const cutOff = final && buf.length > 0 && !buf.endsWith(newline);
		// The final line break ends the last row; it does not start an empty one.
		if (final && buf.endsWith(newline)) buf = buf.slice(0, -newline.length);
		const res = parser!.parse(buf, 0, !final) as Papa.ParseResult<string[]>;
		const rows = res.data;
		const quoted = buf.indexOf('"') !== -1;
		const quoteErrors = new Map<number, string>();
		for (const e of res.errors) if (typeof e.row === 'number' && !quoteErrors.has(e.row)) quoteErrors.set(e.row, e.message);
		const blanks = summary.blankCells;
		for (let i = 0; i < rows.length; i++) {
			const cells = rows[i];
			const at = line;
			if (quoted) for (const cell of cells) for (let k = cell.indexOf('\n'); k !== -1; k = cell.indexOf('\n', k + 1)) line++;
			line++;
			const lastCut = cutOff && i === rows.length - 1 ? CUT_OFF_HINT : '';
			const qe = quoteErrors.get(i);
			if (qe !== undefined) {
				lineProblem({ line: at, column: '', value: cells.join(summary.mapping!.delimiter).slice(0, 80), message: `Malformed quoting: ${qe}.${lastCut}` });
				continue;
			}
			const result = r.read(cells, at);
			if (result === null) {
				summary.blankLines++;
				continue;
			}
			if ('problem' in result) {
				lineProblem(lastCut ? { ...result.problem, message: result.problem.message + lastCut } : result.problem);
				continue;
			}
			if (summary.problemCount > 0) continue;
			const row = result.row;
			if (summary.rowCount === 0) summary.firstTMs = row.tMs;
			summary.lastTMs = row.tMs;
			summary.rowCount++;
			if (row.flow === null) blanks.flow++;
			if (row.gs === null) blanks.gs++;
			if (row.dtg === null) blanks.dtg++;
			if (row.alt === null) blanks.alt++;
			batch.push(row);
			if (batch.length >= batchRows) await flush();
		}
		buf = final ? '' : buf.slice(res.meta.cursor);
		if (buf.length > MAX_LINE_CHARS) {
			report({ line, column: '', value: buf.slice(0, 80), message: 'This line is longer than 1 MB: the file is not a CSV with one sample per line.' });
			fatal = true;
		}
	};

	try {
		for await (const text of textOf(input)) {
			buf = buf.length === 0 ? text : buf + text;
			if (!reader && !fatal) {
				if (!(await startBody(false))) continue;
			}
			if (fatal) break;
			await parseBuffered(false);
			if (fatal) break;
			options.onProgress?.({ lines: line - 1, rows: summary.rowCount });
		}
		if (!fatal) {
			if (!reader) await startBody(true);
			if (reader && !fatal) await parseBuffered(true);
		}
	} catch (error) {
		if (!(error instanceof DecodeError)) throw error;
		report({ line, column: '', value: '', message: error.message });
		fatal = true;
	}
	if (!fatal) await flush();
	options.onProgress?.({ lines: line - 1, rows: summary.rowCount });

	summary.lineCount = Math.max(0, line - 1);
	if (summary.problemCount === 0 && reader && summary.rowCount < (options.minSamples ?? 2))
		report({
			line: summary.lineCount,
			column: '',
			value: '',
			message: summary.rowCount === 0 ? 'The file has a header but no samples.' : 'The file has only one sample; a flight needs at least two.'
		});
	summary.ok = summary.problemCount === 0;
	summary.droppable = !summary.ok && !wholeFileProblem && summary.problemCount <= MAX_DROPPED_LINES;
	return summary;
}

/** Parses a whole text in memory and returns its rows too: for small files, live batches and tests. */
export async function parseRecorderText(
	text: string,
	mapping: ColumnMapping | MappingResolver | null,
	options: Omit<ParseOptions, 'onRows'> = {}
): Promise<ParseSummary & { rows: RecorderRow[] }> {
	const rows: RecorderRow[] = [];
	const summary = await parseRecorderCsv(text, mapping, {
		...options,
		onRows: (batch) => {
			for (const r of batch) rows.push(r);
		}
	});
	return { ...summary, rows: summary.ok ? rows : [] };
}

/**
 * The cells of each line of a headerless CSV fragment (a live batch), quote-aware; a final line
 * break does not add an empty line. Pair it with createRowReader for the checks.
 */
export function splitCsvLines(text: string, delimiter: Delimiter = ','): string[][] {
	const body = stripBom(text);
	const newline = detectNewline(body);
	const trimmed = body.endsWith(newline) ? body.slice(0, -newline.length) : body;
	if (trimmed === '') return [];
	return new Papa.Parser({ delimiter, newline, quoteChar: '"' }).parse(trimmed, 0, false).data as string[][];
}

/** BOM-free text for code that reads a file whole (the browser's preview). */
export { stripBom };
