import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULT_LIMITS } from '$lib/fuel';
import { burndownMapping, columnMappingSchema, guessMapping, guessTimeFormat, headerSignature, profileMapping } from './mapping';
import { previewCsv } from './detect';
import { recorderRowSchema, withinLimits, type RecorderRow } from './row';
import { MAX_FLOW_LPH, MAX_GS_KT } from './format';

describe('column mappings', () => {
	const base = { delimiter: ',', decimal: '.', time: { column: 't', format: 'iso' }, flow: { column: 'f', unit: 'l/h' } };

	it('fills optional fields with null', () => {
		const m = columnMappingSchema.parse(base);
		expect(m.gs).toBeNull();
		expect(m.seq).toBeNull();
	});

	it('refuses mappings that cannot work', () => {
		const issues = (v: unknown) => {
			const r = columnMappingSchema.safeParse(v);
			return r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
		};
		expect(issues({ ...base, decimal: ',' })).toEqual(['decimal: A decimal comma needs a delimiter other than the comma.']);
		expect(issues({ ...base, time: { column: 't', format: 'elapsedS' } })[0]).toMatch(/^time.start: /);
		expect(issues({ ...base, time: { column: 't', format: 'clock' } })[0]).toMatch(/^time.date: /);
		expect(issues({ ...base, gs: { column: 'F', unit: 'kt' } })[0]).toMatch(/gs.column: Column "F" is already used for fuel flow/);
		expect(issues({ ...base, flow: { column: 'f', unit: 'gal/h' } })[0]).toMatch(/^flow.unit/);
	});

	it('keeps a profile free of one file’s date', () => {
		const m = columnMappingSchema.parse({ ...base, time: { column: 't', format: 'clock', date: '2026-05-02', utcOffsetMin: 60 } });
		expect(profileMapping(m).time).toEqual({ column: 't', format: 'clock', utcOffsetMin: 60 });
	});

	it('matches headers by a normalised signature', () => {
		expect(headerSignature([' Time ', 'FF  (l/h)'])).toBe(headerSignature(['time', 'ff (L/H)']));
		expect(headerSignature(['a', 'b'])).not.toBe(headerSignature(['b', 'a']));
	});

	it('recognises our format in any column order, with optional columns', () => {
		const found = burndownMapping(['ground_speed_kt', 'TIME_UTC', 'fuel_flow_lph', 'distance_to_go_nm', 'seq']);
		expect('mapping' in found && found.mapping.flow.unit).toBe('l/h');
		expect('mapping' in found && found.mapping.seq).toEqual({ column: 'seq' });
		expect('mapping' in found && found.mapping.wpt).toBeNull();
	});

	it('guesses a first mapping for another recorder', () => {
		const g = guessMapping(['Uhrzeit', 'FF (l/h)', 'GS km/h', 'Dist NM', 'Alt m', 'WP'], ['09:14:05', '31,5', '180', '40', '900', 'EKFD'], { delimiter: ';', decimal: ',' });
		expect(g.time).toEqual({ column: 'Uhrzeit', format: 'clock' });
		expect(g.flow).toEqual({ column: 'FF (l/h)', unit: 'l/h' });
		expect(g.gs).toEqual({ column: 'GS km/h', unit: 'km/h' });
		expect(g.dtg).toEqual({ column: 'Dist NM', unit: 'nm' });
		expect(g.alt).toEqual({ column: 'Alt m', unit: 'm' });
		expect(g.wpt).toEqual({ column: 'WP' });
		expect(guessTimeFormat('1777713245')).toBe('epochS');
		expect(guessTimeFormat('1777713245123')).toBe('epochMs');
		expect(guessTimeFormat('2026-05-02T09:14:05Z')).toBe('iso');
		expect(guessTimeFormat('12.5')).toBe('elapsedS');
	});
});

describe('previewing a file', () => {
	it('finds the header, delimiter and decimal comma of a semicolon file', () => {
		const p = previewCsv('\uFEFF# Panel log v2\r\nZeit;FF l/h;GS kt\r\n09:00:00;31,5;0\r\n09:00:01;31,7;3,5\r\n', { whole: true });
		expect(p).toMatchObject({ delimiter: ';', decimal: ',', newline: '\r\n', headerLine: 2, headers: ['Zeit', 'FF l/h', 'GS kt'] });
		expect(p.rows).toEqual([
			['09:00:00', '31,5', '0'],
			['09:00:01', '31,7', '3,5']
		]);
		expect('missing' in p.burndown).toBe(true);
		expect(p.warnings).toEqual([]);
	});

	it('recognises our format and leaves out a cut-off last line', () => {
		const p = previewCsv('time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm\n2026-05-02T09:00:00Z,9,0,40\n2026-05-02T09:00:01Z,9,0,4');
		expect('mapping' in p.burndown).toBe(true);
		expect(p.rows).toHaveLength(1);
	});

	it('warns about a missing header row and an empty file', () => {
		expect(previewCsv('2026-05-02T09:00:00Z,9,0,40\n2026-05-02T09:00:01Z,9,0,40\n', { whole: true }).warnings[0]).toMatch(/looks like data/);
		expect(previewCsv('', { whole: true }).warnings[0]).toMatch(/empty/);
	});

	it('tells tabs from commas inside quotes', () => {
		const p = previewCsv('a\tb\tc\n"1,5"\t2\t3\n', { whole: true });
		expect(p.delimiter).toBe('\t');
	});
});

describe('the row limits', () => {
	it('are the fuel engine’s, so parser and engine never disagree', () => {
		expect(MAX_FLOW_LPH).toBe(DEFAULT_LIMITS.maxFlowLph);
		expect(MAX_GS_KT).toBe(DEFAULT_LIMITS.maxGsKt);
	});

	it('the fast predicate accepts exactly what the zod row schema accepts', () => {
		const maybe = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: null });
		const edgy = (lo: number, hi: number) => fc.oneof(fc.double({ min: lo - 10, max: hi + 10 }), fc.constantFrom(lo, hi, NaN, Infinity, -0));
		const row = fc.record({
			line: fc.oneof(fc.integer({ min: -1, max: 10 }), fc.constant(1.5)),
			seq: maybe(fc.oneof(fc.integer({ min: -2, max: 2 ** 31 + 2 }), fc.constant(0.5))),
			tMs: fc.oneof(fc.integer({ min: Date.UTC(1999, 0, 1), max: Date.UTC(2101, 0, 1) }), fc.constant(Date.UTC(2026, 0, 1) + 0.5)),
			flow: maybe(edgy(0, MAX_FLOW_LPH)),
			gs: maybe(edgy(0, MAX_GS_KT)),
			dtg: maybe(edgy(0, 10_800)),
			alt: maybe(edgy(-2000, 60_000)),
			wpt: maybe(fc.string({ maxLength: 45 })),
			lat: maybe(edgy(-90, 90)),
			lon: maybe(edgy(-180, 180))
		});
		fc.assert(
			fc.property(row, (r) => {
				expect(withinLimits(r as RecorderRow)).toBe(recorderRowSchema.safeParse(r).success);
			}),
			{ numRuns: 5000 }
		);
	});
});
