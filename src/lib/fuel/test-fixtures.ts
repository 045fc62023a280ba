// Builders shared by the engine's unit tests: sample columns from rows, a typical profile, and
// an invented cross-country flight (taxi, climb, cruise, descent, taxi) at 1 Hz.

import fc from 'fast-check';
import { BYTE_OUTPUTS, FLOAT_OUTPUTS } from './engine';
import type { FlightComputation, FlightInput, FuelEvent, FuelProfile, SampleColumns } from './types';

export interface Row {
	t: number;
	flow?: number;
	gs?: number;
	dtg?: number;
	alt?: number;
	wpt?: number;
}

/** Columns from rows; a missing cell is NaN (blank). alt and wpt only when some row has them. */
export function columns(rows: readonly Row[]): SampleColumns {
	const n = rows.length;
	const c: SampleColumns = {
		t: new Float64Array(n),
		flow: new Float64Array(n),
		gs: new Float64Array(n),
		dtg: new Float64Array(n)
	};
	const hasAlt = rows.some((r) => r.alt !== undefined);
	const hasWpt = rows.some((r) => r.wpt !== undefined);
	if (hasAlt) c.alt = new Float64Array(n);
	if (hasWpt) c.wpt = new Int32Array(n);
	rows.forEach((r, i) => {
		c.t[i] = r.t;
		c.flow[i] = r.flow ?? NaN;
		c.gs[i] = r.gs ?? NaN;
		c.dtg[i] = r.dtg ?? NaN;
		if (c.alt) c.alt[i] = r.alt ?? NaN;
		if (c.wpt) c.wpt[i] = r.wpt ?? 0;
	});
	return c;
}

/** n rows at `step` seconds from t0, each from fn(i, t). */
export function series(n: number, fn: (i: number, t: number) => Omit<Row, 't'>, t0 = 1_780_000_000, step = 1): Row[] {
	const rows: Row[] = [];
	for (let i = 0; i < n; i++) {
		const t = t0 + i * step;
		rows.push({ t, ...fn(i, t) });
	}
	return rows;
}

export function profile(overrides: Partial<FuelProfile> = {}): FuelProfile {
	return { capacityL: 150, lowerLevelL: 100, unusableL: 6, densityKgPerL: 0.72, meterFactor: 1, ...overrides };
}

export function input(cols: SampleColumns, extra: Partial<FlightInput> = {}): FlightInput {
	return { columns: cols, profile: profile(), declaration: { kind: 'full' }, ...extra };
}

export const T0 = 1_780_000_000;

/**
 * An invented flight at 1 Hz: 5 min taxi (first minute standing for the run-up), 10 min climb at
 * 600 ft/min, 80 min cruise, 15 min descent, 5 min taxi, 1 min stopped. Flows in L/h:
 * taxi 15, climb 56, cruise 30, descent 18.
 */
export function crossCountry(options: { withAlt?: boolean; noise?: () => number } = {}): Row[] {
	const { withAlt = true, noise = () => 0 } = options;
	const minutes = [5, 10, 80, 15, 5, 1];
	const total = minutes.reduce((a, b) => a + b, 0) * 60;
	const plannedNm = 160;
	let flown = 0;
	return series(total, (i) => {
		const m = i / 60;
		let flow: number, gs: number, alt: number;
		if (m < 5) {
			flow = 15;
			gs = m < 1 ? 0 : 8;
			alt = 400;
		} else if (m < 15) {
			flow = 56;
			gs = 72;
			alt = 400 + (m - 5) * 600;
		} else if (m < 95) {
			flow = 30;
			gs = 110;
			alt = 6400;
		} else if (m < 110) {
			flow = 18;
			gs = 120;
			alt = 6400 - (m - 95) * 400;
		} else if (m < 115) {
			flow = 14;
			gs = 8;
			alt = 400;
		} else {
			flow = 0;
			gs = 0;
			alt = 400;
		}
		flow = Math.max(0, flow + (flow > 0 ? noise() : 0));
		flown += gs / 3600;
		const row: Omit<Row, 't'> = { flow, gs, dtg: gs > 0 ? Math.max(0, plannedNm - flown) : undefined };
		if (withAlt) row.alt = alt;
		return row;
	});
}

/** Every per-sample array of a computation (the engine's own list). */
const ARRAY_KEYS = [...FLOAT_OUTPUTS, ...BYTE_OUTPUTS];

/**
 * The first difference between two computations, or null when they are identical: every array
 * element by Object.is (NaN equals NaN, nothing is "close enough") and every list in full.
 */
