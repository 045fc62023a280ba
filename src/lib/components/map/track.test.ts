import { describe, expect, it } from 'vitest';
import { greatCircleNm, WPT_NONE } from '$lib/fuel';
import { hasPositions, localProjection, nearestSample, positionAt, positionCount, roundScaleLength, trackPieces, trackWaypoints } from './track';

const cols = (lat: number[], lon: number[]) => ({ lat: Float64Array.from(lat), lon: Float64Array.from(lon) });

describe('track pieces', () => {
	it('is one flown piece for an unbroken track', () => {
		const c = cols([1, 1.1, 1.2, 1.3], [2, 2, 2, 2]);
		expect(trackPieces(c, 4)).toEqual([{ kind: 'flown', from: 0, to: 3 }]);
	});

	it('breaks across samples without a position and across the engine\'s time gaps, not across flow gaps', () => {
		const N = NaN;
		const c = cols([1, 1.1, N, N, 1.4, 1.5, 1.6, 1.7, 1.8], [2, 2, N, N, 2, 2, 2, 2, 2]);
		const gaps = [
			{ kind: 'time' as const, endIndex: 6 },
			{ kind: 'flow' as const, endIndex: 8 }
		];
		expect(trackPieces(c, 9, gaps)).toEqual([
			{ kind: 'flown', from: 0, to: 1 },
			{ kind: 'gap', from: 1, to: 4 },
			{ kind: 'flown', from: 4, to: 5 },
			{ kind: 'gap', from: 5, to: 6 },
			{ kind: 'flown', from: 6, to: 8 }
		]);
	});

	it('skips samples without a position before the first fix and after the last, and uses only the first n', () => {
		const N = NaN;
		const c = cols([N, N, 1, 1.1, N, 5], [N, N, 2, 2.1, N, 5]);
		expect(trackPieces(c, 5)).toEqual([{ kind: 'flown', from: 2, to: 3 }]);
		expect(trackPieces(cols([N, 3, N], [N, 4, N]), 3)).toEqual([{ kind: 'flown', from: 1, to: 1 }]);
		expect(trackPieces(cols([N], [N]), 1)).toEqual([]);
		expect(trackPieces({}, 3)).toEqual([]);
	});

	it('tells a flight with positions from one without', () => {
		expect(hasPositions(cols([NaN, 1], [NaN, 2]), 2)).toBe(true);
		expect(hasPositions(cols([NaN, 1], [NaN, 2]), 1)).toBe(false);
		expect(hasPositions(cols([1], [NaN]), 1)).toBe(false);
		expect(hasPositions({}, 10)).toBe(false);
		expect(positionCount(cols([NaN, 1, 2, 3], [NaN, 2, NaN, 4]), 4)).toBe(2);
		expect(positionCount(cols([1, 2], [1, 2]), 1)).toBe(1);
		expect(positionCount({}, 5)).toBe(0);
	});
});

describe('position at the scrubber', () => {
	const c = cols([NaN, 1, 1.1, NaN, NaN], [NaN, 2, 2.1, NaN, NaN]);
	it('is the sample\'s own, or the last known before it', () => {
		expect(positionAt(c, 2)).toEqual({ index: 2, lat: 1.1, lon: 2.1 });
		expect(positionAt(c, 4)).toEqual({ index: 2, lat: 1.1, lon: 2.1 });
		expect(positionAt(c, 99)).toEqual({ index: 2, lat: 1.1, lon: 2.1 });
	});
	it('is none before the first fix', () => {
		expect(positionAt(c, 0)).toBeNull();
		expect(positionAt({}, 3)).toBeNull();
	});
});

