// Alarm episodes: low fuel on board, low endurance, negative reserve at the next waypoint.
// Each is raised once when its value drops below the threshold and cleared only when the value
// is back above threshold + hysteresis, so noise near the line does not flap.

import type { AlarmEpisode, AlarmKind, AlarmThresholds } from './types';
import { ALARM_LOW_ENDURANCE, ALARM_LOW_FUEL, ALARM_NEGATIVE_RESERVE } from './types';

/** Default hysteresis (our choice): small against a light single's figures, larger than sensor noise. */
export const DEFAULT_HYSTERESIS = { fuelL: 1, enduranceMin: 2, reserveL: 1 } as const;

export interface AlarmTrack {
	kind: AlarmKind;
	bit: number;
	/** NaN when the alarm is off. */
	threshold: number;
	hysteresis: number;
	episode: AlarmEpisode | null;
}

function track(kind: AlarmKind, bit: number, threshold: number | null | undefined, hysteresis: number): AlarmTrack {
	const on = typeof threshold === 'number' && Number.isFinite(threshold);
	const h = Number.isFinite(hysteresis) && hysteresis >= 0 ? hysteresis : 0;
	return { kind, bit, threshold: on ? threshold : NaN, hysteresis: h, episode: null };
}

/** The three alarm tracks in a fixed order: low fuel, low endurance, negative reserve. */
export function createAlarmTracks(th: AlarmThresholds | undefined): [AlarmTrack, AlarmTrack, AlarmTrack] {
	const h = th?.hysteresis ?? {};
	return [
		track('lowFuel', ALARM_LOW_FUEL, th?.lowFuelL, h.fuelL ?? DEFAULT_HYSTERESIS.fuelL),
		track('lowEndurance', ALARM_LOW_ENDURANCE, th?.lowEnduranceMin, h.enduranceMin ?? DEFAULT_HYSTERESIS.enduranceMin),
		track('negativeReserve', ALARM_NEGATIVE_RESERVE, th?.negativeReserve === false ? null : 0, h.reserveL ?? DEFAULT_HYSTERESIS.reserveL)
	];
}

/**
 * Feeds one sample's value. A missing value (NaN) neither raises nor clears: the engine stopping
 * or the waypoint figures going away is not a reason to call the danger over.
 * Returns the alarm's bit when raised after this sample, else 0.
 */
export function updateAlarm(a: AlarmTrack, value: number, t: number, index: number, out: AlarmEpisode[]): number {
	if (a.threshold !== a.threshold) return 0;
	const e = a.episode;
	if (e === null) {
		if (value < a.threshold) {
			const ep: AlarmEpisode = {
				id: `${a.kind}@${index}`,
				kind: a.kind,
				raisedAt: t,
				raisedIndex: index,
				clearedAt: null,
				clearedIndex: null,
				value,
				worst: value,
				threshold: a.threshold
			};
			out.push(ep);
			a.episode = ep;
			return a.bit;
		}
		return 0;
	}
	if (value < e.worst) e.worst = value;
	if (value >= a.threshold + a.hysteresis) {
		e.clearedAt = t;
		e.clearedIndex = index;
		a.episode = null;
		return 0;
	}
	return a.bit;
}
