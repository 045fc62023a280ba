// What crosses the network about fuel plans and debriefs: the stored plan as the pages and the
// API send it (canonical units), and the lists of values the schema, the forms and the UI share.
import type { PlanLeg } from '$lib/fuel';
import type { ReserveRuleId } from '$lib/fuel';

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
	updatedAt: string;
}

/** A debrief's life: written by the instructor, then published to the student. */
export const DEBRIEF_STATUSES = ['draft', 'published'] as const;
export type DebriefStatus = (typeof DEBRIEF_STATUSES)[number];

/** Where a plan's legs can come from besides the form. */
export const PLAN_IMPORT_FORMATS = ['csv', 'gpx'] as const;
export type PlanImportFormat = (typeof PLAN_IMPORT_FORMATS)[number];
