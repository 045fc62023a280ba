// Alarm episodes: low fuel on board, low endurance, and arriving at the next waypoint below the
// reserve amount. Each is raised once when its value has stayed below the threshold for a minimum
// time, and cleared only when the value is back above threshold + hysteresis, so neither noise
// near the line nor a moment's projection (a take-off roll, a gust) raises or flaps it.

import type { AlarmEpisode, AlarmKind, AlarmThresholds } from './types';
import { ALARM_ARRIVAL_BELOW_RESERVE, ALARM_LOW_ENDURANCE, ALARM_LOW_FUEL } from './types';

/**
 * Default hysteresis (our choice): small against a light single's figures (1 L is about 2 min of
 * cruise at 30 L/h), larger than sensor noise.
 */
export const DEFAULT_HYSTERESIS = { fuelL: 1, enduranceMin: 2, arrivalL: 1 } as const;

/**
 * Default persistence, seconds below the threshold before an alarm is raised (our choice):
 * - arrival: 60 s. The projection to the waypoint swings with ground speed: just after lift-off
 *   (slow, far to go) and in a gust it reads short for seconds to tens of seconds. A real
 *   shortfall lasts minutes; a minute's delay costs about 1 NM of a light single's route.
 * - endurance: 60 s, for the same reason (a flow spike or a sensor blip).
 * - fuel on board: 0 s. It only falls as fuel is burnt, so it does not swing.
 */
export const DEFAULT_PERSIST_S = { fuel: 0, endurance: 60, arrival: 60 } as const;

export interface AlarmTrack {
	kind: AlarmKind;
	bit: number;
	/** NaN when the alarm is off. */
	threshold: number;
	hysteresis: number;
	persistS: number;
	/** When the value went below the threshold (NaN: it is not below, or the alarm is raised). */
	belowSince: number;
	episode: AlarmEpisode | null;
}

const nonNegative = (x: number | undefined, fallback: number) => (typeof x === 'number' && Number.isFinite(x) && x >= 0 ? x : fallback);

function track(kind: AlarmKind, bit: number, threshold: number | null | undefined, hysteresis: number | undefined, defaultH: number, persist: number | undefined, defaultP: number): AlarmTrack {
	const on = typeof threshold === 'number' && Number.isFinite(threshold);
	return {
		kind,
		bit,
		threshold: on ? threshold : NaN,
		hysteresis: nonNegative(hysteresis, defaultH),
		persistS: nonNegative(persist, defaultP),
		belowSince: NaN,
		episode: null
	};
}

/** The three alarm tracks in a fixed order: low fuel, low endurance, arrival below the reserve. */
export function createAlarmTracks(th: AlarmThresholds | undefined): [AlarmTrack, AlarmTrack, AlarmTrack] {
	const h = th?.hysteresis ?? {};
	const p = th?.persistS ?? {};
	return [
		track('lowFuel', ALARM_LOW_FUEL, th?.lowFuelL, h.fuelL, DEFAULT_HYSTERESIS.fuelL, p.fuel, DEFAULT_PERSIST_S.fuel),
		track('lowEndurance', ALARM_LOW_ENDURANCE, th?.lowEnduranceMin, h.enduranceMin, DEFAULT_HYSTERESIS.enduranceMin, p.endurance, DEFAULT_PERSIST_S.endurance),
		// The value fed is the arrival margin in litres (left on arrival − reserve amount): below 0 is below the reserve.
		track('arrivalBelowReserve', ALARM_ARRIVAL_BELOW_RESERVE, th?.arrivalBelowReserve === false ? null : 0, h.arrivalL, DEFAULT_HYSTERESIS.arrivalL, p.arrival, DEFAULT_PERSIST_S.arrival)
	];
}

/**
 * Feeds one sample's value. A missing value (NaN) neither raises nor clears a raised alarm: the
 * engine stopping or the waypoint figures going away is not a reason to call the danger over; it
 * does restart the persistence count of one not yet raised (a take-off roll has no figures).
 * Returns the alarm's bit when raised after this sample, else 0.
 */
export function updateAlarm(a: AlarmTrack, value: number, t: number, index: number, out: AlarmEpisode[]): number {
	if (a.threshold !== a.threshold) return 0;
	const e = a.episode;
	if (e === null) {
		if (value < a.threshold) {
			if (a.belowSince !== a.belowSince) a.belowSince = t;
			if (t - a.belowSince < a.persistS) return 0;
			const ep: AlarmEpisode = {
				id: `${a.kind}@${index}`,
				kind: a.kind,
				raisedAt: t,
				raisedIndex: index,
				belowSince: a.belowSince,
				clearedAt: null,
				clearedIndex: null,
				value,
				worst: value,
				threshold: a.threshold
			};
			out.push(ep);
			a.episode = ep;
			a.belowSince = NaN;
			return a.bit;
		}
		a.belowSince = NaN;
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

/**
 * The flow low endurance is judged at (our rule, so an ordinary climb does not raise it): at
 * climb power the present flow is about twice cruise (common practice) and lasts minutes, so a
 * climb is judged at normal-cruise flow; otherwise at the higher of normal-cruise and present
 * flow, so a reduced-power descent never reads longer than cruise. Without a normal-cruise flow,
 * the present flow, and no judgement in a climb. NaN with the engine stopped.
 */
export function enduranceJudgeFlow(presentLph: number, cruiseLph: number, climbing: boolean, minFlowLph: number): number {
	if (!(presentLph > minFlowLph)) return NaN;
	if (cruiseLph !== cruiseLph) return climbing ? NaN : presentLph;
	if (climbing) return cruiseLph;
	return presentLph > cruiseLph ? presentLph : cruiseLph;
}

/** The arrival persistence in force: also the span of the summary's thinnest airborne margin. */
export function arrivalPersistS(th: AlarmThresholds | undefined): number {
	return nonNegative(th?.persistS?.arrival, DEFAULT_PERSIST_S.arrival);
}
