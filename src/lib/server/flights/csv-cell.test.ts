import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Papa from 'papaparse';
import { numberCell, textCell } from './csv-cell';

describe('CSV cells', () => {
	it('neutralises text that a spreadsheet would run as a formula (OWASP, CSV Injection)', () => {
		expect(textCell('=HYPERLINK("http://evil.example","x")')).toBe(`"'=HYPERLINK(""http://evil.example"",""x"")"`);
		expect(textCell('+1+1')).toBe(`"'+1+1"`);
		expect(textCell('-2+3')).toBe(`"'-2+3"`);
		expect(textCell('@SUM(A1)')).toBe(`"'@SUM(A1)"`);
		expect(textCell('\t=1')).toBe(`"'\t=1"`);
		expect(textCell('\r=1')).toBe(`"'\r=1"`);
	});

	it('leaves ordinary text alone and quotes only what must be quoted', () => {
		expect(textCell('Merrow circuit')).toBe('Merrow circuit');
		expect(textCell('a, b')).toBe('"a, b"');
		expect(textCell('say "hi"')).toBe('"say ""hi"""');
		expect(textCell('')).toBe('');
		// Not at the start: no formula.
		expect(textCell('a=b')).toBe('a=b');
	});

	it('keeps negative numbers as numbers', () => {
		expect(numberCell(-3.25, 3)).toBe('-3.250');
		expect(numberCell(0, 1)).toBe('0.0');
		expect(numberCell(NaN, 1)).toBe('');
		expect(numberCell(null, 1)).toBe('');
	});

	it('any text reads back (with papaparse) as itself, or as itself after the quote, never as a formula', () => {
		fc.assert(
			fc.property(fc.string({ unit: fc.constantFrom('=', '+', '-', '@', '\t', '\r', '\n', '"', ',', 'a', ' ', 'é') }), (s) => {
				const line = `${textCell(s)},end`;
				// The delimiter is given, as our exports declare it (sep=, and a comma header): left to
				// guess from one line such as "a\t\t,end", papaparse would pick the tab.
				const parsed = Papa.parse<string[]>(line, { newline: '\r\n', delimiter: ',' }).data[0];
				const cell = parsed[0];
				expect(parsed[parsed.length - 1]).toBe('end');
				if (/^[=+\-@\t\r]/.test(s)) expect(cell).toBe(`'${s}`);
				else expect(cell).toBe(s);
				expect(/^[=+\-@\t\r]/.test(cell)).toBe(false);
			})
		);
	});
});
