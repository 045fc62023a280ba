import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { summarize } from './summary';
import { columns, input, profile, series, T0 } from './test-fixtures';
import { FLAG_ENDURANCE, FLAG_WAYPOINT, PHASE_STOPPED } from './index';

const allNaN = (a: Float64Array): boolean => a.every((v) => Number.isNaN(v));

describe('degenerate inputs', () => {
	it('no samples: empty arrays and an empty summary', () => {
		const c = computeFlight(input(columns([]), { reserve: { ruleId: 'faa-91.151-vfr-day' } }));
		expect(c.length).toBe(0);
		expect(c.used.length).toBe(0);
		expect(c.alarms).toEqual([]);
		const s = summarize(c);
		expect(s).toMatchObject({ fuelUsedL: 0, onBoardAtShutdownL: null, start: null, blockTimeS: 0, blockTimeBasis: 'none', averageFlowLph: null, maxFlowLph: null, thinnestMargin: null, reserveReachedAt: null, verdict: null });
		expect(s.reserve?.basis).toBe('none');
	});

	it('one sample: nothing used yet, instant figures present', () => {
		const c = computeFlight(input(columns([{ t: T0, flow: 30, gs: 100, dtg: 50 }])));
		expect(c.used[0]).toBe(0);
		expect(c.onBoard[0]).toBe(150);
		expect(c.endurance[0]).toBe(5);
		expect(c.timeToWpt[0]).toBe(0.5);
		expect(summarize(c).blockTimeS).toBe(0);
	});

	it('all zero flow: nothing used, endurance undefined', () => {
		const c = computeFlight(input(columns(series(100, () => ({ flow: 0, gs: 0 })))));
		expect(c.used[99]).toBe(0);
		expect(allNaN(c.endurance)).toBe(true);
		expect(c.flags.every((f) => (f & FLAG_ENDURANCE) === 0)).toBe(true);
		expect(c.phase.every((p) => p === PHASE_STOPPED)).toBe(true);
		const s = summarize(c);
		expect(s.engineTimeS).toBe(0);
		expect(s.averageFlowLph).toBeNull();
	});

	it('ground speed zero throughout: no waypoint figures, no time moving', () => {
		const c = computeFlight(input(columns(series(100, () => ({ flow: 20, gs: 0, dtg: 30 })))));
		for (const a of [c.timeToWpt, c.fuelToWpt, c.arrivalL, c.arrivalMarginMin, c.specificRange]) expect(allNaN(a)).toBe(true);
		expect(c.flags.every((f) => (f & FLAG_WAYPOINT) === 0)).toBe(true);
		expect(c.alarms).toEqual([]);
		const s = summarize(c);
		expect(s.timeMovingS).toBe(0);
		expect(s.blockTimeBasis).toBe('engine');
		expect(s.blockTimeS).toBe(99);
	});

	it('NaN in each column is a blank cell, not an error', () => {
		const rows = series(10, () => ({ flow: 30, gs: 100, dtg: 50, alt: 3000 }));
		rows[3].flow = NaN;
		rows[4].gs = NaN;
		rows[5].dtg = NaN;
		rows[6].alt = NaN;
		const c = computeFlight(input(columns(rows)));
		expect(c.problems).toEqual([]);
		expect(c.flow[3]).toBe(30);
		expect(c.timeToWpt[4]).toBeNaN();
		expect(c.timeToWpt[5]).toBeNaN();
		expect(c.timeToWpt[6]).toBe(0.5);
		expect(c.used[9]).toBeCloseTo((9 * 30) / 3600, 12);
	});

	it('flow blank from the start: nothing counted until the first reading', () => {
		const rows = series(10, (i) => ({ flow: i < 4 ? NaN : 36 }));
		const c = computeFlight(input(columns(rows)));
		expect(c.flow[0]).toBeNaN();
		expect(c.used[3]).toBe(0);
		expect(c.endurance[2]).toBeNaN();
		// The first reading counts back over the interval before it.
		expect(c.used[4]).toBeCloseTo(0.01, 12);
	});

	it('columns of different lengths are cut to the shortest, with a warning', () => {
		const cols = columns(series(10, () => ({ flow: 30 })));
		cols.gs = cols.gs.subarray(0, 7);
		const c = computeFlight(input(cols));
		expect(c.length).toBe(7);
		expect(c.warnings[0]).toMatchObject({ code: 'columnLengthMismatch' });
		expect(c.warnings[0].message).toMatch(/gs 7/);
	});

	it('an unusable profile computes anyway, with warnings', () => {
		const c = computeFlight(
			input(columns(series(10, () => ({ flow: 36 }))), {
				profile: profile({ capacityL: NaN, meterFactor: 0 }),
				declaration: { kind: 'onBoard', amountL: 80 }
			})
		);
		expect(c.onBoard[9]).toBeCloseTo(80 - 0.09, 12);
		expect(c.warnings.map((w) => w.code)).toEqual(['invalidProfile', 'invalidProfile']);
	});

	it('warns once when fuel on board goes below zero', () => {
		const c = computeFlight(input(columns(series(100, () => ({ flow: 36 }))), { declaration: { kind: 'onBoard', amountL: 0.505 } }));
		expect(c.onBoard[99]).toBeLessThan(0);
		expect(c.warnings.filter((w) => w.code === 'onBoardBelowZero')).toHaveLength(1);
		expect(c.warnings[0].index).toBe(51);
	});
});

describe('warnings in the unit on screen', () => {
	it('writes fuel amounts with the caller’s formatter, and in litres by default', () => {
		const rows = series(20, () => ({ flow: 30, gs: 100, dtg: 50 }));
		const cap = profile().capacityL;
		const over = { declaration: { kind: 'onBoard' as const, amountL: cap + 50 }, events: [{ t: rows[10].t, kind: 'added' as const, amountL: 500 }] };
		const inLitres = computeFlight(input(columns(rows), over));
		const usGal = (l: number) => `${(l / 3.785411784).toFixed(1)} US gal`; // NIST Handbook 44, Appendix C
		const inGallons = computeFlight(input(columns(rows), { ...over, options: { formatFuel: usGal } }));
		const texts = (c: typeof inLitres) => c.warnings.map((w) => w.message).join(' | ');
		expect(texts(inLitres)).toContain(`(${Math.round(cap * 10) / 10} L)`);
		expect(texts(inGallons)).toContain(`(${usGal(cap)})`);
		expect(texts(inGallons)).toContain(`capped at ${usGal(cap)}`);
		expect(texts(inGallons)).not.toMatch(/\d L\b/);
		// Only the words change: the figures are the same.
		expect(Array.from(inGallons.onBoard)).toEqual(Array.from(inLitres.onBoard));
	});
});
