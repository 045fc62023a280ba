// The shapes the fuel engine reads and writes: sample columns, aircraft fuel profile,
// declarations, events, thresholds, and the per-sample result arrays.
// Units throughout: seconds (epoch UTC), litres, litres per hour, knots, NM, feet.

import type { ReserveAmount, ReserveSetting } from './reserve';

/**
 * Recorder samples as columns. NaN in any cell means "not recorded in this sample" (a blank cell);
 * gs or dtg NaN means no waypoint figures for that sample.
 */
export interface SampleColumns {
	/** Epoch seconds UTC, fractional allowed, strictly increasing in good data. */
	t: Float64Array;
	/** Fuel flow as indicated, litres per hour (before the meter factor). */
	flow: Float64Array;
	/** Ground speed, knots. */
	gs: Float64Array;
	/** Distance to go to the next waypoint, NM. */
	dtg: Float64Array;
	/** Altitude, feet. */
	alt?: Float64Array;
	/** Waypoint id of the leg being flown; any integer is an id except WPT_NONE. */
	wpt?: Int32Array;
	/**
	 * Position, decimal degrees (WGS 84; north and east positive), both or neither: NaN in both
	 * where a sample has none. The engine computes nothing from them; they travel with the samples
	 * so the pages can draw the track on the same index as every figure.
	 */
	lat?: Float64Array;
	lon?: Float64Array;
}

/** The waypoint id that means "no waypoint" (the smallest Int32). */
export const WPT_NONE = -2147483648;

/**
 * One aircraft's fuel system. All amounts are usable fuel: the engine never counts unusable
 * fuel as on board (unusableL is kept so a total reading can be turned into usable fuel).
 */
export interface FuelProfile {
	/** Usable fuel with the tanks full, litres. */
	capacityL: number;
	/** Usable fuel at the lower fill level (tabs), litres; null when the aircraft has none. */
	lowerLevelL: number | null;
	/** Unusable fuel, litres. */
	unusableL: number;
	/** Fuel density, kg per litre, for mass units. */
	densityKgPerL: number;
	/** Actual volume ÷ indicated volume, applied to every flow reading (1 = no correction). */
	meterFactor: number;
	/** The aircraft's normal-cruise flow in L/h, set by the owner: the reserve's first basis. */
	baselineCruiseFlowLph?: number | null;
}

/** A profile checked by checkProfile(); capacity is Infinity when the stored one was unusable. */
export interface UsableProfile {
	capacityL: number;
	lowerLevelL: number | null;
	meterFactor: number;
	baselineCruiseFlowLph: number | null;
}

/** What the pilot says is on board at engine start. added/removed are relative to previousOnBoardL. */
export type Declaration =
	| { kind: 'onBoard'; amountL: number }
	| { kind: 'full' }
	| { kind: 'lower' }
	| { kind: 'added'; amountL: number }
	| { kind: 'removed'; amountL: number };

/** Every fuel event kind: the one list the schema's enum, the forms and the words take. */
export const FUEL_EVENT_KINDS = ['added', 'removed', 'toFull', 'toLower', 'resetUsed'] as const;
export type FuelEventKind = (typeof FUEL_EVENT_KINDS)[number];

/** Something that changes fuel on board (or resets fuel used) at a time during the trip. */
export interface FuelEvent {
	t: number;
	kind: FuelEventKind;
	/** Litres, for added and removed. */
	amountL?: number;
	note?: string;
}

/** When to raise alarms. null switches an alarm off. */
export interface AlarmThresholds {
	/** Raise when fuel on board drops below this many litres. */
	lowFuelL: number | null;
	/**
	 * Raise when endurance drops below this many minutes, judged at the higher of normal-cruise and
	 * present flow, and at normal-cruise flow in a climb (see alarms.ts).
	 */
	lowEnduranceMin: number | null;
	/** Raise when the fuel left on arrival at the next waypoint is below the reserve amount (default on). */
	arrivalBelowReserve?: boolean;
	/** How far a value must come back above the threshold to clear (defaults in alarms.ts). */
	hysteresis?: { fuelL?: number; enduranceMin?: number; arrivalL?: number };
	/** How long (s) a value must stay below its threshold before the alarm is raised (defaults in alarms.ts). */
	persistS?: { fuel?: number; endurance?: number; arrival?: number };
}

