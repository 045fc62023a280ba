// The single pass that turns samples into per-sample fuel state. Batch and live both run this
// loop over index ranges, carrying every running value in an EngineState, which is why a live
// flight gives exactly the numbers of a replay of the same samples.

import { arrivalPersistS, createAlarmTracks, updateAlarm, type AlarmTrack } from './alarms';
import { checkProfile, litresText, resolveDeclaration } from './declaration';
import { eventDelta, normalizeEvents } from './events';
import { createGapTracker, gapThresholdFor, type GapTracker } from './gaps';
import { gapFillFlow, segmentLitres } from './integrate';
import { createPhaseTracker, PHASE_CLIMB, PHASE_COUNT, PHASE_CRUISE, PHASE_STOPPED, PHASE_TAXI, trackPhase, type PhaseTracker } from './phases';
import {
	BASIS_BASELINE,
	BASIS_MEASURED,
	BASIS_NONE,
	BASIS_RECENT,
	MIN_MEASURED_CRUISE_S,
	reserveAmount,
	reserveMinutesOf,
	type ReserveSetting
} from './reserve';
import { createTrailingMax, pushTrailingMax, resetTrailingMax, type TrailingMax } from './window';
import {
	ARRIVAL_EATS_INTO,
	ARRIVAL_KEEPS,
	ARRIVAL_NO_RESERVE,
	ARRIVAL_NONE,
	ARRIVAL_RUNS_OUT,
	FLAG_ENDURANCE,
	FLAG_EVENT,
	FLAG_FLOW_FILLED,
	FLAG_FLOW_HELD,
	FLAG_GAP_FILLED,
	FLAG_REJECTED,
	FLAG_WAYPOINT,
	WPT_NONE,
	type AlarmEpisode,
	type AlarmThresholds,
	type DataGap,
	type DataProblem,
	type EngineOptions,
	type EngineWarning,
	type FlightComputation,
	type FlightInput,
	type FlightStats,
	type FuelEvent,
	type ResolvedDeclaration,
	type ResolvedEvent,
	type SampleColumns,
	type UsableProfile
} from './types';
import { DEFAULT_LIMITS, describeProblem, problemField, rowProblem, type RowLimits } from './validate';
import {
	enduranceH,
	fuelToWaypointL,
	specificRangeNmPerL,
	timeToWaypointH
} from './waypoint';


/*
 * Module-level copies of what the kernel uses per sample: an imported binding can compile to a
 * getter call (CommonJS interop in tsx and the test runner), which at a million samples costs as
 * much as the arithmetic. Same values, read directly.
 */
const K_PHASE_STOPPED = PHASE_STOPPED;
const K_PHASE_TAXI = PHASE_TAXI;
const K_PHASE_CLIMB = PHASE_CLIMB;
const K_PHASE_CRUISE = PHASE_CRUISE;
const K_BASIS_NONE = BASIS_NONE;
const K_BASIS_BASELINE = BASIS_BASELINE;
const K_BASIS_MEASURED = BASIS_MEASURED;
const K_BASIS_RECENT = BASIS_RECENT;
const K_MIN_MEASURED_CRUISE_S = MIN_MEASURED_CRUISE_S;
const K_ARRIVAL_NONE = ARRIVAL_NONE;
const K_ARRIVAL_KEEPS = ARRIVAL_KEEPS;
const K_ARRIVAL_EATS_INTO = ARRIVAL_EATS_INTO;
const K_ARRIVAL_RUNS_OUT = ARRIVAL_RUNS_OUT;
const K_ARRIVAL_NO_RESERVE = ARRIVAL_NO_RESERVE;
const K_FLAG_REJECTED = FLAG_REJECTED;
const K_FLAG_FLOW_HELD = FLAG_FLOW_HELD;
const K_FLAG_FLOW_FILLED = FLAG_FLOW_FILLED;
const K_FLAG_GAP_FILLED = FLAG_GAP_FILLED;
const K_FLAG_EVENT = FLAG_EVENT;
const K_FLAG_ENDURANCE = FLAG_ENDURANCE;
const K_FLAG_WAYPOINT = FLAG_WAYPOINT;
const K_WPT_NONE = WPT_NONE;
const kRowProblem = rowProblem;
const kTrackPhase = trackPhase;
const kGapThresholdFor = gapThresholdFor;
const kSegmentLitres = segmentLitres;
const kGapFillFlow = gapFillFlow;
const kEnduranceH = enduranceH;
const kTimeToWaypointH = timeToWaypointH;
const kFuelToWaypointL = fuelToWaypointL;
const kSpecificRangeNmPerL = specificRangeNmPerL;
const kPushTrailingMax = pushTrailingMax;
const kResetTrailingMax = resetTrailingMax;
const kUpdateAlarm = updateAlarm;
const kEventDelta = eventDelta;
const kDescribeProblem = describeProblem;

