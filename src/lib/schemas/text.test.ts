import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { plainText, textProblem } from './text';
import { organisationSchema } from './organisation';
import { signUpSchema } from './account';
import { receiptFormSchema } from './pump';
import { fuelEventFormSchema, noteFormSchema } from './flight';
import { aircraftFormSchema } from './aircraft';
import { openSchema } from '$lib/server/live/batch';

// Unicode Technical Report #36 (bidirectional spoofing) and the OWASP Input Validation Cheat
// Sheet: control and directional-override characters are refused in stored names and titles.
const HOSTILE = ['\u0000', '\u0007', '\u001b', '\u007f', '\u0085', '\u202a', '\u202b', '\u202c', '\u202d', '\u202e', '\u2066', '\u2067', '\u2068', '\u2069', '\ud800'];

describe('plainText', () => {
	const single = plainText(100, { required: 'Enter it.' });
	const multi = plainText(100, { required: 'Enter it.', multiline: true });

	it('keeps ordinary text of every script, emoji and accents', () => {
		for (const s of ['Larkspur Valley Aero Club', 'Ærø Flyveklub', 'نادي الطيران', 'מועדון תעופה', '航空クラブ', 'Club 🛩️', 'O’Neill & Söhne'])
			expect(single.parse(s), s).toBe(s);
	});

	it('refuses each control and bidirectional character, naming it and its position', () => {
		for (const c of HOSTILE) {
			const r = single.safeParse(`Kestrel${c}Club`);
			expect(r.success, JSON.stringify(c)).toBe(false);
			expect(r.error!.issues[0].message).toMatch(/\(U\+[0-9A-F]{4}\) at character 8/);
		}
		expect(textProblem('ab\u202ecd')).toBe('Remove a right-to-left override (U+202E) at character 3: it would be stored invisibly.');
		// Position counts characters, not UTF-16 units: the emoji before it is one character.
		expect(textProblem('🛩\u0007')).toMatch(/at character 2/);
	});

	it('allows line breaks only in a multi-line field, and stores them as LF', () => {
		expect(single.safeParse('one\ntwo').success).toBe(false);
		expect(single.safeParse('one\ttwo').success).toBe(false);
		expect(multi.parse('one\r\ntwo\rthree\nfour')).toBe('one\ntwo\nthree\nfour');
		expect(multi.safeParse('one\ttwo').success).toBe(false);
		expect(multi.safeParse('one\n\u202etwo').success).toBe(false);
	});

	it('keeps the length and required rules', () => {
		expect(single.safeParse('   ').error?.issues[0].message).toBe('Enter it.');
		expect(single.safeParse('x'.repeat(101)).error?.issues[0].message).toBe('Use at most 100 characters.');
		expect(plainText(10).parse('  padded ')).toBe('padded');
	});
});

describe('every name, title and note field uses it', () => {
	const fields: [string, z.ZodType, (bad: string) => Record<string, unknown>][] = [
		['organisation name', organisationSchema, (v) => ({ name: v })],
		['account name', signUpSchema, (v) => ({ name: v, email: 'a@example.org', password: 'long enough pass' })],
		['pump receipt note', receiptFormSchema(0.719), (v) => ({ at: '2026-05-01T10:00', amount: '10', unit: 'l', full: '1', note: v })],
		['fuel event note', fuelEventFormSchema(0.72), (v) => ({ kind: 'toFull', unit: 'l', at: '2026-05-02T09:00', note: v })],
		['flight note', noteFormSchema, (v) => ({ body: v })],
		['live flight title', openSchema, (v) => ({ title: v })],
		['aircraft type', aircraftFormSchema, (v) => ({ registration: 'BD-KES', type: v, fuelType: 'avgas', displayUnit: 'l', capacity: '150', meterFactor: '1', reserveRule: 'faa-91.151-vfr-day' })]
	];
	for (const [what, schema, body] of fields)
		it(what, () => {
			expect(schema.safeParse(body('Kestrel Club')).success, 'plain text accepted').toBe(true);
			expect(schema.safeParse(body('Kestrel \u202ebulC')).success).toBe(false);
			expect(schema.safeParse(body('Kestrel\u0000Club')).success).toBe(false);
		});
});
