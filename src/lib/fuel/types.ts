// The shapes the fuel engine reads and writes: sample columns, aircraft fuel profile,
// declarations, events, thresholds, and the per-sample result arrays.
// Units throughout: seconds (epoch UTC), litres, litres per hour, knots, NM, feet.

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
	/** The aircraft's usual cruise flow in L/h, used for the reserve amount and phase detection. */
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

export type FuelEventKind = 'added' | 'removed' | 'toFull' | 'toLower' | 'resetUsed';

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
	/** Raise when endurance at the current flow drops below this many minutes. */
	lowEnduranceMin: number | null;
	/** Raise when the reserve at the next waypoint goes below zero (default on). */
	negativeReserve?: boolean;
	/** How far a value must come back above the threshold to clear (defaults in alarms.ts). */
	hysteresis?: { fuelL?: number; enduranceMin?: number; reserveL?: number };
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
 * A stretch with no flow readings. 'time': no samples for longer than the threshold, filled with
 * the higher of the two adjacent flows. 'flow': samples kept coming with the flow cell blank,
 * filled with the last reading (a live flight cannot see the next one).
 */
export interface DataGap {
	kind: 'time' | 'flow';
	start: number;
	end: number;
	startIndex: number;
	endIndex: number;
	filledFlowLph: number;
}

export type AlarmKind = 'lowFuel' | 'lowEndurance' | 'negativeReserve';

/** One crossing of an alarm threshold, from raised to cleared. */
export interface AlarmEpisode {
	/** Stable within a computation, for acknowledging: kind@raisedIndex. */
	id: string;
	kind: AlarmKind;
	raisedAt: number;
	raisedIndex: number;
	clearedAt: number | null;
	clearedIndex: number | null;
	/** Value when raised: litres, minutes or litres depending on kind. */
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

/** Per-sample alarm bits (Uint8Array alarmState). */
export const ALARM_LOW_FUEL = 1;
export const ALARM_LOW_ENDURANCE = 2;
export const ALARM_NEGATIVE_RESERVE = 4;

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
	lowestReserveL: number;
	lowestReserveMin: number;
	lowestReserveT: number;
	lowestReserveIndex: number;
	lowestReserveWpt: number | null;
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
	reserveAtWpt: Float64Array;
	reserveAtWptMin: Float64Array;
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
	/** The gap threshold in force at the end, seconds. */
	gapThresholdS: number;
}