/** Option defaults (our choice). */
export const DEFAULT_OPTIONS = {
	minFlowLph: 0.5,
	minGsKt: 3,
	airborneGsKt: 40,
	phaseHoldS: 10,
	gapFloorS: 10,
	gapFactor: 5
} as const;

export interface ResolvedOptions {
	minFlowLph: number;
	minGsKt: number;
	airborneGsKt: number;
	waypointMinGsKt: number;
	phaseHoldS: number;
	gapFloorS: number;
	gapFactor: number;
	gapThresholdS: number | null;
	limits: RowLimits;
	formatFuel: (litres: number) => string;
}

function pick(value: number | undefined, fallback: number): number {
	return typeof value === 'number' && !Number.isNaN(value) && value >= 0 ? value : fallback;
}

export function resolveOptions(o: EngineOptions = {}): ResolvedOptions {
	const fixed = o.gapThresholdS;
	const airborneGsKt = pick(o.airborneGsKt, DEFAULT_OPTIONS.airborneGsKt);
	return {
		minFlowLph: pick(o.minFlowLph, DEFAULT_OPTIONS.minFlowLph),
		minGsKt: pick(o.minGsKt, DEFAULT_OPTIONS.minGsKt),
		airborneGsKt,
		waypointMinGsKt: pick(o.waypointMinGsKt, airborneGsKt),
		phaseHoldS: pick(o.phaseHoldS, DEFAULT_OPTIONS.phaseHoldS),
		gapFloorS: pick(o.gapFloorS, DEFAULT_OPTIONS.gapFloorS),
		gapFactor: pick(o.gapFactor, DEFAULT_OPTIONS.gapFactor),
		gapThresholdS: typeof fixed === 'number' && fixed > 0 ? fixed : null,
		formatFuel: typeof o.formatFuel === 'function' ? o.formatFuel : litresText,
		limits: {
			maxFlowLph: pick(o.maxFlowLph, DEFAULT_LIMITS.maxFlowLph),
			maxGsKt: pick(o.maxGsKt, DEFAULT_LIMITS.maxGsKt),
			maxDtgNm: pick(o.maxDtgNm, DEFAULT_LIMITS.maxDtgNm),
			minAltFt: typeof o.minAltFt === 'number' ? o.minAltFt : DEFAULT_LIMITS.minAltFt,
			maxAltFt: pick(o.maxAltFt, DEFAULT_LIMITS.maxAltFt)
		}
	};
}

/** Everything but the samples: checked once, reused when a live flight recomputes. */
export interface EngineSetup {
	profile: UsableProfile;
	declaration: ResolvedDeclaration;
	events: FuelEvent[];
	thresholds: AlarmThresholds | undefined;
	reserve: ReserveSetting | null;
	/** Minutes of the reserve rule; NaN without a rule (or a custom one without minutes). */
	reserveMinutes: number;
	/** The aircraft's recent median cruise flow, L/h; NaN when not supplied. */
	recentCruiseLph: number;
	options: ResolvedOptions;
	warnings: EngineWarning[];
}

export type EngineInputs = Omit<FlightInput, 'columns'>;

export function prepare(input: EngineInputs): EngineSetup {
	const { profile, warnings: profileWarnings } = checkProfile(input.profile);
	const options = resolveOptions(input.options);
	const declaration = resolveDeclaration(input.declaration, profile, input.previousOnBoardL, options.formatFuel);
	const { events, warnings: eventWarnings } = normalizeEvents(input.events, profile);
	const reserve = input.reserve ?? null;
	const minutes = reserve ? reserveMinutesOf(reserve) : null;
	const recent = input.recentCruiseFlowLph;
	return {
		profile,
		declaration,
		events,
		thresholds: input.thresholds,
		reserve,
		reserveMinutes: minutes === null ? NaN : minutes,
		recentCruiseLph: typeof recent === 'number' && Number.isFinite(recent) && recent > 0 ? recent : NaN,
		options,
		warnings: [...profileWarnings, ...declaration.warnings, ...eventWarnings]
	};
}


const FLOAT_OUTPUTS = [
	'flow',
	'used',
	'onBoard',
	'endurance',
	'timeToWpt',
	'fuelToWpt',
	'arrivalL',
	'arrivalMarginMin',
	'specificRange',
	'reserveL',
	'cruiseFlow'
] as const;
const BYTE_OUTPUTS = ['phase', 'alarmState', 'flags', 'arrivalState', 'reserveBasis'] as const;

/** The per-sample result arrays; live mode allocates them with spare room and grows them. */
export type Outputs = Pick<FlightComputation, (typeof FLOAT_OUTPUTS)[number] | (typeof BYTE_OUTPUTS)[number]>;

