// The fuel engine: every fuel figure Burndown shows, computed from recorder samples. Pure
// TypeScript with no I/O, so the same code runs on the server and in the browser.
//
// Map of the modules:
//   types.ts        input columns, profile, declarations, events, thresholds, result shapes
//   columns.ts      ColumnBuilder: stored or received sample rows → input columns (every path)
//   compute.ts      computeFlight(): batch run over a whole flight
//   live.ts         createLiveComputation(): incremental run for a flight in progress
//   engine.ts       the single pass both of them run (runKernel: the stages in order, block by
//                   block), its running state, the setup checked once, and the result snapshot
//   stages/         the pass's named stages, one module each, in the order they run:
//     accept.ts     row checks, flow reading (meter factor, blank held)
//     phase.ts      phase of every accepted sample
//     burn.ts       fuel used, dropouts, blank-flow stretch ends, per-phase totals, cruise flow
//     on-board.ts   fuel events, fuel on board and used, endurance, engine-running figures
//     arrival.ts    reserve amount, waypoint figures, arrival state (and arrivalCode)
//     margin.ts     thinnest airborne margin that held
//     alarm.ts      alarm values and episodes
//     refill.ts     blank-flow stretches rewritten at the fill flow
//   declaration.ts  start-of-flight declaration → litres on board; profile checks
//   events.ts       fuel added/removed/filled and "used" resets on the timeline
//   integrate.ts    fuel used between two samples (trapezoid; higher flow across a dropout)
//   gaps.ts         when the time between samples is a dropout
//   validate.ts     row checks: time order, negative and absurd values
//   waypoint.ts     endurance, time/fuel to the next waypoint, specific range
//   window.ts       largest value over a trailing time window (margins that held)
//   phases.ts       stopped / taxi / climb / cruise / descent
//   alarms.ts       low fuel, low endurance, arrival below the reserve: persistence, hysteresis
//   reserve.ts      legal reserve rules as data, the normal-cruise flow and the reserve amount
//   summary.ts      summarize(): the flight summary for the debrief
//   calibration.ts  meter factor and K-factor from a fill-up
//   reconcile.ts    fill-up-to-fill-up windows: fuel computed over the flights in between against fuel pumped
//   plan.ts         a fuel plan worked out: time and fuel per leg, on board at each waypoint, reserve
//   geo.ts          great-circle distance between two positions (plan legs from a route)
//   passage.ts      when each waypoint was passed, from the recorder's waypoint id and distance to go
//   plan-actual.ts  planned against actual per leg, and the legs off plan beyond a tolerance
//   baseline.ts     an aircraft's usual flow per phase (median and MAD over its recent flights)
//   high-burn.ts    a flight's phases against that baseline: marks, extra fuel, possible causes
//   compare.ts      flights on a common clock since engine start, per-phase differences
//   leaning.ts      leaning moments: a clear step down in cruise flow at steady speed and altitude
// Unit constants and conversions live beside this folder in $lib/units.ts.

export * from './types';
export { ColumnBuilder } from './columns';
export { computeFlight, columnLength } from './compute';
export { createLiveComputation, type LiveComputation, type LiveInit } from './live';
export { DEFAULT_OPTIONS } from './engine';
export { checkProfile, resolveDeclaration } from './declaration';
export { eventDelta, normalizeEvents } from './events';
export { segmentLitres, gapFillFlow } from './integrate';
export { DEFAULT_GAP_FACTOR, DEFAULT_GAP_FLOOR_S, MEDIAN_INTERVALS } from './gaps';
export { DEFAULT_LIMITS } from './validate';
export {
	enduranceH,
	fuelToWaypointL,
	minutesAtFlow,
	specificRangeNmPerL,
	timeToWaypointH
} from './waypoint';
export {
	PHASE_CLIMB,
	PHASE_COUNT,
	PHASE_CRUISE,
	PHASE_DESCENT,
	PHASE_NAMES,
	PHASE_STOPPED,
	PHASE_TAXI,
	PHASE_UNKNOWN,
	phaseNames,
	type PhaseName
} from './phases';
export { DEFAULT_HYSTERESIS, DEFAULT_PERSIST_S, enduranceJudgeFlow } from './alarms';
export { arrivalCode } from './stages/arrival';
export {
	MIN_MEASURED_CRUISE_S,
	RESERVE_CAUTION,
	cruiseBasisCodes,
	normalCruiseFlow,
	reserveAmount,
	reserveMinutesOf,
	type CruiseBasis,
	reserveRule,
	reserveRules,
	RESERVE_RULE_IDS,
	type ReserveAmount,
	type ReserveRule,
	type ReserveRuleId,
	type ReserveSetting
} from './reserve';
export { summarize, verdictStates, type FlightSummary, type FlightVerdict, type PhaseSummary, type VerdictState } from './summary';
export {
	MIN_RELIABLE_INDICATED_L,
	PLAUSIBLE_CORRECTION_PERCENT,
	calibrate,
	type CalibrationInput,
	type CalibrationResult
} from './calibration';
export {
	BELOW_PUMPED_WINDOWS,
	belowPumpedRatio,
	factorsToApply,
	reconcile,
	type ApplyAs,
	type Factors,
	type ReconcileFlight,
	type ReconcileReceipt,
	type ReconciliationWindow
} from './reconcile';
export {
	legDistanceNm,
	legFuelL,
	legTimeH,
	workPlan,
	type FuelPlanInput,
	type PlanLeg,
	type PlannedLeg,
	type WorkedPlan
} from './plan';
export { greatCircleNm } from './geo';
export { findPassages, type WaypointPassage } from './passage';
export {
	DEFAULT_TOLERANCE_PERCENT,
	OFF_PLAN_WORDS,
	comparePlan,
	type ActualInput,
	type LegComparison,
	type PlanComparison
} from './plan-actual';
export {
	BASELINE_PHASES,
	DEFAULT_BASELINE_FLIGHTS,
	MAD_SCALE,
	MIN_BASELINE_FLIGHTS,
	MIN_PHASE_S,
	learnBaseline,
	median,
	medianAbsoluteDeviation,
	type Baseline,
	type BaselineFlight,
	type BaselinePhase,
	type PhaseBaseline,
	type PhaseFigures
} from './baseline';
export {
	DEFAULT_HIGH_BURN_PERCENT,
	HIGH_BURN_CAUSES,
	findHighBurn,
	type HighBurnCause,
	type HighBurnOptions,
	type HighBurnResult,
	type PhaseComparison
} from './high-burn';
export { findLeaningMoments, type LeaningInput, type LeaningMoment } from './leaning';
export {
	COMPARE_MAX_POINTS,
	alignSinceEngineStart,
	compareStepS,
	phaseDifferences,
	type AlignedSeries,
	type PhaseDifference
} from './compare';