export function firstDifference(a: FlightComputation, b: FlightComputation): string | null {
	if (a.length !== b.length) return `length ${a.length} vs ${b.length}`;
	for (const k of ARRAY_KEYS) {
		const x = a[k];
		const y = b[k];
		for (let i = 0; i < a.length; i++) if (!Object.is(x[i], y[i])) return `${k}[${i}]: ${x[i]} vs ${y[i]}`;
	}
	for (const k of ['alarms', 'gaps', 'problems', 'events', 'declaration', 'gapThresholdS', 'reserve'] as const) {
		if (JSON.stringify(a[k]) !== JSON.stringify(b[k])) return `${k} differ`;
	}
	const sa = { ...a.stats, phaseTimeS: [...a.stats.phaseTimeS], phaseFuelL: [...a.stats.phaseFuelL], phaseDistanceNm: [...a.stats.phaseDistanceNm] };
	const sb = { ...b.stats, phaseTimeS: [...b.stats.phaseTimeS], phaseFuelL: [...b.stats.phaseFuelL], phaseDistanceNm: [...b.stats.phaseDistanceNm] };
	for (const key of Object.keys(sa) as (keyof typeof sa)[])
		if (JSON.stringify(sa[key]) !== JSON.stringify(sb[key]) || (typeof sa[key] === 'number' && !Object.is(sa[key], sb[key])))
			return `stats.${key}: ${String(sa[key])} vs ${String(sb[key])}`;
	return null;
}

/** Columns [from, to) of `cols`, as views. */
export function slice(cols: SampleColumns, from: number, to: number): SampleColumns {
	const s: SampleColumns = {
		t: cols.t.subarray(from, to),
		flow: cols.flow.subarray(from, to),
		gs: cols.gs.subarray(from, to),
		dtg: cols.dtg.subarray(from, to)
	};
	if (cols.alt) s.alt = cols.alt.subarray(from, to);
	if (cols.wpt) s.wpt = cols.wpt.subarray(from, to);
	return s;
}

/** Small deterministic generator (mulberry32) for generated flights: the same numbers every run. */
export function rng(seed: number): () => number {
	let s = seed >>> 0;
	return () => {
		s = (s + 0x6d2b79f5) >>> 0;
		let x = Math.imul(s ^ (s >>> 15), 1 | s);
		x = (x + Math.imul(x ^ (x >>> 7), 61 | x)) ^ x;
		return ((x ^ (x >>> 14)) >>> 0) / 4294967296;
	};
}

// Random flights: mostly regular intervals with dropouts, repeated and backward times now and
// then, blank cells in every column, and fuel events anywhere in (or beyond) the flight.
const interval = fc.oneof(
	{ weight: 12, arbitrary: fc.double({ min: 0.2, max: 5, noNaN: true }) },
	{ weight: 2, arbitrary: fc.double({ min: 5, max: 900, noNaN: true }) },
	{ weight: 1, arbitrary: fc.constant(0) },
	{ weight: 1, arbitrary: fc.double({ min: -30, max: -0.1, noNaN: true }) }
);
const maybe = (arb: fc.Arbitrary<number>) => fc.oneof({ weight: 9, arbitrary: arb }, { weight: 1, arbitrary: fc.constant(NaN) });
const sample = fc.record({
	dt: interval,
	flow: maybe(fc.double({ min: 0, max: 150, noNaN: true })),
	gs: maybe(fc.double({ min: 0, max: 160, noNaN: true })),
	dtg: maybe(fc.double({ min: 0, max: 300, noNaN: true })),
	alt: maybe(fc.double({ min: 0, max: 12_000, noNaN: true }))
});
const eventOf = (kinds: FuelEvent['kind'][]) => fc.record({
	at: fc.double({ min: -0.1, max: 1.1, noNaN: true }),
	kind: fc.constantFrom(...kinds),
	amountL: fc.double({ min: 0, max: 120, noNaN: true })
});
/** Random flights for fast-check; `resetUsed` adds "used" resets to the fuel events. */
export const randomFlight = (o: { resetUsed?: boolean } = {}) => fc.record({
	samples: fc.array(sample, { maxLength: 250 }),
	events: fc.array(eventOf(o.resetUsed ? ['added', 'removed', 'toFull', 'toLower', 'resetUsed'] : ['added', 'removed', 'toFull', 'toLower']), { maxLength: 5 }),
	declaredL: fc.double({ min: 0, max: 200, noNaN: true }),
	meterFactor: fc.double({ min: 0.8, max: 1.2, noNaN: true }),
	withAlt: fc.boolean()
});

export type RandomFlight = ReturnType<typeof randomFlight> extends fc.Arbitrary<infer T> ? T : never;

export function buildRandomFlight(f: RandomFlight): FlightInput {
	const n = f.samples.length;
	const cols: SampleColumns = { t: new Float64Array(n), flow: new Float64Array(n), gs: new Float64Array(n), dtg: new Float64Array(n) };
	if (f.withAlt) cols.alt = new Float64Array(n);
	let t = T0;
	f.samples.forEach((s, i) => {
		t += s.dt;
		cols.t[i] = t;
		cols.flow[i] = s.flow;
		cols.gs[i] = s.gs;
		cols.dtg[i] = s.dtg;
		if (cols.alt) cols.alt[i] = s.alt;
	});
	const span = Math.max(1, t - T0);
	return {
		columns: cols,
		profile: profile({ meterFactor: f.meterFactor }),
		declaration: { kind: 'onBoard', amountL: f.declaredL },
		events: f.events.map((e) => ({ t: T0 + e.at * span, kind: e.kind, amountL: e.amountL })),
		thresholds: { lowFuelL: 30, lowEnduranceMin: 45 },
		reserve: { ruleId: 'faa-91.151-vfr-day' },
		recentCruiseFlowLph: 28
	};
}

