// What the fleet view receives: per aircraft, one calendar month's (UTC) hours and fuel from the
// stored per-flight figures, fuel per engine hour against the aircraft's usual band, the flights
// the high-burn finder marks, and the calibration in force with when it was last checked.
import type { BandPosition, UsualBand } from '$lib/fuel';
import type { FuelUnit } from '$lib/units';

export interface FleetMonth {
	/** Closed flights whose engine start falls in the month (those the viewer may see). */
	flights: number;
	engineTimeS: number;
	fuelUsedL: number;
	/** The month's fuel ÷ its engine time, L/h; null without engine time. */
	fuelPerEngineHourLph: number | null;
	/** Flights the high-burn finder marks against the aircraft's baseline. */
	highBurnFlights: number;
}

export interface FleetRow {
	id: string;
	registration: string;
	type: string;
	displayUnit: FuelUnit;
	densityKgPerL: number;
	archived: boolean;
	month: FleetMonth;
	/** The usual band of fuel per engine hour, from the learned baseline; null before enough flights. */
	usual: (UsualBand & { flights: number }) | null;
	/** The month's fuel per engine hour against that band; null when either is missing. */
	position: BandPosition | null;
	/** The factors in force now. */
	meterFactor: number;
	kFactor: number | null;
	/** The newest check of the sensor: a reconciliation between fills to full, or a calibration entry. */
	lastChecked: { at: Date; by: 'reconciliation' | 'calibration' } | null;
}

export interface FleetView {
	month: string;
	/** False when the viewer sees only their own flights (the figures count those). */
	allFlights: boolean;
	rows: FleetRow[];
	/** "YYYY-MM" (UTC) of the newest flight the viewer may see on these aircraft; null without one. */
	latestFlightMonth: string | null;
}