/** Tuning for the engine's data checks and detectors; every field has a default. */
export interface EngineOptions {
	/** Below this flow (L/h, after the meter factor) the engine counts as stopped. Default 0.5. */
	minFlowLph?: number;
	/** Below this ground speed (kt) the aircraft counts as standing still. Default 3. */
	minGsKt?: number;
	/** At or above this ground speed (kt) the aircraft counts as airborne. Default 40. */
	airborneGsKt?: number;
	/**
	 * Below this ground speed (kt) there are no waypoint figures or specific range: on the ground
	 * they would divide by a taxi speed. Default: airborneGsKt.
	 */
	waypointMinGsKt?: number;
	/** Fixed gap threshold in seconds; by default max(gapFloorS, gapFactor × median interval). */
	gapThresholdS?: number;
	gapFloorS?: number;
	gapFactor?: number;
	/** Rows above these limits are rejected as absurd. */
	maxFlowLph?: number;
	maxGsKt?: number;
	maxDtgNm?: number;
	minAltFt?: number;
	maxAltFt?: number;
	/** A new phase must hold this long (s) before the phase changes. Default 10. */
	phaseHoldS?: number;
	/** Writes an amount of fuel in warning messages, e.g. in the unit on screen. Default "12.3 L". */
	formatFuel?: (litres: number) => string;
}

/** Everything a batch computation needs. */
export interface FlightInput {
	columns: SampleColumns;
	profile: FuelProfile;
	declaration: Declaration;
	/** Fuel on board at the end of the previous flight, for 'added' and 'removed'. */
	previousOnBoardL?: number | null;
	events?: readonly FuelEvent[];
	thresholds?: AlarmThresholds;
	/** The reserve rule in force (the aircraft's); without it there is no reserve amount. */
	reserve?: ReserveSetting | null;
	/**
	 * The aircraft's recent median cruise flow, L/h, from its stored flights: the reserve's basis
	 * when no normal-cruise flow is set and this flight has not measured its own cruise yet.
	 */
	recentCruiseFlowLph?: number | null;
	options?: EngineOptions;
}

export type WarningCode =
	| 'declarationAboveCapacity'
	| 'declarationBelowZero'
	| 'declarationInvalidAmount'
	| 'noPreviousOnBoard'
	| 'noLowerLevel'
	| 'alreadyAboveLevel'
	| 'eventAboveCapacity'
	| 'eventBelowZero'
	| 'eventInvalid'
	| 'eventAfterLastSample'
	| 'onBoardBelowZero'
	| 'invalidProfile'
	| 'columnLengthMismatch';

/** Something the UI should tell the user; the computation still went ahead. */
export interface EngineWarning {
	code: WarningCode;
	message: string;
	index?: number;
	t?: number;
}

export type ProblemField = 't' | 'flow' | 'gs' | 'dtg' | 'alt';
export type ProblemReason = 'missingTime' | 'repeatedTime' | 'backwardTime' | 'negative' | 'absurd';

/** A row the engine skipped, for the parser to reject with line and field. */
export interface DataProblem {
	index: number;
	field: ProblemField;
	reason: ProblemReason;
	value: number;
	message: string;
}

/**
 * A stretch with no flow readings, filled with the higher of the two adjacent real readings
 * (filledFlowLph is the very value used for fuel used). 'time': no samples for longer than the
 * threshold. 'flow': samples kept coming with the flow cell blank.
 */
export interface DataGap {
	kind: 'time' | 'flow';
	start: number;
	end: number;
	startIndex: number;
	endIndex: number;
	filledFlowLph: number;
}

/** Every alarm kind, in the order of the ALARM_* bits; the schema's enum takes this list. */
export const alarmKinds = ['lowFuel', 'lowEndurance', 'arrivalBelowReserve'] as const;
export type AlarmKind = (typeof alarmKinds)[number];

/** One crossing of an alarm threshold, from raised to cleared. */
export interface AlarmEpisode {
	/** Stable within a computation, for acknowledging: kind@raisedIndex. */
	id: string;
	kind: AlarmKind;
	/** When the value had stayed below the threshold long enough (the persistence) to raise. */
	raisedAt: number;
	raisedIndex: number;
	/** When the value first went below the threshold in this episode. */
	belowSince: number;
	clearedAt: number | null;
	clearedIndex: number | null;
	/** Value when raised: litres (low fuel), minutes (low endurance), litres of margin (arrival). */
	value: number;
	/** Lowest value while raised. */
	worst: number;
	threshold: number;
}

export interface ResolvedDeclaration {
	declaration: Declaration;
	onBoardL: number;
	warnings: EngineWarning[];
}

/** A fuel event as applied: where it landed and what it changed. */
export interface ResolvedEvent {
	event: FuelEvent;
	/** Sample it was applied at; -1 while no sample at or after its time exists. */
	index: number;
	/** Change in fuel on board, litres. */
	deltaL: number;
	onBoardBeforeL: number;
	onBoardAfterL: number;
	/** For resetUsed: fuel used shown just before the reset. */
	usedBeforeL: number;
}

