// Reading live batches without a database: units converted with the exact factors, times in
// both accepted forms, and each kind of fault reported with where it is.
import { describe, expect, it } from 'vitest';
import { readCsvBatch, readJsonBatch } from './batch';

const AVGAS = 0.719;
const sample = (seq: number, over: Record<string, unknown> = {}) => ({ seq, t: `2026-05-02T09:00:${String(seq).padStart(2, '0')}Z`, flow: 30, gs: 100, dtg: 40, ...over });

describe('JSON batches', () => {
	it('converts the units the batch names into L/h, kt, NM and ft', () => {
		const r = readJsonBatch({ units: { flow: 'usgal/h', speed: 'km/h', distance: 'km', altitude: 'm' }, samples: [sample(0, { flow: 10, gs: 185.2, dtg: 18.52, alt: 1000 })] }, AVGAS);
		if (!r.ok) throw new Error(JSON.stringify(r.problems));
		const s = r.batch.samples[0];
		// 1 US gal = 3.785411784 L (NIST Handbook 44, App. C); 1 NM = 1852 m (BIPM); 1 ft = 0.3048 m.
		expect(s.flow).toBeCloseTo(37.85411784, 10);
		expect(s.gs).toBeCloseTo(100, 10);
		expect(s.dtg).toBeCloseTo(10, 10);
		expect(s.alt).toBeCloseTo(1000 / 0.3048, 9);
		expect(r.batch.firstSeq).toBe(0);
		expect(r.batch.flightId).toBeNull();
	});

	it('converts a mass flow with the aircraft density', () => {
		const r = readJsonBatch({ units: { flow: 'lb/h' }, samples: [sample(0, { flow: 60 })] }, AVGAS);
		if (!r.ok) throw new Error('refused');
		// 1 lb = 0.45359237 kg (1959 agreement; from memory, high confidence).
		expect(r.batch.samples[0].flow).toBeCloseTo((60 * 0.45359237) / AVGAS, 10);
	});

	it('reads times as ISO 8601 with a zone or as epoch seconds', () => {
		const r = readJsonBatch({ samples: [sample(0, { t: '2026-05-02T11:00:00+02:00' }), sample(1, { t: Date.UTC(2026, 4, 2, 9, 0, 1) / 1000 })] }, AVGAS);
		if (!r.ok) throw new Error(JSON.stringify(r.problems));
		expect(r.batch.samples.map((s) => s.tMs)).toEqual([Date.UTC(2026, 4, 2, 9), Date.UTC(2026, 4, 2, 9, 0, 1)]);
	});

	it('keeps a blank value as "not recorded" rather than refusing it', () => {
		const r = readJsonBatch({ samples: [sample(0, { flow: null, dtg: undefined })] }, AVGAS);
		if (!r.ok) throw new Error('refused');
		expect(r.batch.samples[0]).toMatchObject({ flow: null, dtg: null, gs: 100 });
	});

	it('says what is wrong and where', () => {
		const cases: [unknown, string, RegExp][] = [
			[{ samples: [sample(0, { flow: 600 })] }, 'samples[0].flow', /above the limit of 500 L\/h/],
			[{ samples: [sample(0, { dtg: -1 })] }, 'samples[0].dtg', /negative/],
			[{ samples: [sample(0, { t: 1_746_176_400_000 })] }, 'samples[0].t', /milliseconds/],
			[{ samples: [sample(0, { wpt: 'W'.repeat(41) })] }, 'samples[0].wpt', /longer than 40/],
			[{ samples: [sample(0), sample(1, { seq: 1, t: '2026-05-02T09:00:00Z' })] }, 'samples[1].t', /repeats/],
			[{ flightId: 'abc', samples: [sample(0)] }, 'flightId', /earlier answer/],
			[{ samples: 'none' }, 'samples', /.+/]
		];
		for (const [body, field, message] of cases) {
			const r = readJsonBatch(body, AVGAS);
			expect(r.ok, field).toBe(false);
			if (r.ok) continue;
			expect(r.problems[0].field).toBe(field);
			expect(r.problems[0].message).toMatch(message);
		}
	});
});

describe('CSV batches', () => {
	const header = 'seq,time_utc,fuel_flow_lph,ground_speed_kt,distance_to_go_nm';

	it('reads our recorder format with a byte-order mark and CRLF', () => {
		const r = readCsvBatch(`\uFEFF${header}\r\n7,2026-05-02T09:00:07Z,31.5,101,39.9\r\n8,2026-05-02T09:00:08Z,31.6,101,39.8\r\n`, { flightId: null, firstSeq: 7, densityKgPerL: AVGAS });
		if (!r.ok) throw new Error(JSON.stringify(r.problems));
		expect(r.batch.samples.map((s) => [s.seq, s.flow])).toEqual([
			[7, 31.5],
			[8, 31.6]
		]);
		expect(r.batch.firstSeq).toBe(7);
	});

	it('refuses gaps in the sequence with the line', () => {
		const r = readCsvBatch(`${header}\n0,2026-05-02T09:00:00Z,30,100,40\n2,2026-05-02T09:00:01Z,30,100,40`, { flightId: null, firstSeq: 0, densityKgPerL: AVGAS });
		expect(r.ok).toBe(false);
		if (r.ok) return;
		expect(r.problems[0]).toMatchObject({ line: 3, field: 'seq', message: expect.stringMatching(/consecutive/) });
	});

	it('refuses another header with its line', () => {
		const r = readCsvBatch('when,ff\n2026-05-02T09:00:00Z,30', { flightId: null, firstSeq: 0, densityKgPerL: AVGAS });
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.problems[0]).toMatchObject({ line: 1, field: 'header' });
	});
});
