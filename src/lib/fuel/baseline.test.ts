import { describe, expect, it } from 'vitest';
import { MAD_SCALE, MIN_BASELINE_FLIGHTS, bandPosition, learnBaseline, median, medianAbsoluteDeviation, usualBand, type BaselineFlight } from './baseline';

const flight = (id: string, cruise: number, extra: Partial<BaselineFlight> = {}): BaselineFlight => ({
	id,
	phases: [
		{ phase: 'taxi', timeS: 600, fuelL: 1.5, averageFlowLph: 9 },
		{ phase: 'climb', timeS: 600, fuelL: 6, averageFlowLph: 36 },
		{ phase: 'cruise', timeS: 3600, fuelL: cruise, averageFlowLph: cruise },
		{ phase: 'descent', timeS: 60, fuelL: 0.3, averageFlowLph: 18 }
	],
	fuelPerEngineHourLph: cruise * 0.95,
	...extra
});

describe('median and MAD', () => {
	it('match the definitions on a worked set', () => {
		// MAD = median |xᵢ − median(x)| (NIST/SEMATECH e-Handbook of Statistical Methods, 1.3.5.6).
		// {1, 2, 3, 4, 100}: median 3; deviations {2, 1, 0, 1, 97}, their median 1.
		expect(median([4, 1, 100, 3, 2])).toBe(3);
		expect(medianAbsoluteDeviation([4, 1, 100, 3, 2])).toBe(1);
		// Even count: the mean of the two middle values.
		expect(median([1, 2, 3, 10])).toBe(2.5);
		expect(median([])).toBeNaN();
		expect(median([NaN, 5])).toBe(5);
	});
});

describe('learnBaseline', () => {
	const usual = ['a', 'b', 'c', 'd', 'e'].map((id, k) => flight(id, [30, 31, 29, 30.5, 29.5][k]));

	it('gives per phase the median flow and the scaled MAD as spread, over the flights it names', () => {
		const b = learnBaseline(usual);
		// Cruise flows {29, 29.5, 30, 30.5, 31}: median 30, MAD 0.5.
		expect(b.phases.cruise).toMatchObject({ source: 'learned', centreLph: 30, flights: 5, usualTimeS: 3600 });
		expect(b.phases.cruise!.spreadLph).toBeCloseTo(MAD_SCALE * 0.5, 12);
		expect(b.phases.climb?.centreLph).toBe(36);
		// A 60 s descent is too short to say what the descent usually burns.
		expect(b.phases.descent).toBeNull();
		expect(b.flightsUsed).toBe(5);
	});

	it('is not moved by one odd flight, and leaves out flights marked unusual', () => {
		const odd = flight('odd', 45);
		expect(learnBaseline([odd, ...usual]).phases.cruise!.centreLph).toBeCloseTo(30.25, 12);
		const b = learnBaseline([{ ...odd, unusual: true }, ...usual]);
		expect(b.phases.cruise!.centreLph).toBe(30);
		expect(b.flightsLeftOut).toBe(1);
		expect(b.flightsUsed).toBe(5);
	});

	it('uses only the newest flights, and needs a few of them', () => {
		expect(learnBaseline(usual, { recent: 3 }).phases.cruise!.centreLph).toBe(30);
		expect(learnBaseline(usual.slice(0, MIN_BASELINE_FLIGHTS - 1)).phases.cruise).toBeNull();
		// Until then the aircraft's configured cruise flow stands in, and says so.
		expect(learnBaseline(usual.slice(0, 2), { fallback: { cruise: 31 } }).phases.cruise).toMatchObject({ source: 'configured', centreLph: 31, flights: 0 });
		expect(learnBaseline(usual, { fallback: { cruise: 31 } }).phases.cruise?.source).toBe('learned');
	});

	it('takes a usual flow set by hand instead of the learned one', () => {
		const b = learnBaseline(usual, { manual: { cruise: 28, climb: null } });
		expect(b.phases.cruise).toMatchObject({ source: 'manual', centreLph: 28, spreadLph: null, flights: 0 });
		expect(b.phases.climb?.source).toBe('learned');
	});
});

describe('usual band', () => {
	it('spans centre ± two spreads and places a flow below, within or above it', () => {
		const b = usualBand(30, 1.5);
		expect([b.lowLph, b.centreLph, b.highLph]).toEqual([27, 30, 33]);
		expect([26.9, 27, 30, 33, 33.1].map((x) => bandPosition(x, b))).toEqual(['below', 'within', 'within', 'within', 'above']);
		// A hand-set centre has no spread: the band is the centre itself.
		expect(bandPosition(30.01, usualBand(30, null))).toBe('above');
	});
});
