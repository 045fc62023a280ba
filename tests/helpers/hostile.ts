// Hostile input for the property tests (fast-check): text with any code unit, lone surrogates,
// NUL bytes and bidirectional overrides, numbers in spellings the grammar refuses, and sizes
// past the limits. Shared by the schema, batch-parser and route property tests.
import fc from 'fast-check';

export const hostileText = fc.oneof(
	fc.string({ unit: 'binary', maxLength: 40 }),
	fc.string({ unit: fc.integer({ min: 0, max: 0xffff }).map((c) => String.fromCharCode(c)), maxLength: 40 }),
	fc.constantFrom(
		'', ' ', '0', '-0', '0x10', '0b1', '1e400', '1,5', '1.000,5', 'NaN', 'Infinity', '\u0000', 'a\u0000b', '\u202eevil', '\u2066x\u2069',
		'line\nbreak', '\r\n', '__proto__', 'constructor', '2026-05-02T09:00', '2026-02-30T25:61', 'a@b.c', 'x'.repeat(3000),
		'00000000-0000-4000-8000-000000000000', "'; drop table users; --"
	),
	fc.double().map(String),
	fc.integer().map(String)
);

/** A form: the given fields (each maybe missing) and some stray ones, every value hostile. */
export const formOf = (fields: string[]) =>
	fc.dictionary(fc.oneof(fc.constantFrom(...fields), fc.string({ maxLength: 8 })), hostileText, { maxKeys: fields.length + 3 }).map((values) => {
		const form = new FormData();
		for (const [k, v] of Object.entries(values)) form.append(k, v);
		return form;
	});
