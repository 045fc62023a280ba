import { describe, expect, it } from 'vitest';
import { findPassages } from './passage';
import { WPT_NONE } from './types';
import { columns, series } from './test-fixtures';

describe('findPassages', () => {
	it('takes the first sample at the smallest distance to go in each run of one waypoint id', () => {
		// Towards 0 (ALPHA) the distance falls to 0.1 at t0+5 and grows again; then 1 (BRAVO).
		const dtg = [0.5, 0.4, 0.3, 0.2, 0.15, 0.1, 0.2, 0.3, 9, 8, 7];
		const wpt = [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1];
		const c = columns(series(dtg.length, (i) => ({ dtg: dtg[i], wpt: wpt[i], gs: 100, flow: 30 })));
		const p = findPassages(c, ['ALPHA', 'BRAVO']);
		expect(p.map((x) => [x.wpt, x.index, x.by])).toEqual([
			['ALPHA', 5, 'minimum'],
			['BRAVO', 10, 'minimum']
		]);
		expect(p[0].t).toBe(c.t[5]);
	});

	it('falls back to the last sample before the id changes when the distance is blank', () => {
		const c = columns(series(6, (i) => ({ wpt: i < 3 ? 0 : 1 })));
		expect(findPassages(c, ['A', 'B']).map((x) => [x.wpt, x.index, x.by])).toEqual([
			['A', 2, 'change'],
			['B', 5, 'change']
		]);
	});

	it('skips samples without a waypoint, and a flight with no wpt column has no passages', () => {
		const c = columns(series(4, (i) => ({ dtg: 1, wpt: i < 2 ? WPT_NONE : 0 })));
		expect(findPassages(c, ['A']).map((x) => x.wpt)).toEqual(['A']);
		const none = columns(series(3, () => ({ dtg: 1 })));
		expect(findPassages(none, [])).toEqual([]);
	});
});