export function allocOutputs(capacity: number): Outputs {
	const o = {} as Outputs;
	for (const k of FLOAT_OUTPUTS) o[k] = new Float64Array(capacity);
	for (const k of BYTE_OUTPUTS) o[k] = new Uint8Array(capacity);
	return o;
}

/** New arrays of `capacity` holding the first `used` values of `o`. */
export function growOutputs(o: Outputs, used: number, capacity: number): Outputs {
	const g = allocOutputs(capacity);
	for (const k of FLOAT_OUTPUTS) g[k].set(o[k].subarray(0, used));
	for (const k of BYTE_OUTPUTS) g[k].set(o[k].subarray(0, used));
	return g;
}

export interface EngineState {
	setup: EngineSetup;
	gap: GapTracker;
	phase: PhaseTracker;
	alarmTracks: [AlarmTrack, AlarmTrack, AlarmTrack];
	lastT: number;
	lastIdx: number;
	/** Flow at the last accepted sample (after the meter factor, blanks held). */
	lastFlow: number;
	lastGs: number;
	lastPhase: number;
	lastRealFlowT: number;
	lastRealFlowIdx: number;
	/** The last real (not blank) flow reading, after the meter factor. */
	lastRealFlow: number;
	flowHeld: boolean;
	/** The last real ground speed and its time, to bridge distance across blank cells. */
	lastRealGs: number;
	lastRealGsT: number;
	/** The arrival margin held over the persistence time, for the thinnest airborne margin. */
	marginWindow: TrailingMax;
	usedTotal: number;
	usedOffset: number;
	/**
	 * Fuel on board is anchored at the last event: anchorOnBoard − (usedTotal − anchorUsed). At
	 * the event itself that is the anchor exactly, so "filled to full" reads the capacity, not
	 * the capacity give or take a rounding error.
	 */
	anchorOnBoard: number;
	anchorUsed: number;
	eventIdx: number;
	alarmBits: number;
	belowZeroWarned: boolean;
	stats: FlightStats;
	gaps: DataGap[];
	problems: DataProblem[];
	warnings: EngineWarning[];
	alarms: AlarmEpisode[];
	resolvedEvents: ResolvedEvent[];
}

function emptyStats(): FlightStats {
	return {
		acceptedCount: 0,
		firstT: NaN,
		lastT: NaN,
		lastIndex: -1,
		usedTotalL: 0,
		engineTimeS: 0,
		firstRunT: NaN,
		lastRunT: NaN,
		lastRunIndex: -1,
		lastRunOnBoardL: NaN,
		lastRunFlowLph: NaN,
		movingTimeS: 0,
		firstMoveT: NaN,
		lastMoveT: NaN,
		distanceNm: 0,
		maxFlowLph: 0,
		phaseTimeS: new Float64Array(PHASE_COUNT),
		phaseFuelL: new Float64Array(PHASE_COUNT),
		phaseDistanceNm: new Float64Array(PHASE_COUNT),
		thinnestMarginL: Infinity,
		thinnestMarginMin: NaN,
		thinnestMarginT: NaN,
		thinnestMarginIndex: -1,
		thinnestMarginWpt: null,
		reserveReachedIndex: -1,
		reserveReachedT: NaN,
		cruiseTimeS: 0,
		cruiseFuelL: 0,
		airborne: false
	};
}

export function createState(setup: EngineSetup): EngineState {
	const o = setup.options;
	return {
		setup,
		gap: createGapTracker(o.gapFloorS, o.gapFactor, o.gapThresholdS),
		phase: createPhaseTracker({
			minFlowLph: o.minFlowLph,
			minGsKt: o.minGsKt,
			airborneGsKt: o.airborneGsKt,
			holdS: o.phaseHoldS,
			// Without a set normal-cruise flow, the aircraft's recent cruise is the next best reference.
			baselineLph: setup.profile.baselineCruiseFlowLph ?? (setup.recentCruiseLph === setup.recentCruiseLph ? setup.recentCruiseLph : null)
		}),
		alarmTracks: createAlarmTracks(setup.thresholds),
		lastT: NaN,
		lastIdx: -1,
		lastFlow: NaN,
		lastGs: NaN,
		lastPhase: 0,
		lastRealFlowT: NaN,
		lastRealFlowIdx: -1,
		lastRealFlow: NaN,
		flowHeld: false,
		lastRealGs: NaN,
		lastRealGsT: NaN,
		marginWindow: createTrailingMax(arrivalPersistS(setup.thresholds)),
		usedTotal: 0,
		usedOffset: 0,
		anchorOnBoard: setup.declaration.onBoardL,
		anchorUsed: 0,
		eventIdx: 0,
		alarmBits: 0,
		belowZeroWarned: false,
		stats: emptyStats(),
		gaps: [],
		problems: [],
		warnings: [],
		alarms: [],
		resolvedEvents: []
	};
}

