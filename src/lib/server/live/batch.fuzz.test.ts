// Property tests over the live batch parser: any JSON value and any text, from noise to nearly
// right batches, is either refused with at least one problem saying where, or read into samples
// that keep every rule the store relies on. Nothing throws.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { textProblem } from '$lib/schemas/text';
import { readCsvBatch, readJsonBatch, openSchema, type BatchResult } from './batch';

const AVGAS = 0.719;
const T0 = Date.UTC(2026, 4, 2, 9);

const hostile = fc.oneof(
	fc.string({ unit: 'binary', maxLength: 20 }),
	fc.constantFrom('', ' ', '0x10', '1e400', 'NaN', '-0', '1,5', '\u0000', 'WPT\u0000', '\u202eTPW', '"', '""', ',', '\n', '\r\n', '2026-05-02T09:00:00Z', '2026-05-02T09:00:00', '99999999999')
);
const num = fc.oneof(fc.double(), fc.integer({ min: -1e6, max: 1e6 }), fc.constantFrom(0, -0, 1e308, -1, 5e-324));
/** A JSON value after a round trip, as the API receives it (no NaN, no undefined). */
const asJson = <T>(a: fc.Arbitrary<T>) => a.map((v) => JSON.parse(JSON.stringify(v ?? null)) as unknown);

const nearSample = (i: number) =>
	fc.record(
		{
			seq: fc.oneof(fc.constant(i), fc.integer({ min: -2, max: 2 ** 31 }), num, hostile),
			t: fc.oneof(fc.constant(new Date(T0 + i * 1000).toISOString()), fc.constant(T0 / 1000 + i), num, hostile),
			flow: fc.oneof(fc.constant(30), num, fc.constant(null), hostile),
			gs: fc.oneof(fc.constant(100), num, fc.constant(null)),
			dtg: fc.oneof(fc.constant(40), num, fc.constant(null)),
			alt: fc.oneof(num, fc.constant(null)),
			wpt: fc.oneof(fc.constant('WPT-B'), hostile, fc.constant(null)),
			lat: fc.oneof(num, fc.constant(null)),
			lon: fc.oneof(num, fc.constant(null))
		},
		{ requiredKeys: ['seq', 't'] }
	);

const nearBatch = fc.integer({ min: 1, max: 6 }).chain((n) =>
	fc.record(
		{
			flightId: fc.oneof(fc.uuid(), hostile),
			firstSeq: fc.oneof(fc.nat(), num),
			units: fc.record({ flow: fc.constantFrom('l/h', 'usgal/h', 'lb/h', 'kg/h', 'furlongs'), speed: fc.constantFrom('kt', 'km/h', 'mph', 'c') }, { requiredKeys: [] }),
			samples: fc.tuple(...Array.from({ length: n }, (_, i) => nearSample(i)))
		},
		{ requiredKeys: ['samples'] }
	)
);

/** What an accepted batch must hold for the store: the invariants ingest.ts relies on. */
function holds(r: BatchResult): void {
	if (!r.ok) {
		expect(r.problems.length).toBeGreaterThan(0);
		for (const p of r.problems) expect(typeof p.message).toBe('string');
		return;
	}
	const s = r.batch.samples;
	expect(s.length).toBeGreaterThan(0);
	for (let i = 0; i < s.length; i++) {
		expect(Number.isInteger(s[i].seq) && s[i].seq >= 0).toBe(true);
		expect(Number.isFinite(s[i].tMs)).toBe(true);
		if (i > 0) {
			expect(s[i].seq).toBe(s[i - 1].seq + 1);
			expect(s[i].tMs).toBeGreaterThan(s[i - 1].tMs);
		}
		for (const k of ['flow', 'gs', 'dtg', 'alt', 'lat', 'lon'] as const) {
			const v = s[i][k];
			expect(v === null || Number.isFinite(v), `${k}=${v}`).toBe(true);
		}
		const w = s[i].wpt;
		if (w !== null) expect(w.includes('\u0000')).toBe(false);
	}
}

describe('readJsonBatch', () => {
	it('never throws on any JSON value', () => {
		fc.assert(fc.property(fc.jsonValue(), (body) => holds(readJsonBatch(body, AVGAS))), { numRuns: 500 });
	});
	it('never throws on nearly right batches, and what it accepts keeps the store rules', () => {
		fc.assert(fc.property(asJson(nearBatch), (body) => holds(readJsonBatch(body, AVGAS))), { numRuns: 1000 });
	});
	it('accepted JSON waypoints carry no control or override character', () => {
		fc.assert(
			fc.property(hostile, (wpt) => {
				const r = readJsonBatch({ samples: [{ seq: 0, t: T0 / 1000, flow: 30, gs: 100, dtg: 40, wpt }] }, AVGAS);
				if (r.ok && r.batch.samples[0].wpt !== null) expect(textProblem(r.batch.samples[0].wpt)).toBeNull();
			}),
			{ numRuns: 300 }
		);
	});
});

describe('readCsvBatch', () => {
	const header = 'seq,time_utc,fuel_flow_lph,ground_speed_kt,distance_to_go_nm,waypoint';
	const cell = fc.oneof(hostile, num.map(String));
	const line = (i: number) =>
		fc.oneof(
			fc.tuple(fc.constant(String(i)), fc.constant(new Date(T0 + i * 1000).toISOString()), cell, cell, cell, cell).map((c) => c.join(',')),
			fc.array(cell, { maxLength: 8 }).map((c) => c.join(',')),
			hostile
		);
	const csv = fc
		.integer({ min: 0, max: 5 })
		.chain((n) => fc.tuple(fc.constantFrom('\n', '\r\n'), fc.oneof(fc.constant(header), hostile), ...Array.from({ length: n }, (_, i) => line(i))))
		.map(([newline, ...lines]) => lines.join(newline));
	const options = { flightId: null, firstSeq: 0, densityKgPerL: AVGAS };

	it('never throws on any text', () => {
		fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 400 }), (text) => holds(readCsvBatch(text, options))), { numRuns: 500 });
	});
	it('never throws on nearly right batches, and what it accepts keeps the store rules', () => {
		fc.assert(fc.property(csv, (text) => holds(readCsvBatch(text, options))), { numRuns: 1000 });
	});
});

describe('the open request', () => {
	it('never throws, and an accepted title holds no invisible character', () => {
		fc.assert(
			fc.property(asJson(fc.record({ title: hostile, firstSeq: num, pilot: hostile, declaration: fc.record({ kind: fc.constantFrom('onBoard', 'full', 'x'), amount: num }) }, { requiredKeys: [] })), (body) => {
				const r = openSchema.safeParse(body);
				if (r.success && r.data.title !== undefined) expect(textProblem(r.data.title)).toBeNull();
			}),
			{ numRuns: 500 }
		);
	});
});