/** Per-sample flag bits (Uint8Array flags). */
export const FLAG_REJECTED = 1;
export const FLAG_GAP_FILLED = 2;
export const FLAG_FLOW_HELD = 4;
export const FLAG_EVENT = 8;
export const FLAG_WAYPOINT = 16;
export const FLAG_ENDURANCE = 32;
/** The flow of this sample was filled across a stretch of blank flow cells. */
export const FLAG_FLOW_FILLED = 64;

/** Per-sample alarm bits (Uint8Array alarmState). */
export const ALARM_LOW_FUEL = 1;
export const ALARM_LOW_ENDURANCE = 2;
export const ALARM_ARRIVAL_BELOW_RESERVE = 4;

/** Per-sample arrival at the next waypoint (Uint8Array arrivalState). */
export const ARRIVAL_NONE = 0;
/** Arrives with at least the reserve amount. */
export const ARRIVAL_KEEPS = 1;
/** Arrives, but with less than the reserve amount. */
export const ARRIVAL_EATS_INTO = 2;
/** The fuel runs out before the waypoint. */
export const ARRIVAL_RUNS_OUT = 3;
/** Arrives with fuel left, but there is no reserve amount to compare with. */
export const ARRIVAL_NO_RESERVE = 4;

/** Running totals kept during the pass, from which the summary is built. */
export interface FlightStats {
	acceptedCount: number;
	firstT: number;
	lastT: number;
	lastIndex: number;
	usedTotalL: number;
	engineTimeS: number;
	firstRunT: number;
	lastRunT: number;
	lastRunIndex: number;
	/** Fuel on board and flow at the last sample with the engine running. */
	lastRunOnBoardL: number;
	lastRunFlowLph: number;
	movingTimeS: number;
	firstMoveT: number;
	lastMoveT: number;
	distanceNm: number;
	maxFlowLph: number;
	/** Indexed by phase code. */
	phaseTimeS: Float64Array;
	phaseFuelL: Float64Array;
	phaseDistanceNm: Float64Array;
	/**
	 * The thinnest arrival margin (fuel left on arrival − reserve amount) that held for the
	 * persistence time while airborne: the minimum over the flight of the margin's maximum over
	 * each trailing window, so a take-off roll projection or a gust never sets it.
	 */
	thinnestMarginL: number;
	thinnestMarginMin: number;
	thinnestMarginT: number;
	thinnestMarginIndex: number;
	thinnestMarginWpt: number | null;
	/** First sample where fuel on board was below the reserve amount in force; -1 if never. */
	reserveReachedIndex: number;
	reserveReachedT: number;
	/** This flight's cruise so far, for the measured normal-cruise flow. */
	cruiseTimeS: number;
	cruiseFuelL: number;
	/** Whether the aircraft was airborne (a flight phase at airborne ground speed) at any sample. */
	airborne: boolean;
}

/** The engine's answer: one value per input sample in each array, plus the timeline lists. */
export interface FlightComputation {
	length: number;
	/** Flow used for the figures, L/h: after the meter factor, blanks held. NaN before any reading. */
	flow: Float64Array;
	/** Fuel used since engine start (or the last resetUsed), litres. */
	used: Float64Array;
	onBoard: Float64Array;
	/** Hours at the current flow; NaN when the engine is stopped. */
	endurance: Float64Array;
	/** Hours; NaN without waypoint figures. */
	timeToWpt: Float64Array;
	fuelToWpt: Float64Array;
	/** Fuel left on arrival at the next waypoint at the present flow, litres; NaN without waypoint figures. */
	arrivalL: Float64Array;
	/** (arrivalL − reserveL) in minutes at the normal-cruise flow; NaN without either. */
	arrivalMarginMin: Float64Array;
	/** The reserve amount in force at this sample, litres: rule minutes × normal-cruise flow; NaN without one. */
	reserveL: Float64Array;
	/** The normal-cruise flow in force at this sample, L/h; NaN without one. */
	cruiseFlow: Float64Array;
	/** ARRIVAL_* code per sample. */
	arrivalState: Uint8Array;
	/** Basis of cruiseFlow per sample: an index into cruiseBasisCodes. */
	reserveBasis: Uint8Array;
	/** NM per litre; NaN on the ground or with the engine stopped. */
	specificRange: Float64Array;
	phase: Uint8Array;
	alarmState: Uint8Array;
	flags: Uint8Array;
	alarms: AlarmEpisode[];
	gaps: DataGap[];
	problems: DataProblem[];
	warnings: EngineWarning[];
	declaration: ResolvedDeclaration;
	events: ResolvedEvent[];
	stats: FlightStats;
	profile: UsableProfile;
	/** The reserve amount in force at the last sample (the whole flight's, in a batch run). */
	reserve: ReserveAmount | null;
	/** The gap threshold in force at the end, seconds. */
	gapThresholdS: number;
}