function problemValue(code: number, t: number, flow: number, gs: number, dtg: number, alt: number): number {
	switch (problemField(code)) {
		case 't':
			return t;
		case 'flow':
			return flow;
		case 'gs':
			return gs;
		case 'dtg':
			return dtg;
		default:
			return alt;
	}
}

/**
 * Processes samples [from, to). Running values live in locals inside the loop (fast in V8) and
 * are written back to the state at the end, so the next call continues exactly where this one
 * stopped. Nothing is allocated per sample except for rare timeline entries.
 */
export function runKernel(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const { t, flow, gs, dtg } = cols;
	const alt = cols.alt;
	const wpt = cols.wpt;
	const setup = s.setup;
	const profile = setup.profile;
	const o = setup.options;
	const lim = o.limits;
	const maxFlowLim = lim.maxFlowLph;
	const maxGsLim = lim.maxGsKt;
	const maxDtgLim = lim.maxDtgNm;
	const minAltLim = lim.minAltFt;
	const maxAltLim = lim.maxAltFt;
	const minFlow = o.minFlowLph;
	const minGs = o.minGsKt;
	const wptGs = o.waypointMinGsKt;
	const mf = profile.meterFactor;
	const events = setup.events;
	const nEv = events.length;
	const gap = s.gap;
	const ph = s.phase;
	const alarmFuel = s.alarmTracks[0];
	const alarmEndurance = s.alarmTracks[1];
	const alarmArrival = s.alarmTracks[2];
	const episodes = s.alarms;
	// NaN (alarm off) never compares below, so an off alarm costs nothing here.
	const fuelThreshold = alarmFuel.threshold;
	const enduranceThreshold = alarmEndurance.threshold;
	const arrivalThreshold = alarmArrival.threshold;
	const airborneGs = o.airborneGsKt;
	const reserveMin = setup.reserveMinutes;
	const baselineRaw = profile.baselineCruiseFlowLph;
	const baseline = baselineRaw !== null && baselineRaw > 0 ? baselineRaw : NaN;
	const recent = setup.recentCruiseLph;
	const win = s.marginWindow;
	const st = s.stats;
	const phaseTime = st.phaseTimeS;
	const phaseFuel = st.phaseFuelL;
	const phaseDist = st.phaseDistanceNm;
	const oFlow = out.flow;
	const oUsed = out.used;
	const oOnBoard = out.onBoard;
	const oEndurance = out.endurance;
	const oTime = out.timeToWpt;
	const oFuel = out.fuelToWpt;
	const oArrival = out.arrivalL;
	const oMarginMin = out.arrivalMarginMin;
	const oRange = out.specificRange;
	const oReserveL = out.reserveL;
	const oCruise = out.cruiseFlow;
	const oPhase = out.phase;
	const oAlarm = out.alarmState;
	const oFlags = out.flags;
	const oArrivalState = out.arrivalState;
	const oBasis = out.reserveBasis;

	let lastT = s.lastT;
	let lastIdx = s.lastIdx;
	let lastFlow = s.lastFlow;
	let lastGs = s.lastGs;
	let lastPhase = s.lastPhase;
	let lastRealT = s.lastRealFlowT;
	let lastRealIdx = s.lastRealFlowIdx;
	let lastRealFlow = s.lastRealFlow;
	let lastRealGs = s.lastRealGs;
	let lastRealGsT = s.lastRealGsT;
	let held = s.flowHeld;
	let usedTotal = s.usedTotal;
	let usedOffset = s.usedOffset;
	let anchorOnBoard = s.anchorOnBoard;
	let anchorUsed = s.anchorUsed;
	let eventIdx = s.eventIdx;
	// Events are sorted: one compare per sample against the next one's time.
	let nextEventT = eventIdx < nEv ? events[eventIdx].t : Infinity;
	let alarmBits = s.alarmBits;
	let belowZeroWarned = s.belowZeroWarned;
	let accepted = st.acceptedCount;
	let engineTime = st.engineTimeS;
	let moving = st.movingTimeS;
	let distance = st.distanceNm;
	let maxFlow = st.maxFlowLph;
	let firstRunT = st.firstRunT;
	let lastRunT = st.lastRunT;
	let lastRunIdx = st.lastRunIndex;
	let lastRunOnBoard = st.lastRunOnBoardL;
	let lastRunFlow = st.lastRunFlowLph;
	let firstMoveT = st.firstMoveT;
	let lastMoveT = st.lastMoveT;
	let thinnest = st.thinnestMarginL;
	// Whether an alarm not yet raised has a value below its threshold (counting its persistence).
	let pendingBelow =
		alarmFuel.belowSince === alarmFuel.belowSince ||
		alarmEndurance.belowSince === alarmEndurance.belowSince ||
		alarmArrival.belowSince === alarmArrival.belowSince;

	for (let i = from; i < to; i++) {
		const ti = t[i];
		const rawFlow = flow[i];
		const g = gs[i];
		const d = dtg[i];
		const a = alt !== undefined ? alt[i] : NaN;

		// Fast path for a good row; kRowProblem says exactly what is wrong with the others.
		const suspect =
			!(ti > lastT && ti < Infinity) ||
			rawFlow < 0 ||
			rawFlow > maxFlowLim ||
			g < 0 ||
			g > maxGsLim ||
			d < 0 ||
			d > maxDtgLim ||
			a < minAltLim ||
			a > maxAltLim;
		const problem = suspect ? kRowProblem(ti, lastT, rawFlow, g, d, a, lim) : 0;
		if (problem !== 0) {
			s.problems.push(kDescribeProblem(problem, i, problemValue(problem, ti, rawFlow, g, d, a), lastT));
			// A skipped sample carries the running totals so the arrays stay aligned with the input.
			oFlow[i] = NaN;
			oUsed[i] = usedTotal - usedOffset;
			oOnBoard[i] = anchorOnBoard - (usedTotal - anchorUsed);
			oEndurance[i] = NaN;
			oTime[i] = NaN;
			oFuel[i] = NaN;
			oArrival[i] = NaN;
			oMarginMin[i] = NaN;
			oRange[i] = NaN;
			oReserveL[i] = lastIdx >= 0 ? oReserveL[lastIdx] : NaN;
			oCruise[i] = lastIdx >= 0 ? oCruise[lastIdx] : NaN;
			oBasis[i] = lastIdx >= 0 ? oBasis[lastIdx] : K_BASIS_NONE;
			oArrivalState[i] = K_ARRIVAL_NONE;
			oPhase[i] = 0;
			oAlarm[i] = alarmBits;
			oFlags[i] = K_FLAG_REJECTED;
			continue;
		}

		let flags = 0;
		let f: number;
		if (rawFlow === rawFlow) f = rawFlow * mf;
		else {
			// A blank flow cell holds the last reading for now (a live flight cannot see the next
			// one); when the next reading comes, the stretch is filled with the higher of the two.
			f = lastRealFlow;
			if (f === f) flags |= K_FLAG_FLOW_HELD;
		}
		const p = kTrackPhase(ph, ti, f, g, a);

		if (lastIdx >= 0) {
			const dt = ti - lastT;
			const threshold = kGapThresholdFor(gap, dt);
			const isGap = dt > threshold;
			let inc = kSegmentLitres(lastFlow, f, dt, isGap);
			if (isGap) {
				flags |= K_FLAG_GAP_FILLED;
				s.gaps.push({
					kind: 'time',
					start: lastT,
					end: ti,
					startIndex: lastIdx,
					endIndex: i,
					filledFlowLph: kGapFillFlow(lastFlow, f)
				});
			}
			if (rawFlow === rawFlow && held && lastRealIdx >= 0 && lastRealFlow === lastRealFlow) {
				// End of a stretch of blank flow cells: the same rule as missing rows, the higher
				// adjacent real reading over the whole stretch. Fuel used so far counted the held
				// reading; this segment takes the difference, and the samples inside are rewritten.
				const fill = f > lastRealFlow ? f : lastRealFlow;
				inc = (fill * (ti - lastRealT) - lastRealFlow * (lastT - lastRealT)) / 3600;
				const extraLph = fill - lastRealFlow;
				for (let j = lastRealIdx + 1; j < i; j++) {
					if (oFlags[j] & K_FLAG_REJECTED) {
						// A skipped sample carries the totals of the one before it.
						oUsed[j] = oUsed[j - 1];
						oOnBoard[j] = oOnBoard[j - 1];
						continue;
					}
					const extra = (extraLph * (t[j] - lastRealT)) / 3600;
					const ob = oOnBoard[j] - extra;
					oFlow[j] = fill;
					oUsed[j] += extra;
					oOnBoard[j] = ob;
					oEndurance[j] = kEnduranceH(ob, fill, minFlow);
					const fuelJ = fill * oTime[j];
					oFuel[j] = fuelJ;
					const arr = ob - fuelJ;
					oArrival[j] = arr;
					oMarginMin[j] = ((arr - oReserveL[j]) / oCruise[j]) * 60;
					oArrivalState[j] = arrivalCode(arr, oReserveL[j]);
					oFlags[j] = (oFlags[j] & ~K_FLAG_FLOW_HELD) | K_FLAG_FLOW_FILLED;
					if (extraLph > 0) phaseFuel[oPhase[j]] += (extraLph * (t[j] - t[j - 1])) / 3600;
				}
				if (ti - lastRealT > threshold)
					s.gaps.push({ kind: 'flow', start: lastRealT, end: ti, startIndex: lastRealIdx, endIndex: i, filledFlowLph: fill });
			}
			usedTotal += inc;
			// The segment belongs to the sample's phase, except the last stretch before the engine
			// stops, which belongs to the phase it ended.
			const seg = p <= K_PHASE_STOPPED && lastPhase > p ? lastPhase : p;
			phaseTime[seg] += dt;
			phaseFuel[seg] += inc;
			// Distance bridges blank ground-speed cells and missing rows alike: the trapezoid
			// between the adjacent real readings.
			if (g === g && lastRealGs === lastRealGs) {
				const dd = ((g + lastRealGs) * (ti - lastRealGsT)) / 7200;
				distance += dd;
				phaseDist[seg] += dd;
			}
			moving += ((lastGs >= minGs ? 0.5 : 0) + (g >= minGs ? 0.5 : 0)) * dt;
			if (lastFlow > minFlow || f > minFlow) engineTime += dt;
		} else {
			st.firstT = ti;
		}

		while (ti >= nextEventT) {
			const ev = events[eventIdx++];
			nextEventT = eventIdx < nEv ? events[eventIdx].t : Infinity;
			const before = anchorOnBoard - (usedTotal - anchorUsed);
			flags |= K_FLAG_EVENT;
			if (ev.kind === 'resetUsed') {
				s.resolvedEvents.push({
					event: ev,
					index: i,
					deltaL: 0,
					onBoardBeforeL: before,
					onBoardAfterL: before,
					usedBeforeL: usedTotal - usedOffset
				});
				usedOffset = usedTotal;
			} else {
				const r = kEventDelta(ev, before, profile, s.setup.options.formatFuel);
				if (r.warning) s.warnings.push({ ...r.warning, index: i });
				anchorOnBoard = r.afterL;
				anchorUsed = usedTotal;
				s.resolvedEvents.push({
					event: ev,
					index: i,
					deltaL: r.deltaL,
					onBoardBeforeL: before,
					onBoardAfterL: r.afterL,
					usedBeforeL: usedTotal - usedOffset
				});
			}
		}

		const ob = anchorOnBoard - (usedTotal - anchorUsed);
		oFlow[i] = f;
		oUsed[i] = usedTotal - usedOffset;
		oOnBoard[i] = ob;
		if (ob < 0 && !belowZeroWarned) {
			belowZeroWarned = true;
			s.warnings.push({
				code: 'onBoardBelowZero',
				message:
					'Computed fuel on board went below zero: the declared starting fuel or the meter factor is probably wrong.',
				index: i,
				t: ti
			});
		}

		const endurance = kEnduranceH(ob, f, minFlow);
		oEndurance[i] = endurance;
		if (f > minFlow) {
			flags |= K_FLAG_ENDURANCE;
			if (f > maxFlow) maxFlow = f;
			if (firstRunT !== firstRunT) firstRunT = ti;
			lastRunT = ti;
			lastRunIdx = i;
			lastRunOnBoard = ob;
			lastRunFlow = f;
		}
		if (g >= minGs) {
			if (firstMoveT !== firstMoveT) firstMoveT = ti;
			lastMoveT = ti;
		}

		// The normal-cruise flow in force, with the precedence of reserve.ts normalCruiseFlow():
		// set baseline, else this flight's cruise so far (once long enough), else recent flights.
		let cruise: number;
		let basis: number;
		const cruiseTime = phaseTime[K_PHASE_CRUISE];
		if (baseline === baseline) {
			cruise = baseline;
			basis = K_BASIS_BASELINE;
		} else if (cruiseTime >= K_MIN_MEASURED_CRUISE_S && phaseFuel[K_PHASE_CRUISE] > 0) {
			cruise = (phaseFuel[K_PHASE_CRUISE] / cruiseTime) * 3600;
			basis = K_BASIS_MEASURED;
		} else if (recent === recent) {
			cruise = recent;
			basis = K_BASIS_RECENT;
		} else {
			cruise = NaN;
			basis = K_BASIS_NONE;
		}
		// The one reserve amount every statement compares fuel against.
		const reserveL = (reserveMin / 60) * cruise;
		oReserveL[i] = reserveL;
		oCruise[i] = cruise;
		oBasis[i] = basis;
		if (ob < reserveL && st.reserveReachedIndex < 0) {
			st.reserveReachedIndex = i;
			st.reserveReachedT = ti;
		}

		// No waypoint figures on the ground (a taxi or take-off roll would divide by a low speed)
		// nor below the waypoint ground speed: NaN by construction, never Infinity.
		const onGround = p === K_PHASE_TAXI || p === K_PHASE_STOPPED;
		const airborne = p >= K_PHASE_CLIMB && g >= airborneGs;
		const hours = onGround ? NaN : kTimeToWaypointH(d, g, wptGs);
		const fuel = kFuelToWaypointL(f, hours);
		const arrival = ob - fuel;
		const marginL = arrival - reserveL;
		oTime[i] = hours;
		oFuel[i] = fuel;
		oArrival[i] = arrival;
		oMarginMin[i] = (marginL / cruise) * 60;
		// arrivalCode() written out: one more call per sample would push trackPhase and friends out
		// of V8's inlining budget (see phases.ts). properties.test.ts checks the two agree.
		oArrivalState[i] =
			arrival !== arrival
				? K_ARRIVAL_NONE
				: arrival < 0
					? K_ARRIVAL_RUNS_OUT
					: reserveL !== reserveL
						? K_ARRIVAL_NO_RESERVE
						: arrival >= reserveL
							? K_ARRIVAL_KEEPS
							: K_ARRIVAL_EATS_INTO;
		oRange[i] = kSpecificRangeNmPerL(g, f, wptGs, minFlow);
		if (arrival === arrival) flags |= K_FLAG_WAYPOINT;
		if (airborne) {
			st.airborne = true;
			if (marginL >= thinnest) {
				// A window holding this sample cannot hold less than the thinnest so far: start the
				// next window after it (exact, and it keeps the queue empty most of the flight).
				if (win.runStart === win.runStart) kResetTrailingMax(win);
			} else if (marginL === marginL) {
				const kept = kPushTrailingMax(win, ti, marginL);
				if (kept < thinnest) {
					thinnest = kept;
					st.thinnestMarginMin = (kept / cruise) * 60;
					st.thinnestMarginT = ti;
					st.thinnestMarginIndex = i;
					const w = wpt !== undefined ? wpt[i] : K_WPT_NONE;
					st.thinnestMarginWpt = w === K_WPT_NONE ? null : w;
				}
			} else if (win.runStart === win.runStart) kResetTrailingMax(win);
		} else if (win.runStart === win.runStart) kResetTrailingMax(win);

		// The values alarms judge: endurance at the flow of alarms.ts enduranceJudgeFlow() (written
		// out for the same inlining reason; properties.test.ts checks they agree); the arrival
		// margin against the reserve (against empty tanks when there is no reserve), airborne only.
		const judgeFlow = !(f > minFlow)
			? NaN
			: cruise !== cruise
				? p === K_PHASE_CLIMB
					? NaN
					: f
				: p === K_PHASE_CLIMB || cruise > f
					? cruise
					: f;
		const enduranceMin = (ob / judgeFlow) * 60;
		const arrivalValue = airborne ? (reserveL === reserveL ? marginL : arrival) : NaN;
		// Most samples are nowhere near an alarm: one compare each before the full update.
		if (alarmBits !== 0 || pendingBelow || ob < fuelThreshold || enduranceMin < enduranceThreshold || arrivalValue < arrivalThreshold) {
			alarmBits =
				kUpdateAlarm(alarmFuel, ob, ti, i, episodes) |
				kUpdateAlarm(alarmEndurance, enduranceMin, ti, i, episodes) |
				kUpdateAlarm(alarmArrival, arrivalValue, ti, i, episodes);
			pendingBelow =
				alarmFuel.belowSince === alarmFuel.belowSince ||
				alarmEndurance.belowSince === alarmEndurance.belowSince ||
				alarmArrival.belowSince === alarmArrival.belowSince;
		}

		oPhase[i] = p;
		oAlarm[i] = alarmBits;
		oFlags[i] = flags;

		accepted++;
		lastT = ti;
		lastIdx = i;
		lastFlow = f;
		lastGs = g;
		lastPhase = p;
		if (g === g) {
			lastRealGs = g;
			lastRealGsT = ti;
		}
		if (rawFlow === rawFlow) {
			lastRealT = ti;
			lastRealIdx = i;
			lastRealFlow = f;
			held = false;
		} else held = true;
	}

	s.lastT = lastT;
	s.lastIdx = lastIdx;
	s.lastFlow = lastFlow;
	s.lastGs = lastGs;
	s.lastPhase = lastPhase;
	s.lastRealFlowT = lastRealT;
	s.lastRealFlowIdx = lastRealIdx;
	s.lastRealFlow = lastRealFlow;
	s.lastRealGs = lastRealGs;
	s.lastRealGsT = lastRealGsT;
	s.flowHeld = held;
	s.usedTotal = usedTotal;
	s.usedOffset = usedOffset;
	s.anchorOnBoard = anchorOnBoard;
	s.anchorUsed = anchorUsed;
	s.eventIdx = eventIdx;
	s.alarmBits = alarmBits;
	s.belowZeroWarned = belowZeroWarned;
	st.acceptedCount = accepted;
	st.lastT = lastT;
	st.lastIndex = lastIdx;
	st.usedTotalL = usedTotal;
	st.engineTimeS = engineTime;
	st.movingTimeS = moving;
	st.distanceNm = distance;
	st.maxFlowLph = maxFlow;
	st.firstRunT = firstRunT;
	st.lastRunT = lastRunT;
	st.lastRunIndex = lastRunIdx;
	st.lastRunOnBoardL = lastRunOnBoard;
	st.lastRunFlowLph = lastRunFlow;
	st.firstMoveT = firstMoveT;
	st.lastMoveT = lastMoveT;
	st.thinnestMarginL = thinnest;
}

