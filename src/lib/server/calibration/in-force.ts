// Which meter factor and K-factor were in force for an aircraft at a moment: the newest dated
// calibration entry at or before it. Every computation of a flight reads its factors through here,
// at the flight's engine start (loading, upload, live).
import { and, desc, eq, isNotNull, lte } from 'drizzle-orm';
import { db, type Db, type Tx } from '../db';
import { calibrations, type Aircraft, type Calibration } from '../db/schema';

type Queryable = Db | Tx;

/** "From the beginning": the in-force time of the entry holding the factors every flight had before dated history. */
export const BEGINNING = new Date('1970-01-01T00:00:00Z');

/** The newest applied entry in force at `at`; null when the aircraft has no dated entry at all. */
export async function entryInForce(aircraftId: string, at: Date, q: Queryable = db): Promise<Calibration | null> {
	const [row] = await q
		.select()
		.from(calibrations)
		.where(and(eq(calibrations.aircraftId, aircraftId), isNotNull(calibrations.inForceFrom), lte(calibrations.inForceFrom, at)))
		.orderBy(desc(calibrations.inForceFrom), desc(calibrations.createdAt), desc(calibrations.id))
		.limit(1);
	return row ?? null;
}

/**
 * The aircraft as the engine should see it for a flight started at `at`: its factors replaced by
 * those in force then. Without any dated entry the aircraft's own factors have always applied.
 */
export async function aircraftAt(a: Aircraft, at: Date, q: Queryable = db): Promise<Aircraft> {
	const e = await entryInForce(a.id, at, q);
	return e ? { ...a, meterFactor: e.meterFactorNew, kFactor: e.kFactorNew } : a;
}