describe('local projection', () => {
	it('gives distances within 0.1 % of the great circle over a few dozen NM', () => {
		const ref = { lat: 47.2, lon: -31.4 };
		const p = localProjection(ref);
		for (const [lat, lon] of [
			[47.95, -30.1],
			[46.6, -29.3],
			[47.2, -31.0]
		]) {
			const [x, y] = p(lat, lon);
			// Against the haversine distance on the same sphere ($lib/fuel/geo).
			const gc = greatCircleNm(ref.lat, ref.lon, lat, lon);
			expect(Math.abs(Math.hypot(x, y) - gc) / gc).toBeLessThan(1e-3);
		}
		// One degree of latitude is 60 NM on a sphere of the mean radius to within 0.1 % (from memory: 60.04).
		expect(p(48.2, -31.4)[1]).toBeCloseTo(60.04, 1);
		expect(p(47.2, -30.4)[0]).toBeGreaterThan(0);
		expect(p(46.2, -31.4)[1]).toBeLessThan(0);
	});

	it('takes longitudes the short way across the antimeridian', () => {
		const p = localProjection({ lat: 0, lon: 179.9 });
		const [x] = p(0, -179.9);
		expect(x).toBeCloseTo(12.0, 0);
	});

	it('finds the sample nearest a clicked point on the ground, not in raw degrees', () => {
		// At 60° N a degree of longitude is half a degree of latitude on the ground.
		const c = cols([60, 60.4, NaN], [10, 10, 10.5]);
		expect(nearestSample(c, 3, { lat: 60, lon: 10.7 })).toBe(0);
		expect(nearestSample(c, 3, { lat: 60.35, lon: 10.1 })).toBe(1);
		expect(nearestSample({}, 3, { lat: 0, lon: 0 })).toBe(-1);
	});
});

describe('scale bar', () => {
	it('rounds a scale down to 1, 2 or 5 × a power of ten', () => {
		expect(roundScaleLength(7.3)).toBe(5);
		expect(roundScaleLength(19.9)).toBe(10);
		expect(roundScaleLength(20)).toBe(20);
		expect(roundScaleLength(0.36)).toBe(0.2);
		expect(roundScaleLength(0)).toBe(0);
		expect(roundScaleLength(NaN)).toBe(0);
	});
});

describe('waypoints on the track', () => {
	// Two legs: to HOLLOW (passed at sample 3, the least distance), then to MERROW (passed at 7).
	const n = 10;
	const c = {
		t: Float64Array.from({ length: n }, (_, i) => 1000 + i),
		dtg: Float64Array.from([3, 2, 1, 0.2, 0.6, 3, 1, 0.1, 0.4, 0.9]),
		wpt: Int32Array.from([0, 0, 0, 0, 0, 1, 1, 1, 1, 1]),
		lat: Float64Array.from({ length: n }, (_, i) => (i === 7 ? NaN : 47 + i / 100)),
		lon: Float64Array.from({ length: n }, (_, i) => (i === 7 ? NaN : -31 + i / 100))
	};
	const names = ['HOLLOW', 'MERROW'];

	it('places every waypoint the recorder reported where it was passed, the last known position when none there', () => {
		const { passed, notReached } = trackWaypoints(c, n, names);
		expect(passed.map((w) => [w.name, w.index, w.planned])).toEqual([
			['HOLLOW', 3, null],
			['MERROW', 6, null]
		]);
		expect(passed[0].lat).toBe(47.03);
		expect(notReached).toEqual([]);
	});

	it('with a plan, takes its route in order and lists what was not reached', () => {
		const { passed, notReached } = trackWaypoints(c, n, names, { route: ['hollow', 'CAIRNS', 'MERROW', 'FENWAY'] });
		expect(passed.map((w) => [w.name, w.planned])).toEqual([
			['HOLLOW', 1],
			['MERROW', 3]
		]);
		expect(notReached).toEqual(['CAIRNS', 'FENWAY']);
	});

	it('in flight, leaves out the waypoint still being flown to', () => {
		expect(trackWaypoints(c, n, names, { inFlight: true }).passed.map((w) => w.name)).toEqual(['HOLLOW']);
		// Part-way, before MERROW's run started, HOLLOW is still ahead.
		expect(trackWaypoints(c, 4, names, { inFlight: true }).passed).toEqual([]);
		expect(trackWaypoints(c, 6, names, { inFlight: true }).passed.map((w) => w.name)).toEqual(['HOLLOW']);
	});

	it('has none without a waypoint column', () => {
		const { wpt: _w, ...noWpt } = c;
		expect(trackWaypoints(noWpt, n, names).passed).toEqual([]);
		const blank = { ...c, wpt: new Int32Array(n).fill(WPT_NONE) };
		expect(trackWaypoints(blank, n, names).passed).toEqual([]);
	});
});
