import { describe, expect, it } from 'vitest';
import { samplesEventColumns, samplesEventOf, type SampleRunRows } from './live';

function run(n: number, positions: 'all' | 'none' | 'late'): SampleRunRows {
	const rows: SampleRunRows = {
		tMs: Array.from({ length: n }, (_, i) => 1_781_000_000_000 + i * 1000),
		flow: Array.from({ length: n }, () => 31),
		gs: Array.from({ length: n }, () => 100),
		dtg: Array.from({ length: n }, (_, i) => 20 - i / 100),
		alt: Array.from({ length: n }, () => null),
		wpt: Array.from({ length: n }, () => 'MARSH')
	};
	if (positions !== 'none') {
		const has = (i: number) => positions === 'all' || i >= n / 2;
		rows.lat = Array.from({ length: n }, (_, i) => (has(i) ? Number((47.2 + i / 1e4).toFixed(4)) : null));
		rows.lon = Array.from({ length: n }, (_, i) => (has(i) ? Number((-31.4 + i / 1e4).toFixed(4)) : null));
	}
	return rows;
}

describe('live samples event', () => {
	it('carries positions only when its samples have some', () => {
		const event = samplesEventOf(run(10, 'late'), 0, 4, 100, 0);
		expect(event).not.toHaveProperty('lat');
		expect(event).not.toHaveProperty('lon');
		expect(samplesEventOf(run(10, 'none'), 0, 10, 100, 0)).not.toHaveProperty('lat');
		const later = samplesEventOf(run(10, 'late'), 3, 10, 100, 0);
		expect(later.lat).toEqual([null, null, 47.2005, 47.2006, 47.2007, 47.2008, 47.2009]);
		expect(later.from).toBe(103);
	});

	it('decodes positions into the columns through the one builder, through JSON', () => {
		const event = JSON.parse(JSON.stringify(samplesEventOf(run(6, 'late'), 0, 6, 0, 0)));
		const c = samplesEventColumns(event, new Map());
		expect(Array.from(c.lat!)).toEqual([NaN, NaN, NaN, 47.2003, 47.2004, 47.2005]);
		expect(Array.from(c.lon!)).toEqual([NaN, NaN, NaN, -31.3997, -31.3996, -31.3995]);
		expect(samplesEventColumns(samplesEventOf(run(6, 'none'), 0, 6, 0, 0), new Map()).lat).toBeUndefined();
	});
});
