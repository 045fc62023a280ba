import { describe, expect, it } from 'vitest';
import { createAlarmTracks, DEFAULT_HYSTERESIS, updateAlarm } from './alarms';
import { computeFlight } from './compute';
import { columns, input, series, T0 } from './test-fixtures';
import { ALARM_LOW_ENDURANCE, ALARM_LOW_FUEL, ALARM_NEGATIVE_RESERVE, type AlarmEpisode } from './types';

describe('updateAlarm', () => {
	it('raises once per crossing and clears only above threshold + hysteresis', () => {
		const [fuel] = createAlarmTracks({ lowFuelL: 40, lowEnduranceMin: null, hysteresis: { fuelL: 2 } });
		const out: AlarmEpisode[] = [];
		// Noise around the line: 40.5, 39.9, 40.3, 39.8, 41.5, 42.1, 39
		const values = [40.5, 39.9, 40.3, 39.8, 41.5, 42.1, 39];
		const bits = values.map((v, i) => updateAlarm(fuel, v, 100 + i, i, out));
		expect(bits).toEqual([0, 1, 1, 1, 1, 0, 1]);
		expect(out).toHaveLength(2);
		expect(out[0]).toMatchObject({ kind: 'lowFuel', raisedIndex: 1, raisedAt: 101, clearedIndex: 5, clearedAt: 105, value: 39.9, worst: 39.8, threshold: 40 });
		expect(out[1]).toMatchObject({ raisedIndex: 6, clearedAt: null, id: 'lowFuel@6' });
	});

	it('holds its state through missing values', () => {
		const [, endurance] = createAlarmTracks({ lowFuelL: null, lowEnduranceMin: 30 });
		const out: AlarmEpisode[] = [];
		expect(updateAlarm(endurance, 25, 0, 0, out)).toBe(ALARM_LOW_ENDURANCE);
		expect(updateAlarm(endurance, NaN, 1, 1, out)).toBe(ALARM_LOW_ENDURANCE);
		expect(updateAlarm(endurance, 30 + DEFAULT_HYSTERESIS.enduranceMin, 2, 2, out)).toBe(0);
		expect(updateAlarm(endurance, NaN, 3, 3, out)).toBe(0);
		expect(out).toHaveLength(1);
	});

	it('does nothing when switched off', () => {
		const [fuel, endurance, reserve] = createAlarmTracks({ lowFuelL: null, lowEnduranceMin: null, negativeReserve: false });
		const out: AlarmEpisode[] = [];
		expect(updateAlarm(fuel, -10, 0, 0, out) | updateAlarm(endurance, -10, 0, 0, out) | updateAlarm(reserve, -10, 0, 0, out)).toBe(0);
		expect(out).toEqual([]);
	});
});

describe('alarms over a flight', () => {
	// 40 L on board burning 36 L/h (0.1 L per 10 s), 55 NM to go at 110 kt from minute 10.
	const rows = series(361, (i) => ({ flow: 36, gs: i >= 60 ? 110 : 5, dtg: i >= 60 ? Math.max(0, 55 - ((i - 60) * 10 * 110) / 3600) : undefined }), T0, 10);
	const c = computeFlight(
		input(columns(rows), {
			declaration: { kind: 'onBoard', amountL: 40 },
			thresholds: { lowFuelL: 19.95, lowEnduranceMin: 45 }
		})
	);

	it('raises low fuel when on board drops below the amount', () => {
		const low = c.alarms.find((a) => a.kind === 'lowFuel')!;
		// 40 − 0.1 k < 19.95 first at k = 201.
		expect(low.raisedIndex).toBe(201);
		expect(low.raisedAt).toBe(T0 + 2010);
		expect(low.clearedAt).toBeNull();
		expect(c.alarmState[200] & ALARM_LOW_FUEL).toBe(0);
		expect(c.alarmState[201] & ALARM_LOW_FUEL).toBe(ALARM_LOW_FUEL);
		expect(c.alarmState[360] & ALARM_LOW_FUEL).toBe(ALARM_LOW_FUEL);
	});

	it('raises low endurance below the minutes set', () => {
		const low = c.alarms.find((a) => a.kind === 'lowEndurance')!;
		// (40 − 0.1 k)/36 h < 45 min ⇔ 40 − 0.1 k < 27 ⇔ k > 130.
		expect(low.raisedIndex).toBe(131);
		expect(low.value).toBeCloseTo(((40 - 13.1) / 36) * 60, 9);
	});

	it('raises negative reserve when the waypoint is out of reach', () => {
		const neg = c.alarms.find((a) => a.kind === 'negativeReserve');
		// At minute 10: 34 L on board, 30 min to go need 18 L: the reserve stays positive.
		expect(neg).toBeUndefined();
		const thin = computeFlight(
			input(columns(rows), { declaration: { kind: 'onBoard', amountL: 20 }, thresholds: { lowFuelL: null, lowEnduranceMin: null } })
		);
		const raised = thin.alarms.filter((a) => a.kind === 'negativeReserve');
		expect(raised).toHaveLength(1);
		// 14 L at minute 10 against 18 L needed.
		expect(raised[0].raisedIndex).toBe(60);
		expect(raised[0].value).toBeCloseTo(14 - 18, 9);
		expect(thin.alarmState[60] & ALARM_NEGATIVE_RESERVE).toBe(ALARM_NEGATIVE_RESERVE);
	});

	it('clears low fuel after a refuel', () => {
		const refuel = computeFlight(
			input(columns(rows), {
				declaration: { kind: 'onBoard', amountL: 40 },
				thresholds: { lowFuelL: 20, lowEnduranceMin: null },
				events: [{ t: T0 + 2500, kind: 'toFull' }]
			})
		);
		const low = refuel.alarms.filter((a) => a.kind === 'lowFuel');
		expect(low).toHaveLength(1);
		expect(low[0].clearedIndex).toBe(250);
	});
});
