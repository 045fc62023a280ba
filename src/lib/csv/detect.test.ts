// The "sep=" hint a spreadsheet writes as the first line of a CSV export: read as the delimiter,
// skipped as a line, or refused with a message that names it.
import { describe, expect, it } from 'vitest';
import { previewCsv, sepHint } from './detect';

describe('the sep= first line', () => {
	it('names the delimiter: comma, semicolon or tab, quoted or not, any case', () => {
		expect(sepHint('sep=,')).toEqual({ delimiter: ',' });
		expect(sepHint('sep=;')).toEqual({ delimiter: ';' });
		expect(sepHint('sep=\t')).toEqual({ delimiter: '\t' });
		expect(sepHint('SEP=;')).toEqual({ delimiter: ';' });
		expect(sepHint('"sep=;"')).toEqual({ delimiter: ';' });
		expect(sepHint('sep=\\t')).toEqual({ delimiter: '\t' });
		expect(sepHint('\uFEFFsep=;')).toEqual({ delimiter: ';' });
		// The hint row padded with delimiters by a spreadsheet that saved the file again.
		expect(sepHint('sep=;;;;')).toEqual({ delimiter: ';' });
	});

	it('is not a hint when the line says something else', () => {
		expect(sepHint('time_utc,fuel_flow_usgph')).toBeNull();
		expect(sepHint('separator,flow')).toBeNull();
		expect(sepHint('# sep=,')).toBeNull();
	});

	it('reports a delimiter Burndown does not read, by its text', () => {
		expect(sepHint('sep=|')).toEqual({ unknown: 'sep=|' });
		expect(sepHint('sep=')).toEqual({ unknown: 'sep=' });
	});

	it('gives the mapper the delimiter from the hint, and the header on the next line', () => {
		// A semicolon file whose rows would sniff as commas on their own (decimal commas, two
		// columns), so only the hint gets it right.
		const text = 'sep=;\r\nZeit;FF l/h\r\n09:00:00;31,5\r\n09:00:01;31,7\r\n';
		const p = previewCsv(text, { whole: true });
		expect(p).toMatchObject({ delimiter: ';', decimal: ',', sep: ';', headerLine: 2, headers: ['Zeit', 'FF l/h'] });
		expect(p.rows).toEqual([
			['09:00:00', '31,5'],
			['09:00:01', '31,7']
		]);
		expect(p.warnings).toEqual([]);
	});

	it('skips the hint after a byte-order mark, and the user may still choose another delimiter', () => {
		const p = previewCsv('\uFEFFsep=,\nA,B\n1,2\n', { whole: true });
		expect(p).toMatchObject({ delimiter: ',', sep: ',', headerLine: 2, headers: ['A', 'B'] });
		expect(previewCsv('sep=,\nA;B\n1;2\n', { whole: true, delimiter: ';' }).headers).toEqual(['A', 'B']);
	});

	it('warns, naming the line, about a hint it cannot follow', () => {
		const p = previewCsv('sep=|\nA,B\n1,2\n', { whole: true });
		expect(p.headerLine).toBe(2);
		expect(p.warnings.join(' ')).toMatch(/line 1.*sep=\|/i);
	});
});
