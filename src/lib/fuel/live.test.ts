import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { createLiveComputation } from './live';
import { summarize } from './summary';
import { columns, crossCountry, firstDifference, input, slice, T0 } from './test-fixtures';
import type { FlightInput, FuelEvent, SampleColumns } from './types';

let seed = 11;
const noise = (): number => ((seed = (seed * 16807) % 2147483647) / 2147483647 - 0.5) * 3;
const rows = crossCountry({ noise });
rows[700].flow = undefined;
rows[2000] = { ...rows[2000], t: rows[1999].t }; // a repeated time
const cols = columns(rows);
const events: FuelEvent[] = [
	{ t: T0 + 30, kind: 'added', amountL: 10 },
	{ t: T0 + 3000, kind: 'resetUsed' }
];
const base: FlightInput = input(cols, {
	declaration: { kind: 'onBoard', amountL: 110 },
	events,
	thresholds: { lowFuelL: 45, lowEnduranceMin: 90 },
	reserve: { ruleId: 'faa-91.151-vfr-day' }
});

function appendInChunks(init: FlightInput, data: SampleColumns, sizes: (k: number) => number) {
	const { columns: _ignored, ...rest } = init;
	const live = createLiveComputation({ ...rest, initialCapacity: 16 });
	let from = 0;
	for (let k = 0; from < data.t.length; k++) {
		const to = Math.min(data.t.length, from + sizes(k));
		const r = live.append(slice(data, from, to));
		expect(r).toEqual({ from, to });
		from = to;
	}
	return live;
}

describe('live computation', () => {
	const batch = computeFlight(base);

	it.each([1, 7, 10, 333, 100_000])('equals the batch run when samples arrive %i at a time', (size) => {
		const live = appendInChunks(base, cols, () => size);
		expect(live.length).toBe(rows.length);
		expect(firstDifference(live.result(), batch)).toBeNull();
	});

	it('equals the batch run with uneven chunks, and so does its summary', () => {
		const live = appendInChunks(base, cols, (k) => 1 + ((k * 37) % 50));
		const result = live.result();
		expect(firstDifference(result, batch)).toBeNull();
		expect(summarize(result)).toEqual(summarize(batch));
		// The engine did something worth comparing.
		expect(batch.alarms.length).toBeGreaterThan(0);
		expect(batch.problems).toHaveLength(1);
	});

	it('recomputes when the declaration is corrected', () => {
		const live = appendInChunks(base, cols, () => 100);
		live.setDeclaration({ kind: 'added', amountL: 20 }, 70);
		expect(firstDifference(live.result(), computeFlight({ ...base, declaration: { kind: 'added', amountL: 20 }, previousOnBoardL: 70 }))).toBeNull();
		expect(live.result().onBoard[0]).toBe(90);
	});

	it('takes events added in the past, the future, or replaced', () => {
		const live = appendInChunks(base, slice(cols, 0, 3000) as SampleColumns, () => 50);
		const past: FuelEvent = { t: T0 + 600, kind: 'removed', amountL: 5 };
		const future: FuelEvent = { t: T0 + 5000, kind: 'toFull' };
		live.addEvent(past);
		live.addEvent(future);
		expect(live.result().events.at(-1)).toMatchObject({ index: -1 });
		live.append(slice(cols, 3000, cols.t.length));
		expect(firstDifference(live.result(), computeFlight({ ...base, events: [...events, past, future] }))).toBeNull();
		live.setEvents([]);
		expect(firstDifference(live.result(), computeFlight({ ...base, events: [] }))).toBeNull();
	});

	it('recomputes when the thresholds change', () => {
		const live = appendInChunks(base, cols, () => 1000);
		live.setThresholds({ lowFuelL: 80, lowEnduranceMin: null });
		expect(firstDifference(live.result(), computeFlight({ ...base, thresholds: { lowFuelL: 80, lowEnduranceMin: null } }))).toBeNull();
	});

	it('treats an optional column that starts part-way as blank before', () => {
		const noAlt = columns(crossCountry({ withAlt: false }));
		const withAlt = columns(crossCountry());
		const live = createLiveComputation({ profile: base.profile, declaration: { kind: 'full' } });
		live.append(slice(noAlt, 0, 1000));
		live.append(slice(withAlt, 1000, withAlt.t.length));
		const alt = withAlt.alt!.slice();
		alt.fill(NaN, 0, 1000);
		const expected = computeFlight({ columns: { ...withAlt, alt }, profile: base.profile, declaration: { kind: 'full' } });
		expect(firstDifference(live.result(), expected)).toBeNull();
		expect(live.columns().alt![999]).toBeNaN();
	});

	it('carries positions through, blank before the first chunk that has them', () => {
		const plain = columns(crossCountry());
		const n = plain.t.length;
		const lat = Float64Array.from({ length: n }, (_, i) => 47 + i / 1e5);
		const lon = Float64Array.from({ length: n }, (_, i) => -31 + i / 1e5);
		const live = createLiveComputation({ profile: base.profile, declaration: { kind: 'full' }, initialCapacity: 16 });
		live.append(slice(plain, 0, 500));
		live.append(slice({ ...plain, lat, lon }, 500, 1500));
		live.append(slice(plain, 1500, n));
		const got = live.columns();
		expect(got.lat!.length).toBe(n);
		expect(got.lat![499]).toBeNaN();
		expect(got.lat![500]).toBe(lat[500]);
		expect(got.lon![1499]).toBe(lon[1499]);
		expect(got.lon![1500]).toBeNaN();
		// Positions change no fuel figure.
		expect(firstDifference(live.result(), computeFlight({ columns: plain, profile: base.profile, declaration: { kind: 'full' } }))).toBeNull();
	});

	it('ignores an empty chunk', () => {
		const live = createLiveComputation({ profile: base.profile, declaration: { kind: 'full' } });
		expect(live.append(slice(cols, 0, 0))).toEqual({ from: 0, to: 0 });
		expect(live.result().length).toBe(0);
	});
});
