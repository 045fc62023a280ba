// The trash: a flight moved there is hidden from every list, history, export and API answer, keeps
// its samples and original upload, and can be restored by its editors; an admin empties the trash,
// which really deletes. Moving in or out recomputes what depends on the flight in one transaction
// (its own stored figures, the later flights' that use its cruise flow, the aircraft's last fuel).
import { and, eq, inArray, isNotNull, isNull, desc, or, sql } from 'drizzle-orm';
import { db } from '../db';
import { flights, uploads, users, type Flight } from '../db/schema';
import { lockAircraftFlights, recomputeAircraftFlights, recomputeSummary } from './summary';
import type { EditResult } from './edit';
import { overlappingFlight } from '../ingest/placement';
import { utcDateTime } from '$lib/format';

async function move(flight: Pick<Flight, 'id' | 'aircraftId' | 'startedAt'>, deleted: { at: Date; by: string } | null): Promise<void> {
	await db.transaction(async (tx) => {
		await lockAircraftFlights(flight.aircraftId, tx);
		await tx
			.update(flights)
			.set({ deletedAt: deleted?.at ?? null, deletedBy: deleted?.by ?? null, updatedAt: new Date() })
			.where(eq(flights.id, flight.id));
		await recomputeSummary(flight.id, tx);
		await recomputeAircraftFlights(flight.aircraftId, tx, flight.startedAt);
	});
}

/** Moves a closed flight to the trash. An open live flight is refused: close it first. */
export async function trashFlight(flight: Pick<Flight, 'id' | 'aircraftId' | 'startedAt' | 'status'>, userId: string): Promise<EditResult> {
	if (flight.status === 'open') return { ok: false, field: 'form', message: 'This flight is still open (live). It can go to the trash once it has closed.' };
	await move(flight, { at: new Date(), by: userId });
	return { ok: true };
}

/**
 * Takes a flight out of the trash, unless a flight stored meanwhile covers the same time (flights in
 * the trash overlap nothing, so an upload may have taken its place).
 */
export async function restoreFlight(flight: Pick<Flight, 'id' | 'aircraftId' | 'startedAt' | 'endedAt' | 'lastSampleAt'>): Promise<EditResult> {
	const end = flight.endedAt ?? flight.lastSampleAt ?? flight.startedAt;
	const other = await overlappingFlight(db, flight.aircraftId, flight.id, flight.startedAt, end);
	if (other) {
		return { ok: false, field: 'form', message: `A flight of this aircraft stored since (started ${utcDateTime(other.startedAt)} UTC) covers the same time; put that one in the trash first to restore this one.` };
	}
	await move(flight, null);
	return { ok: true };
}

/** The organisation's flights in the trash, newest deletion first. */
export async function trashedFlights(orgId: string) {
	return db
		.select({ flight: flights, deletedByName: users.name })
		.from(flights)
		.leftJoin(users, eq(users.id, flights.deletedBy))
		.where(and(eq(flights.orgId, orgId), isNotNull(flights.deletedAt)))
		.orderBy(desc(flights.deletedAt));
}

/**
 * Really deletes the organisation's trashed flights (their samples, events, notes and figures go
 * with them) and the original uploads they were made from. Returns how many flights went.
 */
export async function emptyTrash(orgId: string): Promise<number> {
	return db.transaction(async (tx) => {
		const gone = await tx
			.delete(flights)
			.where(and(eq(flights.orgId, orgId), isNotNull(flights.deletedAt)))
			.returning({ id: flights.id, uploadId: flights.uploadId });
		const uploadIds = gone.map((g) => g.uploadId).filter((x): x is string => x !== null);
		// With the uploads merged into these flights (flights/split.ts); an upload that a split's other
		// part, out of the trash, still refers to stays.
		const ids = gone.map((g) => g.id);
		const which = uploadIds.length ? or(inArray(uploads.id, uploadIds), inArray(uploads.mergedIntoFlightId, ids)) : inArray(uploads.mergedIntoFlightId, ids);
		if (ids.length)
			await tx
				.delete(uploads)
				.where(and(eq(uploads.orgId, orgId), which, sql`not exists (select 1 from ${flights} where ${flights.uploadId} = ${uploads.id})`));
		return gone.length;
	});
}

export const notTrashed = isNull(flights.deletedAt);
