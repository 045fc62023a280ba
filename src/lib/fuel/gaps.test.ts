import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { createGapTracker, gapThresholdFor, MEDIAN_INTERVALS } from './gaps';
import { columns, input, series, T0, type Row } from './test-fixtures';
import { FLAG_FLOW_FILLED, FLAG_FLOW_HELD, FLAG_GAP_FILLED, FLAG_REJECTED } from './types';

describe('gap threshold', () => {
	it('is the larger of 10 s and 5 × the median interval', () => {
		const fast = createGapTracker();
		for (let k = 0; k < 10; k++) gapThresholdFor(fast, 1);
		expect(fast.thresholdS).toBe(10);
		const slow = createGapTracker();
		for (let k = 0; k < 10; k++) gapThresholdFor(slow, 4);
		expect(slow.thresholdS).toBe(20);
	});

	it('freezes after the first intervals so live and replay agree', () => {
		const g = createGapTracker();
		for (let k = 0; k < MEDIAN_INTERVALS; k++) gapThresholdFor(g, 4);
		for (let k = 0; k < 100; k++) expect(gapThresholdFor(g, 30)).toBe(20);
	});

	it('can be fixed by the caller', () => {
		const g = createGapTracker(10, 5, 60);
		expect(gapThresholdFor(g, 1)).toBe(60);
	});
});

describe('data gaps', () => {
	it('marks a dropout and fills it with the higher adjacent flow', () => {
		const rows: Row[] = [
			...series(60, () => ({ flow: 30 })),
			// 120 s without samples, then the flow reads 48.
			...series(60, () => ({ flow: 48 }), T0 + 59 + 120)
		];
		const c = computeFlight(input(columns(rows)));
		expect(c.gaps).toEqual([{ kind: 'time', start: T0 + 59, end: T0 + 179, startIndex: 59, endIndex: 60, filledFlowLph: 48 }]);
		expect(c.flags[60] & FLAG_GAP_FILLED).toBe(FLAG_GAP_FILLED);
		// 59 s at 30, the 120 s gap at 48 (not the 39 average), then 59 s at 48.
		const expected = (59 * 30 + 120 * 48 + 59 * 48) / 3600;
		expect(c.used[119]).toBeCloseTo(expected, 12);
		expect(c.gapThresholdS).toBe(10);
	});

	it('does not take a slow recorder’s normal interval for a gap', () => {
		const c = computeFlight(input(columns(series(50, () => ({ flow: 30 }), T0, 8))));
		expect(c.gaps).toEqual([]);
		expect(c.gapThresholdS).toBe(40);
	});

	// One rule for every dropout, checked in closed form: constant flow A before, constant flow B
	// after, a 120 s stretch with nothing recorded in between. Whether the recorder wrote no rows,
	// rows with every cell but the clock blank, or rows with only the flow blank, fuel used over
	// the stretch is the higher adjacent flow × its length, and distance is bridged from the
	// adjacent ground speeds (trapezoid: FAA-H-8083-25, distance = speed × time).
	const A = 30;
	const B = 48;
	const GS_A = 100;
	const GS_B = 120;
	const before = series(60, () => ({ flow: A, gs: GS_A }));
	const after = series(60, () => ({ flow: B, gs: GS_B }), T0 + 59 + 120);
	const missingRows: Row[] = [...before, ...after];
	const blankRows: Row[] = [...before, ...series(119, () => ({}), T0 + 60), ...after];
	const flowBlank: Row[] = [...before, ...series(119, () => ({ gs: 110 }), T0 + 60), ...after];
	// 59 s at A, 120 s at max(A, B) = B, 59 s at B.
	const usedExpected = (59 * A + 120 * B + 59 * B) / 3600;

	for (const [name, rows] of [
		['missing rows', missingRows],
		['rows with every cell blank', blankRows],
		['rows with the flow cell blank', flowBlank]
	] as const) {
		it(`fills a dropout written as ${name} with the higher adjacent flow`, () => {
			const c = computeFlight(input(columns(rows)));
			const last = c.length - 1;
			expect(c.used[last]).toBeCloseTo(usedExpected, 12);
			// The timeline entry states the very flow used.
			expect(c.gaps).toHaveLength(1);
			expect(c.gaps[0]).toMatchObject({ start: T0 + 59, end: T0 + 179, filledFlowLph: B });
		});
	}

	it('bridges distance across blank ground-speed cells as across missing rows', () => {
		const ref = computeFlight(input(columns(missingRows)));
		const blank = computeFlight(input(columns(blankRows)));
		// 59 s at 100 kt, the 120 s stretch at (100 + 120)/2, 59 s at 120 kt.
		const nm = (59 * GS_A + 120 * ((GS_A + GS_B) / 2) + 59 * GS_B) / 3600;
		expect(ref.stats.distanceNm).toBeCloseTo(nm, 12);
		expect(blank.stats.distanceNm).toBeCloseTo(nm, 12);
	});

	it('shows the filled flow at the blank samples once the next reading has come', () => {
		const c = computeFlight(input(columns(blankRows)));
		expect(c.flow[100]).toBe(B);
		expect(c.flags[100] & FLAG_FLOW_FILLED).toBe(FLAG_FLOW_FILLED);
		expect(c.flags[100] & FLAG_FLOW_HELD).toBe(0);
		// On board inside the stretch follows the filled flow: 59 s at A, then 41 s at B.
		expect(c.used[100]).toBeCloseTo((59 * A + 41 * B) / 3600, 12);
		expect(c.onBoard[100]).toBeCloseTo(150 - c.used[100], 12);
	});

	it('takes the earlier reading when it is the higher one', () => {
		const rows = series(40, (i) => ({ flow: i >= 5 && i < 30 ? undefined : i < 5 ? 40 : 20 }));
		const c = computeFlight(input(columns(rows)));
		expect(c.gaps).toEqual([{ kind: 'flow', start: T0 + 4, end: T0 + 30, startIndex: 4, endIndex: 30, filledFlowLph: 40 }]);
		// 4 s at 40, the 26 s stretch at 40, 9 s at 20.
		expect(c.used[39]).toBeCloseTo((4 * 40 + 26 * 40 + 9 * 20) / 3600, 12);
	});

	it('holds the last reading while the stretch is still open (a live flight cannot see ahead)', () => {
		const rows = series(20, (i) => ({ flow: i < 5 ? 20 : undefined }));
		const c = computeFlight(input(columns(rows)));
		expect(c.flow[19]).toBe(20);
		expect(c.flags[19] & FLAG_FLOW_HELD).toBe(FLAG_FLOW_HELD);
	});
});

