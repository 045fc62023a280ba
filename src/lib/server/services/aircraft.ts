// The fleet: aircraft of an organisation, and the form values an aircraft is edited with.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { fuelSetupOf } from '$lib/flight-inputs';
import { fromLitres } from '$lib/units';
import type { AircraftInput } from '$lib/schemas/aircraft';
import { db } from '../db';
import { aircraft, type Aircraft } from '../db/schema';
import { lockAircraftFlights, recomputeAircraftFlights } from '../flights/summary';
import { writeEntryIn } from '../calibration/factors';

export async function listAircraft(orgId: string, opts: { includeArchived?: boolean } = {}) {
	return db
		.select()
		.from(aircraft)
		.where(opts.includeArchived ? eq(aircraft.orgId, orgId) : and(eq(aircraft.orgId, orgId), isNull(aircraft.archivedAt)))
		.orderBy(asc(aircraft.registration));
}

export type SaveResult = { ok: true; aircraft: Aircraft } | { ok: false; field: string; message: string };

export async function createAircraft(orgId: string, input: AircraftInput): Promise<SaveResult> {
	const [row] = await db.insert(aircraft).values({ orgId, ...input }).onConflictDoNothing().returning();
	if (!row) return { ok: false, field: 'registration', message: 'This organisation already has an aircraft with that registration.' };
	return { ok: true, aircraft: row };
}

/** The fuel setup without the factors: those change through dated calibration entries. */
const setupButFactors = (a: Aircraft) => JSON.stringify({ ...fuelSetupOf(a), meterFactor: null });

export async function updateAircraft(orgId: string, id: string, input: AircraftInput, userId: string | null): Promise<SaveResult> {
	const clash = await db.query.aircraft.findFirst({ where: and(eq(aircraft.orgId, orgId), eq(aircraft.registration, input.registration)) });
	if (clash && clash.id !== id) return { ok: false, field: 'registration', message: 'This organisation already has an aircraft with that registration.' };
	const row = await db.transaction(async (tx) => {
		await lockAircraftFlights(id, tx);
		const [before] = await tx.select().from(aircraft).where(and(eq(aircraft.orgId, orgId), eq(aircraft.id, id))).for('no key update');
		const [after] = await tx
			.update(aircraft)
			.set({ ...input, updatedAt: new Date() })
			.where(and(eq(aircraft.orgId, orgId), eq(aircraft.id, id)))
			.returning();
		if (!before || !after) return after;
		// A factor typed here is a hand edit: a dated entry in force from now, old → new in the
		// history; past flights keep the factors they were computed with.
		if (before.meterFactor !== after.meterFactor || before.kFactor !== after.kFactor) {
			await writeEntryIn(tx, before, { source: 'hand', inForceFrom: new Date(), factors: { meterFactor: after.meterFactor, kFactor: after.kFactor }, note: 'Set on the aircraft form.' }, userId);
		}
		// A new name or type changes no figure; anything else the engine reads recomputes every flight.
		if (setupButFactors(before) !== setupButFactors(after)) await recomputeAircraftFlights(id, tx);
		const [now] = await tx.select().from(aircraft).where(eq(aircraft.id, id));
		return now;
	});
	return { ok: true, aircraft: row };
}

export async function setArchived(orgId: string, id: string, archived: boolean): Promise<void> {
	await db
		.update(aircraft)
		.set({ archivedAt: archived ? new Date() : null, updatedAt: new Date() })
		.where(and(eq(aircraft.orgId, orgId), eq(aircraft.id, id)));
}

/** Stored litres back into the strings the form shows, in the aircraft's display unit. */
export function aircraftFormValues(a: Aircraft): Record<string, string> {
	const u = (l: number | null) => (l === null ? '' : String(Math.round(fromLitres(l, a.displayUnit, a.densityKgPerL) * 100) / 100));
	return {
		registration: a.registration,
		type: a.type,
		engine: a.engine,
		fuelType: a.fuelType,
		densityKgPerL: a.fuelType === 'other' ? String(a.densityKgPerL) : '',
		displayUnit: a.displayUnit,
		capacity: u(a.capacityL),
		lowerLevel: u(a.lowerLevelL),
		unusable: u(a.unusableL),
		meterFactor: String(a.meterFactor),
		kFactor: a.kFactor === null ? '' : String(a.kFactor),
		lowFuel: u(a.lowFuelL),
		lowEnduranceMin: a.lowEnduranceMin === null ? '' : String(a.lowEnduranceMin),
		// An unknown stored rule leaves the choice empty: the form then asks for one.
		reserveRule: a.reserveRule ?? '',
		reserveCustomMin: a.reserveCustomMin === null ? '' : String(a.reserveCustomMin),
		baselineCruise: u(a.baselineCruiseLph)
	};
}
