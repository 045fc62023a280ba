// Which meter factor and K-factor were in force for an aircraft at a moment: the newest dated
// calibration entry at or before it. Every computation of a flight reads its factors through here,
// at the flight's engine start (loading, upload, live).
import { and, desc, inArray, isNotNull, lte } from 'drizzle-orm';
import { db, type Db, type Tx } from '../db';
import { calibrations, type Aircraft, type Calibration } from '../db/schema';

type Queryable = Db | Tx;

/** "From the beginning": the in-force time of the entry holding the factors every flight had before dated history. */
export const BEGINNING = new Date('1970-01-01T00:00:00Z');

/** The newest applied entry in force at `at`; null when the aircraft has no dated entry at all. */
export async function entryInForce(aircraftId: string, at: Date, q: Queryable = db): Promise<Calibration | null> {
	return (await entriesInForce([{ aircraftId, at }], q))[0];
}

/** entryInForce for several aircraft and moments in one query, in the order asked. */
export async function entriesInForce(asked: readonly { aircraftId: string; at: Date }[], q: Queryable = db): Promise<(Calibration | null)[]> {
	if (asked.length === 0) return [];
	const latest = new Date(Math.max(...asked.map((x) => x.at.getTime())));
	const rows = await q
		.select()
		.from(calibrations)
		.where(and(inArray(calibrations.aircraftId, [...new Set(asked.map((x) => x.aircraftId))]), isNotNull(calibrations.inForceFrom), lte(calibrations.inForceFrom, latest)))
		.orderBy(desc(calibrations.inForceFrom), desc(calibrations.createdAt), desc(calibrations.id));
	// Newest first: the first row of the aircraft at or before the moment is the one in force.
	return asked.map(({ aircraftId, at }) => rows.find((r) => r.aircraftId === aircraftId && r.inForceFrom!.getTime() <= at.getTime()) ?? null);
}

/**
 * The aircraft as the engine should see it for a flight started at `at`: its factors replaced by
 * those in force then. Without any dated entry the aircraft's own factors have always applied.
 */
export async function aircraftAt(a: Aircraft, at: Date, q: Queryable = db): Promise<Aircraft> {
	return withEntry(a, await entryInForce(a.id, at, q));
}

/** aircraftAt for several aircraft and moments in one query, in the order asked. */
export async function aircraftAtAll(asked: readonly { aircraft: Aircraft; at: Date }[], q: Queryable = db): Promise<Aircraft[]> {
	const entries = await entriesInForce(asked.map((x) => ({ aircraftId: x.aircraft.id, at: x.at })), q);
	return asked.map((x, i) => withEntry(x.aircraft, entries[i]));
}

const withEntry = (a: Aircraft, e: Calibration | null): Aircraft => (e ? { ...a, meterFactor: e.meterFactorNew, kFactor: e.kFactorNew } : a);

