// The trash: a flight moved there is hidden from every list, history, export and API answer, keeps
// its samples and original upload, and can be restored by its editors; an admin empties the trash,
// which really deletes. Moving in or out recomputes what depends on the flight in one transaction
// (its own stored figures, the later flights' that use its cruise flow, the aircraft's last fuel).
import { and, eq, inArray, isNotNull, isNull, desc } from 'drizzle-orm';
import { db } from '../db';
import { flights, uploads, users, type Flight } from '../db/schema';
import { lockAircraftFlights, recomputeAircraftFlights, recomputeSummary } from './summary';
import type { EditResult } from './edit';

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

export async function restoreFlight(flight: Pick<Flight, 'id' | 'aircraftId' | 'startedAt'>): Promise<void> {
	await move(flight, null);
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
			.returning({ uploadId: flights.uploadId });
		const uploadIds = gone.map((g) => g.uploadId).filter((x): x is string => x !== null);
		if (uploadIds.length) await tx.delete(uploads).where(and(inArray(uploads.id, uploadIds), eq(uploads.orgId, orgId)));
		return gone.length;
	});
}

export const notTrashed = isNull(flights.deletedAt);
