import { describe, expect, it } from 'vitest';
import { downsampleMinMax, indexAtOrBefore, nearestIndex, runsOf } from './series';

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
