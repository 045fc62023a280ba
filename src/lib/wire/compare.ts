// What the compare page receives: each flight's flow and fuel used on a common clock of time since
// engine start, and the phase-by-phase difference table. Built by server/flights/compare.ts.
import type { PhaseDifference } from '$lib/fuel';
import type { FuelUnit } from '$lib/units';

export interface ComparedFlight {
	id: string;
	title: string;
	registration: string;
	/** The aircraft's fuel unit and density, for showing the figures. */
	displayUnit: FuelUnit;
	densityKgPerL: number;
	pilot: string | null;
	startedAt: Date;
	fuelUsedL: number;
	engineTimeS: number;
	/** The meter factor the flight was computed with. */
	meterFactor: number;
	/** Per step since engine start: mean flow, L/h, and fuel used, L; null where nothing was recorded. */
	flowLph: (number | null)[];
	usedL: (number | null)[];
}

export interface ComparePayload {
	stepS: number;
	flights: ComparedFlight[];
	phases: PhaseDifference[];
}
