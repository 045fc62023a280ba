// The single pass that turns samples into per-sample fuel state. Batch and live both run it over
// index ranges, carrying every running value in an EngineState, which is why a live flight gives
// exactly the numbers of a replay of the same samples.
//
// The pass is a chain of named stages (stages/), each a plain loop over a block of samples that
// reads the input columns and what earlier stages wrote into the output arrays, and keeps its own
// running values. runKernel runs them in order over blocks of KERNEL_BLOCK samples, so a block's
// arrays are still in the processor's cache when the next stage reads them:
//   1 accept.ts     row checks (bad rows reported and skipped by every later stage); flow reading
//                   × meter factor, a blank cell holding the last reading
//   2 phase.ts      the flight phase (phases.ts)
//   3 burn.ts       fuel used (integrate.ts), dropouts (gaps.ts) and the end of blank-flow stretches;
//                   time, fuel and distance per phase; moving and engine time; normal-cruise flow
//   4 on-board.ts   fuel events, fuel on board and used, endurance, engine-running figures
//   5 arrival.ts    reserve amount, when on board first reaches it, waypoint figures, arrival state
//   6 margin.ts     the thinnest airborne margin that held (window.ts)
//   7 alarm.ts      alarm values and episodes (alarms.ts)
//   8 refill.ts     samples of the blank-flow stretches that ended rewritten at the fill flow
// A stage only reads what stages before it wrote for the same or earlier samples, and stage 8
// only rewrites samples every stage is done with, so the order of blocks does not change a
// single bit: a live append of ten samples is one short block.

import { arrivalPersistS, createAlarmTracks, type AlarmTrack } from './alarms';
import { checkProfile, litresText, resolveDeclaration } from './declaration';
import { normalizeEvents } from './events';
import { createGapTracker, type GapTracker } from './gaps';
import { createPhaseTracker, PHASE_COUNT, PHASE_CRUISE, type PhaseTracker } from './phases';
import { reserveAmount, reserveMinutesOf, type ReserveSetting } from './reserve';
import { acceptStage, createAcceptState, type AcceptState } from './stages/accept';
import { alarmStage } from './stages/alarm';
import { arrivalStage, type ArrivalState } from './stages/arrival';
import { burnStage, createBurnState, type BlankStretch, type BurnState } from './stages/burn';
import { marginStage } from './stages/margin';
import { createOnBoardState, onBoardStage, type OnBoardState } from './stages/on-board';
import { phaseStage } from './stages/phase';
import { refillStage } from './stages/refill';
import type {
	AlarmEpisode,
	AlarmThresholds,
	DataGap,
	DataProblem,
	EngineOptions,
	EngineWarning,
	FlightComputation,
	FlightInput,
	FlightStats,
	FuelEvent,
	ResolvedDeclaration,
	ResolvedEvent,
	SampleColumns,
	UsableProfile
} from './types';
import { createTrailingMax, type TrailingMax } from './window';
import { DEFAULT_LIMITS, type RowLimits } from './validate';

/*
 * The stage modules keep module-level copies of what they use per sample: an imported binding
 * can compile to a getter call (CommonJS interop in tsx and the test runner), which at a million
 * samples costs as much as the arithmetic. Same values, read directly.
 */


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


export const FLOAT_OUTPUTS = [
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
export const BYTE_OUTPUTS = ['phase', 'alarmState', 'flags', 'arrivalState', 'reserveBasis'] as const;

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
	/** The last accepted sample (a live flight applies a later event without recomputing). */
	lastT: number;
	lastIdx: number;
	/** Each stage's own running values (stages/). */
	accept: AcceptState;
	phase: PhaseTracker;
	gap: GapTracker;
	burn: BurnState;
	fuel: OnBoardState;
	arrival: ArrivalState;
	/** The arrival margin held over the persistence time, for the thinnest airborne margin. */
	marginWindow: TrailingMax;
	alarmTracks: [AlarmTrack, AlarmTrack, AlarmTrack];
	alarmBits: number;
	/** Blank-flow stretches that ended in the current block, for stage 8. */
	blankStretches: BlankStretch[];
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
		lastT: NaN,
		lastIdx: -1,
		accept: createAcceptState(),
		phase: createPhaseTracker({
			minFlowLph: o.minFlowLph,
			minGsKt: o.minGsKt,
			airborneGsKt: o.airborneGsKt,
			holdS: o.phaseHoldS,
			// Without a set normal-cruise flow, the aircraft's recent cruise is the next best reference.
			baselineLph: setup.profile.baselineCruiseFlowLph ?? (setup.recentCruiseLph === setup.recentCruiseLph ? setup.recentCruiseLph : null)
		}),
		gap: createGapTracker(o.gapFloorS, o.gapFactor, o.gapThresholdS),
		burn: createBurnState(),
		fuel: createOnBoardState(setup.declaration.onBoardL),
		arrival: { lastIdx: -1 },
		marginWindow: createTrailingMax(arrivalPersistS(setup.thresholds)),
		alarmTracks: createAlarmTracks(setup.thresholds),
		alarmBits: 0,
		blankStretches: [],
		stats: emptyStats(),
		gaps: [],
		problems: [],
		warnings: [],
		alarms: [],
		resolvedEvents: []
	};
}

/** Samples per block: the arrays a block touches (about 170 bytes a sample) stay in L1/L2 cache. */
export const KERNEL_BLOCK = 512;

/**
 * Processes samples [from, to): every stage over one block, then the next block. The state
 * carries every running value, so the next call continues exactly where this one stopped.
 * Nothing is allocated per sample except for rare timeline entries.
 */
export function runKernel(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	for (let b = from; b < to; b += KERNEL_BLOCK) {
		const e = to - b > KERNEL_BLOCK ? b + KERNEL_BLOCK : to;
		acceptStage(s, cols, out, b, e);
		phaseStage(s, cols, out, b, e);
		burnStage(s, cols, out, b, e);
		onBoardStage(s, cols, out, b, e);
		arrivalStage(s, cols, out, b, e);
		marginStage(s, cols, out, b, e);
		alarmStage(s, cols, out, b, e);
		if (s.blankStretches.length > 0) refillStage(s, cols, out);
	}
	s.lastT = s.accept.lastT;
	s.lastIdx = s.accept.lastIdx;
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
	const fb = s.fuel;
	const usedTotal = s.burn.usedTotal;
	const onBoardNow = fb.anchorOnBoard - (usedTotal - fb.anchorUsed);
	for (let k = fb.eventIdx; k < setup.events.length; k++) {
		const ev = setup.events[k];
		pending.push({
			event: ev,
			index: -1,
			deltaL: 0,
			onBoardBeforeL: onBoardNow,
			onBoardAfterL: onBoardNow,
			usedBeforeL: usedTotal - fb.usedOffset
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
