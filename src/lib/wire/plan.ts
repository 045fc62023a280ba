// What crosses the network about fuel plans and debriefs: the stored plan as the pages and the
// API send it (canonical units), and the lists of values the schema, the forms and the UI share.
import type { FlightSummary, LeaningMoment, PlanLeg, ReserveRuleId } from '$lib/fuel';
import type { PlanReport } from '$lib/plan-report';

/** A stored fuel plan, canonical units (litres, L/h, NM, kt, minutes). */
export interface FuelPlanWire {
	id: string;
	flightId: string | null;
	startOnBoardL: number;
	taxiL: number;
	climbL: number;
	reserveRule: ReserveRuleId;
	reserveCustomMin: number | null;
	reserveFlowLph: number | null;
	tolerancePercent: number;
	legs: PlanLeg[];
	/** Set on a plan made before the flight: when its aircraft is expected to start (ISO). */
	expectedDepartureAt: string | null;
	/** Who is to fly it (a plan made before the flight). */
	pilotId: string | null;
	updatedAt: string;
}

/**
 * How far from its expected departure a flight may start and still take a waiting plan, either
 * way (our choice: a morning's delay, not the next day's flight). Shared by the server's
 * attaching and the page that explains it.
 */
export const WAITING_PLAN_WINDOW_H = 3;
export const WAITING_PLAN_WINDOW_MS = WAITING_PLAN_WINDOW_H * 3600 * 1000;

/** A plan waiting for its flight, as the instructor's list shows it. */
export interface WaitingPlanView {
	id: string;
	aircraftId: string;
	registration: string;
	expectedDepartureAt: Date;
	pilot: string | null;
	createdBy: string | null;
	/** Waypoint ids in order. */
	route: string[];
	/** The window has closed with no flight: it will never attach by itself. */
	windowPassed: boolean;
}

/** A debrief's life: written by the instructor, then published to the student. */
export const DEBRIEF_STATUSES = ['draft', 'published'] as const;
export type DebriefStatus = (typeof DEBRIEF_STATUSES)[number];

/** Where a plan's legs can come from besides the form. */
export const PLAN_IMPORT_FORMATS = ['csv', 'gpx'] as const;
export type PlanImportFormat = (typeof PLAN_IMPORT_FORMATS)[number];

export interface DebriefNote {
	id: string;
	t: Date | null;
	body: string;
	author: string | null;
	authorId: string | null;
	createdAt: Date;
	editedAt: Date | null;
}

export interface DebriefView {
	status: DebriefStatus;
	summaryText: string;
	signedOffBy: string | null;
	signedOffAt: Date | null;
	publishedAt: Date | null;
}

export interface DebriefReport {
	flight: { id: string; title: string; startedAt: Date; endedAt: Date | null; pilotId: string | null; pilot: string | null; instructor: string | null };
	aircraft: { registration: string; type: string; displayUnit: string; densityKgPerL: number; reserveRule: ReserveRuleId | null; reserveCustomMin: number | null };
	summary: FlightSummary;
	plan: PlanReport | null;
	/** The plan's route, waypoint ids in order: "CAIRNS – SALTMR – …". */
	route: string | null;
	notes: DebriefNote[];
	/** Where the mixture was leaned in cruise: the engine's leaning moments, as the replay's timeline marks them. */
	leaning: LeaningMoment[];
	debrief: DebriefView;
	/** Fuel on board through the flight, thinned for a printed chart: epoch s and litres. */
	chart: { t: number[]; onBoardL: number[] };
}

