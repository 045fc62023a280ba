import { describe, expect, it } from 'vitest';
import { WPT_NONE } from '$lib/fuel';
import { decodeBinary, decodeJson, encodeBinary, encodeJson, PayloadError, PAYLOAD_VERSION, type ReplayData } from './replay';

function sample(n: number, withOptional = true): ReplayData {
	// Times as the database holds them: whole milliseconds, divided by 1000 the way the server does.
	const t = Float64Array.from({ length: n }, (_, i) => (1_747_213_200_123 + i * 1001) / 1000);
	const flow = Float64Array.from({ length: n }, (_, i) => (i % 7 === 3 ? NaN : (31.5 + Math.sin(i)) * 3.785411784));
	const gs = Float64Array.from({ length: n }, (_, i) => 100 + i / 3);
	const dtg = Float64Array.from({ length: n }, (_, i) => Math.max(0, 40 - i / 10));
	// Positions to 6 decimals, as recorders and our CSV files give them, one sample without.
	const deg = (base: number, i: number) => (i === 4 ? NaN : Number((base + i * 0.000137).toFixed(6)));
	const columns = {
		t,
		flow,
		gs,
		dtg,
		...(withOptional
			? {
					alt: Float64Array.from({ length: n }, (_, i) => (i === 2 ? NaN : 4500 + i)),
					wpt: Int32Array.from({ length: n }, (_, i) => (i < 2 ? WPT_NONE : i % 2)),
					lat: Float64Array.from({ length: n }, (_, i) => deg(47.2, i)),
					lon: Float64Array.from({ length: n }, (_, i) => deg(-31.4, i))
				}
			: {})
	};
	return {
		version: PAYLOAD_VERSION,
		flight: { id: 'f', title: 'a "quoted" title ✈', status: 'closed', source: 'upload', startedAt: '2025-05-14T09:00:00.123Z', endedAt: null, lastSeq: n - 1, declarationConfirmed: true },
		aircraft: { id: 'a', registration: 'BD-KTR', type: 'trainer', displayUnit: 'usgal', fuelType: 'avgas' },
		setup: { capacityL: 151.4, lowerLevelL: null, unusableL: 0, densityKgPerL: 0.719, meterFactor: 1, baselineCruiseLph: 31, lowFuelL: null, lowEnduranceMin: 45, reserveRule: 'faa-91.151-vfr-day', reserveCustomMin: null },
		declaration: { kind: 'full' },
		previousOnBoardL: null,
		events: [{ id: 'e', t: 1_747_213_300, kind: 'added', amountL: 20, note: '' }],
		waypoints: ['MARSH', 'TALLY'],
		count: n,
		hasAlt: withOptional,
		hasWpt: withOptional,
		hasPos: withOptional,
		columns,
		seq: Int32Array.from({ length: n }, (_, i) => i * 2)
	};
}

const same = (a: ArrayLike<number> | undefined, b: ArrayLike<number> | undefined) => expect(Array.from(a ?? [])).toEqual(Array.from(b ?? []));

describe('replay payload', () => {
	for (const withOptional of [true, false]) {
		it(`round-trips every value exactly through both encodings${withOptional ? '' : ' without altitude, waypoints and positions'}`, () => {
			const data = sample(257, withOptional);
			const viaJson = decodeJson(JSON.parse(JSON.stringify(encodeJson(data))));
			const viaBinary = decodeBinary(encodeBinary(data).buffer);
			for (const got of [viaJson, viaBinary]) {
				for (const k of ['t', 'flow', 'gs', 'dtg', 'alt', 'wpt', 'lat', 'lon'] as const) same(got.columns[k], data.columns[k]);
				expect(got.hasPos).toBe(withOptional);
				same(got.seq, data.seq);
				expect(got.flight).toEqual(data.flight);
				expect(got.events).toEqual(data.events);
				expect(got.count).toBe(257);
			}
		});
	}

	it('starts the binary columns on an 8-byte boundary and is 8 or 4 bytes a value (4 per coordinate)', () => {
		const bytes = encodeBinary(sample(1000));
		const header = new DataView(bytes.buffer).getUint32(4, true);
		expect((8 + header) % 8).toBe(0);
		expect(bytes.length).toBe(8 + header + 1000 * (5 * 8 + 2 * 4 + 2 * 4));
	});

	it('keeps any position within half of 1e-7 degree in the binary form', () => {
		const data = sample(300);
		// Full doubles, as an interpolated or converted position could be.
		data.columns.lat = Float64Array.from({ length: 300 }, (_, i) => 47.2 + Math.sin(i) / 3);
		data.columns.lon = Float64Array.from({ length: 300 }, (_, i) => -179.9999999 + i * 1.2345678912);
		const got = decodeBinary(encodeBinary(data));
		for (const k of ['lat', 'lon'] as const) {
			let worst = 0;
			for (let i = 0; i < 300; i++) worst = Math.max(worst, Math.abs(got.columns[k]![i] - data.columns[k]![i]));
			expect(worst).toBeLessThanOrEqual(0.5e-7 + 1e-12);
		}
	});

	it('refuses to encode positions it was told about but not given', () => {
		const data = sample(5, false);
		expect(() => encodeBinary({ ...data, hasPos: true })).toThrow(PayloadError);
	});

	it('refuses data that is not a payload or is cut short', () => {
		const bytes = encodeBinary(sample(10));
		expect(() => decodeBinary(new Uint8Array([1, 2, 3]))).toThrow(PayloadError);
		expect(() => decodeBinary(bytes.slice(0, bytes.length - 8))).toThrow(/length does not match/);
		const wrong = bytes.slice();
		wrong[0] = 0;
		expect(() => decodeBinary(wrong)).toThrow(/unknown format/);
	});
});
