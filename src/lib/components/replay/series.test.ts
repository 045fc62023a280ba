import { describe, expect, it } from 'vitest';
import { downsampleMinMax, eventTime, indexAtOrBefore, nearestIndex, plotSeries, runsOf } from './series';

const t = Float64Array.from({ length: 10 }, (_, i) => 100 + i * 10);

describe('finding samples by time', () => {
	it('gives the last sample at or before a time, clamped at both ends', () => {
		expect(indexAtOrBefore(t, 99)).toBe(0);
		expect(indexAtOrBefore(t, 100)).toBe(0);
		expect(indexAtOrBefore(t, 139.9)).toBe(3);
		expect(indexAtOrBefore(t, 140)).toBe(4);
		expect(indexAtOrBefore(t, 1e9)).toBe(9);
		expect(indexAtOrBefore(new Float64Array(0), 5)).toBe(-1);
		// Only the first `n` samples count (a live flight's buffer is longer than its data).
		expect(indexAtOrBefore(t, 1e9, 4)).toBe(3);
	});

	it('gives the nearest sample', () => {
		expect(nearestIndex(t, 134)).toBe(3);
		expect(nearestIndex(t, 136)).toBe(4);
		expect(nearestIndex(t, 500)).toBe(9);
	});
});

describe('runs', () => {
	it('splits codes into spans that meet end to start', () => {
		const codes = [2, 2, 3, 3, 3, 4, 4, 4, 4, 5];
		const runs = runsOf(codes, t);
		expect(runs.map((r) => [r.value, r.startIndex, r.endIndex])).toEqual([
			[2, 0, 1],
			[3, 2, 4],
			[4, 5, 8],
			[5, 9, 9]
		]);
		expect(runs[0].end).toBe(runs[1].start);
		expect(runs[3]).toMatchObject({ start: 190, end: 190 });
	});
});

describe('min/max downsampling', () => {
	it('returns short series as they are, NaN as a break', () => {
		const y = Float64Array.from([1, NaN, 3]);
		const d = downsampleMinMax([0, 1, 2], [y], 0, 2, 10);
		expect(d).toEqual({ x: [0, 1, 2], ys: [[1, null, 3]] });
	});

	it('keeps every spike and dip of a long series in at most two points per column', () => {
		const n = 100_000;
		const time = Float64Array.from({ length: n }, (_, i) => i);
		const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i / 500));
		y[31_337] = 50;
		y[77_777] = -50;
		const d = downsampleMinMax(time, [y], 0, n - 1, 800);
		expect(d.x.length).toBeLessThanOrEqual(1600);
		expect(d.ys[0].length).toBe(d.x.length);
		const values = d.ys[0] as number[];
		expect(Math.max(...values)).toBe(50);
		expect(Math.min(...values)).toBe(-50);
		// Time stays in order, so uPlot can draw it.
		for (let i = 1; i < d.x.length; i++) expect(d.x[i]).toBeGreaterThanOrEqual(d.x[i - 1]);
		// The first and last samples are always drawn.
		expect(d.x[0]).toBe(0);
		expect(d.x[d.x.length - 1]).toBe(n - 1);
	});

	it('draws the minimum before the maximum when it came first, and nothing for an all-blank column', () => {
		const time = [0, 1, 2, 3, 10, 11, 12, 13];
		const y = [5, 1, 9, 6, NaN, NaN, NaN, NaN];
		const d = downsampleMinMax(time, [y], 0, 7, 2);
		expect(d.x).toEqual([0, 3, 10, 13]);
		expect(d.ys[0]).toEqual([1, 9, null, null]);
	});
});

describe('downsampling keeps breaks', () => {
	it('keeps a break between two runs inside one column', () => {
		// Ten samples in one column: a run, a blank, a run. The blank must survive as a null.
		const time = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9];
		const y = [4, 5, 6, 7, NaN, 1, 2, 3, 2, 1];
		const d = downsampleMinMax(time, [y], 0, 9, 1);
		expect(d.ys[0]).toContain(null);
		const k = d.ys[0].indexOf(null);
		expect(d.x[k]).toBe(4);
		// What is before the break is drawn before it, what is after, after it (each run as its
		// minimum and maximum in the order they came, at the run's first and last time).
		expect(d.x.slice(0, k)).toEqual([0, 3]);
		expect(d.ys[0].slice(0, k)).toEqual([4, 7]);
		expect(d.x.slice(k + 1)).toEqual([5, 9]);
		expect(d.ys[0].slice(k + 1)).toEqual([1, 3]);
	});
});

