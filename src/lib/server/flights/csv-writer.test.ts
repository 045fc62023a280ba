import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Papa from 'papaparse';
import { BOM, csvLines, numberCell } from './csv-writer';

const line = (...cells: (string | number | null)[]) => csvLines([cells]);

describe('the CSV writer', () => {
	it('neutralises text that a spreadsheet would run as a formula (OWASP, CSV Injection)', () => {
		expect(line('=HYPERLINK("http://evil.example","x")')).toBe(`"'=HYPERLINK(""http://evil.example"",""x"")"\r\n`);
		expect(line('+1+1')).toBe(`"'+1+1"\r\n`);
		expect(line('-2+3')).toBe(`"'-2+3"\r\n`);
		expect(line('@SUM(A1)')).toBe(`"'@SUM(A1)"\r\n`);
		expect(line('\t=1')).toBe(`"'\t=1"\r\n`);
		expect(line('\r=1')).toBe(`"'\r=1"\r\n`);
		// A formula followed by a line break, which papaparse's own default pattern lets through.
		expect(line('=1+1\nsecond line')).toBe(`"'=1+1\nsecond line"\r\n`);
	});

	it('quotes only what must be quoted (RFC 4180) and leaves ordinary text alone', () => {
		expect(line('Merrow circuit', 'a, b', 'say "hi"', '', 'a=b', 'two\nlines')).toBe('Merrow circuit,"a, b","say ""hi""",,a=b,"two\nlines"\r\n');
		expect(csvLines([['a', 'b'], ['c', null]])).toBe('a,b\r\nc,\r\n');
		expect(csvLines([])).toBe('');
	});

	it('keeps negative numbers as numbers, rounded, and writes nothing for a missing one', () => {
		expect(line(numberCell(-3.25, 3), numberCell(-0.0001, 3), numberCell(2.5, 0), numberCell(NaN, 1), numberCell(null, 1), numberCell(Infinity, 1))).toBe('-3.25,0,3,,,\r\n');
	});

	it('the byte-order mark is U+FEFF, which is EF BB BF in UTF-8', () => {
		expect(Array.from(new TextEncoder().encode(BOM + line('a')).slice(0, 3))).toEqual([0xef, 0xbb, 0xbf]);
	});

	it('any text reads back (with papaparse) as itself, or as itself after the quote, never as a formula', () => {
		fc.assert(
			fc.property(fc.string({ unit: fc.constantFrom('=', '+', '-', '@', '\t', '\r', '\n', '"', ',', 'a', ' ', 'é') }), (s) => {
				const text = csvLines([[s, 'end']]);
				// The delimiter is given, as our exports declare it (a comma header): left to guess from
				// one line such as "a\t\t,end", papaparse would pick the tab.
				const parsed = Papa.parse<string[]>(text, { newline: '\r\n', delimiter: ',' }).data[0];
				const cell = parsed[0];
				expect(parsed[parsed.length - 1]).toBe('end');
				if (/^[=+\-@\t\r]/.test(s)) expect(cell).toBe(`'${s}`);
				else expect(cell).toBe(s);
				expect(/^[=+\-@\t\r]/.test(cell)).toBe(false);
			})
		);
	});
});
