// Where sign-in may send the browser afterwards: only a path of this site, whatever the encoding
// tricks (OWASP Unvalidated Redirects and Forwards Cheat Sheet; ASVS 5.0 V3.4).
import { describe, expect, it } from 'vitest';
import { safeNext } from './redirects';

// Hostile values as they arrive after URLSearchParams has decoded the query string.
const HOSTILE = [
	'//elsewhere.example/',
	'/\\elsewhere.example/',
	'\\\\elsewhere.example',
	'/\t/elsewhere.example/',
	'/\n/elsewhere.example/',
	'/\r/elsewhere.example/',
	'/ /elsewhere.example/',
	'/\u000b/elsewhere.example/',
	'/\u000c/elsewhere.example/',
	'/\u0000/elsewhere.example/',
	'/\u00a0/elsewhere.example/',
	'/\u2028/elsewhere.example/',
	'\t//elsewhere.example/',
	' //elsewhere.example/',
	'/\t\\elsewhere.example',
	'https://elsewhere.example/',
	'http:/elsewhere.example',
	'javascript:alert(1)',
	'/%2F/elsewhere.example/',
	'/%5Celsewhere.example/',
	'/ok\r\nSet-Cookie: x=1',
	'/ok\nLocation: https://elsewhere.example',
	'elsewhere.example',
	'.',
	''
];

describe('safeNext', () => {
	it.each(HOSTILE)('refuses %j and falls back', (value) => {
		expect(safeNext(value, '/fallback')).toBe('/fallback');
	});

	it('keeps same-origin paths with their query and fragment', () => {
		expect(safeNext('/o/kestrel/flights?page=2#top')).toBe('/o/kestrel/flights?page=2#top');
		expect(safeNext('/invite/inv_abc-DEF_123')).toBe('/invite/inv_abc-DEF_123');
		expect(safeNext('/')).toBe('/');
	});

	it('answers a path that cannot carry a header break', () => {
		for (const value of ['/a?b=c d', '/caf\u00e9']) {
			const out = safeNext(value, '/fallback');
			expect(out).not.toMatch(/[\u0000-\u0020\u007f-\u009f]/);
			expect(out.startsWith('/') && !out.startsWith('//')).toBe(true);
		}
	});

	it('falls back for nothing at all', () => {
		expect(safeNext(null, '/x')).toBe('/x');
		expect(safeNext(undefined)).toBe('/');
	});
});