describe('data problems', () => {
	const base = (): Row[] => series(10, () => ({ flow: 30, gs: 100, dtg: 50 }));

	it('reports repeated and backward times and skips those rows', () => {
		const rows = base();
		rows[4] = { ...rows[4], t: rows[3].t };
		rows[7] = { ...rows[7], t: rows[2].t };
		const c = computeFlight(input(columns(rows)));
		expect(c.problems.map((p) => [p.index, p.field, p.reason])).toEqual([
			[4, 't', 'repeatedTime'],
			[7, 't', 'backwardTime']
		]);
		expect(c.problems[1].message).toMatch(/Sample 7: the time .* is 4 s earlier/);
		expect(c.flags[4] & FLAG_REJECTED).toBe(FLAG_REJECTED);
		// A skipped row carries the running figures and has no instant ones.
		expect(c.used[4]).toBe(c.used[3]);
		expect(c.endurance[4]).toBeNaN();
		// Fuel used is the same as if those rows had not been there.
		expect(c.used[9]).toBeCloseTo((9 * 30) / 3600, 12);
	});

	it('rejects negative and absurd values with the field named', () => {
		const rows = base();
		rows[1].flow = -2;
		rows[2].gs = 900;
		rows[3].dtg = -1;
		rows[4].alt = 99_000;
		rows[5].t = NaN;
		rows[6].flow = Infinity;
		const c = computeFlight(input(columns(rows)));
		expect(c.problems.map((p) => [p.index, p.field, p.reason])).toEqual([
			[1, 'flow', 'negative'],
			[2, 'gs', 'absurd'],
			[3, 'dtg', 'negative'],
			[4, 'alt', 'absurd'],
			[5, 't', 'missingTime'],
			[6, 'flow', 'absurd']
		]);
		expect(c.problems[0].value).toBe(-2);
		expect(c.problems[1].message).toMatch(/gs is not a plausible value \(900 kt\)/);
	});
});