/** ARRIVAL_* code from the fuel left on arrival and the reserve amount (either may be NaN). */
export function arrivalCode(arrivalL: number, reserveL: number): number {
	if (arrivalL !== arrivalL) return K_ARRIVAL_NONE;
	if (arrivalL < 0) return K_ARRIVAL_RUNS_OUT;
	if (reserveL !== reserveL) return K_ARRIVAL_NO_RESERVE;
	return arrivalL >= reserveL ? K_ARRIVAL_KEEPS : K_ARRIVAL_EATS_INTO;
}

function view<T extends Float64Array | Uint8Array>(a: T, n: number): T {
	return (a.length === n ? a : a.subarray(0, n)) as T;
}

/**
 * The computation so far as a FlightComputation. Arrays are views on the state's buffers (valid
 * until the next live append); lists and stats are copies.
 */
export function snapshot(s: EngineState, out: Outputs, n: number, extraWarnings: readonly EngineWarning[] = []): FlightComputation {
	const setup = s.setup;
	const pending: ResolvedEvent[] = [];
	const pendingWarnings: EngineWarning[] = [];
	const onBoardNow = s.anchorOnBoard - (s.usedTotal - s.anchorUsed);
	for (let k = s.eventIdx; k < setup.events.length; k++) {
		const ev = setup.events[k];
		pending.push({
			event: ev,
			index: -1,
			deltaL: 0,
			onBoardBeforeL: onBoardNow,
			onBoardAfterL: onBoardNow,
			usedBeforeL: s.usedTotal - s.usedOffset
		});
		pendingWarnings.push({
			code: 'eventAfterLastSample',
			message: `Fuel event (${ev.kind}) is later than the last sample; not applied yet.`,
			t: ev.t
		});
	}
	const st = s.stats;
	const thinnest = st.thinnestMarginIndex >= 0;
	const cruiseTimeS = st.phaseTimeS[PHASE_CRUISE];
	const cruiseFuelL = st.phaseFuelL[PHASE_CRUISE];
	return {
		length: n,
		flow: view(out.flow, n),
		used: view(out.used, n),
		onBoard: view(out.onBoard, n),
		endurance: view(out.endurance, n),
		timeToWpt: view(out.timeToWpt, n),
		fuelToWpt: view(out.fuelToWpt, n),
		arrivalL: view(out.arrivalL, n),
		arrivalMarginMin: view(out.arrivalMarginMin, n),
		specificRange: view(out.specificRange, n),
		reserveL: view(out.reserveL, n),
		cruiseFlow: view(out.cruiseFlow, n),
		phase: view(out.phase, n),
		alarmState: view(out.alarmState, n),
		flags: view(out.flags, n),
		arrivalState: view(out.arrivalState, n),
		reserveBasis: view(out.reserveBasis, n),
		alarms: s.alarms.map((e) => ({ ...e })),
		gaps: s.gaps.slice(),
		problems: s.problems.slice(),
		warnings: [...setup.warnings, ...extraWarnings, ...s.warnings, ...pendingWarnings],
		declaration: setup.declaration,
		events: [...s.resolvedEvents, ...pending],
		stats: {
			...st,
			thinnestMarginL: thinnest ? st.thinnestMarginL : NaN,
			cruiseTimeS,
			cruiseFuelL,
			phaseTimeS: st.phaseTimeS.slice(),
			phaseFuelL: st.phaseFuelL.slice(),
			phaseDistanceNm: st.phaseDistanceNm.slice()
		},
		profile: setup.profile,
		reserve: setup.reserve
			? reserveAmount(setup.reserve, setup.profile.baselineCruiseFlowLph, { timeS: cruiseTimeS, fuelL: cruiseFuelL }, setup.recentCruiseLph)
			: null,
		gapThresholdS: s.gap.thresholdS
	};
}
