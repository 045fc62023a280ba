// From stored rows to the fuel engine's inputs: one mapping used by replay (in the browser), live
// flights and the server's cached summaries, so every screen computes from the same inputs.
import type { AlarmThresholds, Declaration, EngineOptions, FuelEvent, FuelProfile, ReserveRuleId, ReserveSetting } from '$lib/fuel';

/** The aircraft fields the engine needs (a subset of the aircraft row, safe to send to a browser). */
export interface AircraftFuelSetup {
	capacityL: number;
	lowerLevelL: number | null;
	unusableL: number;
	densityKgPerL: number;
	meterFactor: number;
	baselineCruiseLph: number | null;
	lowFuelL: number | null;
	lowEnduranceMin: number | null;
	/** Null when the stored rule is not one Burndown knows (the figures then have no reserve). */
	reserveRule: ReserveRuleId | null;
	reserveCustomMin: number | null;
	/**
	 * The aircraft's recent median cruise flow, L/h, from the stored summaries of its earlier
	 * flights (src/lib/server/flights/recent-cruise.ts): the reserve's basis when no normal-cruise
	 * flow is set and the flight has not measured its own yet.
	 */
	recentCruiseLph?: number | null;
}

export interface StoredFuelEvent {
	t: Date | string | number;
	kind: FuelEvent['kind'];
	amountL: number | null;
	note?: string;
}

export function fuelSetupOf<T extends AircraftFuelSetup>(a: T, recentCruiseLph: number | null = a.recentCruiseLph ?? null): AircraftFuelSetup {
	const { capacityL, lowerLevelL, unusableL, densityKgPerL, meterFactor, baselineCruiseLph, lowFuelL, lowEnduranceMin, reserveRule, reserveCustomMin } = a;
	return { capacityL, lowerLevelL, unusableL, densityKgPerL, meterFactor, baselineCruiseLph, lowFuelL, lowEnduranceMin, reserveRule, reserveCustomMin, recentCruiseLph };
}

export function profileOf(a: AircraftFuelSetup): FuelProfile {
	return {
		capacityL: a.capacityL,
		lowerLevelL: a.lowerLevelL,
		unusableL: a.unusableL,
		densityKgPerL: a.densityKgPerL,
		meterFactor: a.meterFactor,
		baselineCruiseFlowLph: a.baselineCruiseLph
	};
}

export function thresholdsOf(a: AircraftFuelSetup): AlarmThresholds {
	return { lowFuelL: a.lowFuelL, lowEnduranceMin: a.lowEnduranceMin, arrivalBelowReserve: true };
}

export function reserveOf(a: AircraftFuelSetup): ReserveSetting | null {
	return a.reserveRule === null ? null : { ruleId: a.reserveRule, customMinutes: a.reserveCustomMin ?? undefined };
}

const epochSeconds = (t: Date | string | number) => (typeof t === 'number' ? t : new Date(t).getTime() / 1000);

export function eventsOf(rows: readonly StoredFuelEvent[]): FuelEvent[] {
	return rows
		.map((e) => ({ t: epochSeconds(e.t), kind: e.kind, amountL: e.amountL ?? undefined, note: e.note }))
		.sort((a, b) => a.t - b.t);
}

/** Everything but the samples: the engine's FlightInput without `columns`. */
export function engineInputsOf(
	a: AircraftFuelSetup,
	flight: { declaration: unknown; previousOnBoardL: number | null },
	events: readonly StoredFuelEvent[],
	options?: EngineOptions
) {
	return {
		profile: profileOf(a),
		declaration: flight.declaration as Declaration,
		previousOnBoardL: flight.previousOnBoardL,
		events: eventsOf(events),
		thresholds: thresholdsOf(a),
		reserve: reserveOf(a),
		recentCruiseFlowLph: a.recentCruiseLph ?? null,
		options
	};
}