// Fuel on board as drawn: one point per sample, a break (NaN → null in uPlot) wherever the
// recorder was silent, and a vertical step at each fuel event's own time.
describe('the plotted series', () => {
	it('breaks the line across a time gap instead of drawing a ramp', () => {
		// Samples every 10 s, then the recorder is silent from 130 s to 400 s.
		const tt = [100, 110, 120, 130, 400, 410];
		const y = [50, 49, 48, 47, 40, 39];
		const s = plotSeries(tt, y, tt.length, [{ startIndex: 3, endIndex: 4 }]);
		const points = Array.from(s.x, (x, k) => [x, s.y[k]]);
		expect(points).toEqual([
			[100, 50],
			[110, 49],
			[120, 48],
			[130, 47],
			[130, NaN],
			[400, 40],
			[410, 39]
		]);
	});

	it('hides the samples inside a gap of blank readings', () => {
		const tt = [0, 1, 2, 3, 4, 5];
		const y = [10, 9, 8, 7, 6, 5];
		const s = plotSeries(tt, y, tt.length, [{ startIndex: 1, endIndex: 4 }]);
		const drawn = Array.from(s.x, (x, k) => [x, s.y[k]]).filter(([, v]) => !Number.isNaN(v));
		expect(drawn).toEqual([
			[0, 10],
			[1, 9],
			[4, 6],
			[5, 5]
		]);
		// And the line is broken between 1 s and 4 s.
		const k1 = Array.from(s.x).indexOf(1);
		expect(Number.isNaN(s.y[k1 + 1])).toBe(true);
	});

	it('draws a refuel at a stop as a step at the time of the refuel, not at the next sample', () => {
		// Engine off at 1000 s with 30 L; refuel of +50 L at 1600 s; engine on again at 2200 s.
		// The engine applies the event at the first sample at or after its time (index 2).
		const tt = [900, 1000, 2200, 2210];
		const ob = [30.5, 30, 80, 79.9];
		const events = [{ t: 1600, index: 2, beforeL: 30, afterL: 80 }];
		const s = plotSeries(tt, ob, tt.length, [{ startIndex: 1, endIndex: 2 }], events);
		const points = Array.from(s.x, (x, k) => [x, s.y[k]]);
		expect(points).toEqual([
			[900, 30.5],
			[1000, 30],
			[1000, NaN],
			[1600, 30],
			[1600, 80],
			[2200, 80],
			[2210, 79.9]
		]);
	});

	it('places a step between two samples at the event time, sharing the burn of that second', () => {
		// 36 L/h = 0.01 L/s; samples at 0 s and 10 s; +20 L at 4 s. The engine says 100 → 119.9
		// at 10 s (burn of the whole 10 s, then the event); at 4 s the tank held 99.96 before.
		const tt = [0, 10, 20];
		const ob = [100, 119.9, 119.8];
		const events = [{ t: 4, index: 1, beforeL: 99.9, afterL: 119.9 }];
		const s = plotSeries(tt, ob, tt.length, [], events);
		expect(Array.from(s.x)).toEqual([0, 4, 4, 10, 20]);
		expect(s.y[1]).toBeCloseTo(99.96, 12);
		expect(s.y[2]).toBeCloseTo(119.96, 12);
		expect(Array.from(s.y).filter((_, k) => k !== 1 && k !== 2)).toEqual([100, 119.9, 119.8]);
	});

	it('keeps time in order with several events and skips events not yet applied', () => {
		const tt = [0, 10, 20, 30];
		const ob = [50, 49, 68, 67];
		const events = [
			{ t: 15, index: 2, beforeL: 48, afterL: 58 },
			{ t: 18, index: 2, beforeL: 58, afterL: 68 },
			{ t: 99, index: -1, beforeL: 0, afterL: 0 }
		];
		const s = plotSeries(tt, ob, tt.length, [], events);
		for (let k = 1; k < s.x.length; k++) expect(s.x[k]).toBeGreaterThanOrEqual(s.x[k - 1]);
		expect(Array.from(s.x)).toEqual([0, 10, 15, 15, 18, 18, 20, 30]);
		expect(s.y[s.x.length - 1]).toBe(67);
	});

	it('draws an event before the first sample at the first sample', () => {
		const s = plotSeries([100, 110], [80, 79.9], 2, [], [{ t: 50, index: 0, beforeL: 60, afterL: 80 }]);
		expect(Array.from(s.x)).toEqual([100, 100, 110]);
		expect(Array.from(s.y)).toEqual([60, 80, 79.9]);
	});

	it('gives each fuel event its own time on the chart, within the samples it lies between', () => {
		const tt = [0, 10, 20];
		expect(eventTime(tt, { t: 4, index: 1 })).toBe(4);
		expect(eventTime(tt, { t: -5, index: 0 })).toBe(0);
		expect(eventTime(tt, { t: 4, index: -1 })).toBeNaN();
	});
});
