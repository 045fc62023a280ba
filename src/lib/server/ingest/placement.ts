// Where a new flight sits among its aircraft's flights: the rules an upload is checked against
// before it is stored (the same file twice, two flights at once) and the one rule for which
// flight is the aircraft's newest, whose shutdown fuel is the aircraft's last known fuel on board
// (flights/summary.ts refreshes that figure with the same rule after every change).
import { and, desc, eq, gt, isNotNull, isNull, lt, lte, ne, or, sql, type SQL } from 'drizzle-orm';
import type { Db } from '../db';
import { aircraft, flights, uploads, type Aircraft } from '../db/schema';

/** Any Drizzle handle that reads and writes: the pool, a transaction, the upload's own client. */
export type PlacementHandle = Pick<Db, 'select' | 'delete' | 'execute'>;

/** Advisory lock class (two-key form) for the checks and writes of one aircraft's uploads. */
const LOCK_AIRCRAFT_UPLOAD = 5_120_003;

/**
 * Uploads for one aircraft take turns from here to the end of the transaction, so the duplicate,
 * overlap and "newest flight" checks cannot race each other. An advisory lock rather than a row
 * lock on the aircraft: every such transaction already holds a key-share lock on that row (its
 * flight's foreign key), and two of them upgrading it to FOR UPDATE deadlock.
 */
export async function lockAircraftUploads(q: PlacementHandle, aircraftId: string): Promise<void> {
	await q.execute(sql`select pg_advisory_xact_lock(${LOCK_AIRCRAFT_UPLOAD}, hashtext(${aircraftId}))`);
}

/**
 * The "newest flight" rule: the aircraft's flights that count are the closed ones with figures
 * (an open flight's figures still move), newest by start time.
 */
function countedFlights(aircraftId: string, except?: string): SQL {
	const counted = and(eq(flights.aircraftId, aircraftId), eq(flights.status, 'closed'), isNotNull(flights.summary));
	return (except ? and(counted, ne(flights.id, except)) : counted)!;
}

/** Fuel on board at shutdown of the aircraft's newest flight, or null (none, or no figure). */
export async function newestShutdownOnBoard(q: Pick<Db, 'select'>, aircraftId: string): Promise<number | null> {
	const [latest] = await q
		.select({ onBoardL: sql<number | null>`(${flights.summary}->>'onBoardAtShutdownL')::float8` })
		.from(flights)
		.where(countedFlights(aircraftId))
		.orderBy(desc(flights.startedAt))
		.limit(1);
	return latest?.onBoardL ?? null;
}

/** Whether a flight starting at `startedAt` would be the aircraft's newest (the same rule). */
export async function wouldBeNewest(q: Pick<Db, 'select'>, aircraftId: string, startedAt: Date, except: string): Promise<boolean> {
	const later = await q
		.select({ id: flights.id })
		.from(flights)
		.where(and(countedFlights(aircraftId, except), gt(flights.startedAt, startedAt)))
		.limit(1);
	return later.length === 0;
}

export type Placement =
	/** inTrash: that flight is in the trash (restore it there; it is not shown elsewhere). */
	| { kind: 'duplicate'; flightId: string; uploadId: string; inTrash: boolean }
	| { kind: 'overlap'; startedAt: Date }
	/** `aircraft` as it is now (another upload may have moved its figures while this one waited). */
	| { kind: 'placed'; aircraft: Aircraft; previousOnBoardL: number | null };

/**
 * Checks a new flight (row `flightId`, samples from `first` to `last`, file hash `sha256`) against
 * the aircraft's others. Call lockAircraftUploads first. A file uploaded before whose flight was
 * deleted since is no duplicate: its old upload row goes, the new one takes its place. A file whose
 * flight is in the trash is a duplicate of that flight (said so: restoring it is the way back). A
 * file merged into another flight is a duplicate of that flight. Flights in the trash overlap
 * nothing (restoring one checks again).
 */
export async function placeUpload(
	q: PlacementHandle,
	a: Aircraft,
	upload: { flightId: string; sha256: string; first: Date; last: Date }
): Promise<Placement> {
	const [dup] = await q
		.select({ uploadId: uploads.id, flightId: flights.id, deletedAt: flights.deletedAt })
		.from(uploads)
		.leftJoin(flights, or(eq(flights.uploadId, uploads.id), eq(flights.id, uploads.mergedIntoFlightId)))
		.where(and(eq(uploads.aircraftId, a.id), eq(uploads.sha256, upload.sha256)))
		// A kept flight first, when a split left two flights on one upload and one is in the trash.
		.orderBy(sql`${flights.deletedAt} is not null`)
		.limit(1);
	if (dup?.flightId) return { kind: 'duplicate', flightId: dup.flightId, uploadId: dup.uploadId, inTrash: dup.deletedAt !== null };
	if (dup) await q.delete(uploads).where(eq(uploads.id, dup.uploadId));

	// An aircraft flies one flight at a time.
	const overlap = await overlappingFlight(q, a.id, upload.flightId, upload.first, upload.last);
	if (overlap) return { kind: 'overlap', startedAt: overlap.startedAt };

	const [current] = await q.select().from(aircraft).where(eq(aircraft.id, a.id)).limit(1);
	const ac = current ?? a;
	const newest = await wouldBeNewest(q, a.id, upload.first, upload.flightId);
	// The flight just before this one, open or closed (not one in the trash, which keeps no figures).
	const before = await q
		.select({ onBoardL: sql<number | null>`(${flights.summary}->>'onBoardAtShutdownL')::float8` })
		.from(flights)
		.where(and(eq(flights.aircraftId, a.id), ne(flights.id, upload.flightId), isNull(flights.deletedAt), lt(flights.startedAt, upload.first)))
		.orderBy(desc(flights.startedAt))
		.limit(1);
	const previousFlightL = before[0]?.onBoardL ?? null;
	// The aircraft's own figure is "after its newest flight": it describes the time before this one
	// only when this one becomes the newest.
	return { kind: 'placed', aircraft: ac, previousOnBoardL: newest ? (ac.lastOnBoardL ?? previousFlightL) : previousFlightL };
}

/**
 * A flight of the aircraft, out of the trash and other than `except`, whose time overlaps
 * [first, last]: an aircraft flies one flight at a time. Upload and restoring from the trash ask.
 */
export async function overlappingFlight(q: Pick<Db, 'select'>, aircraftId: string, except: string, first: Date, last: Date): Promise<{ id: string; startedAt: Date } | null> {
	const [overlap] = await q
		.select({ id: flights.id, startedAt: flights.startedAt })
		.from(flights)
		.where(
			and(
				eq(flights.aircraftId, aircraftId),
				ne(flights.id, except),
				isNull(flights.deletedAt),
				lte(flights.startedAt, last),
				sql`coalesce(${flights.endedAt}, ${flights.lastSampleAt}, ${flights.startedAt}) >= ${first}`
			)
		)
		.limit(1);
	return overlap ?? null;
}
