// Closes live flights nobody has sent anything to for the idle time (config.ts, 30 minutes by
// default): a recorder switched off without a close call. Every instance sweeps; the row lock and
// the status check make each flight close exactly once.
import { and, eq, lt, sql } from 'drizzle-orm';
import { db } from '../db';
import { flights } from '../db/schema';
import { dropComputation } from './computation';
import { idleCloseMinutes } from './config';
import { closeFlightIn, lockFlight, lockRecorder } from './flights';

/** Closes the idle open live flights; returns their ids. */
export async function sweepIdleFlights(now: Date = new Date(), idleMinutes: number = idleCloseMinutes()): Promise<string[]> {
	const cutoff = new Date(now.getTime() - idleMinutes * 60_000);
	const idle = await db
		.select({ id: flights.id, recorderId: flights.recorderId })
		.from(flights)
		.where(and(eq(flights.status, 'open'), eq(flights.source, 'live'), lt(flights.updatedAt, cutoff)));
	const closed: string[] = [];
	for (const f of idle) {
		const done = await db.transaction(async (tx) => {
			if (f.recorderId) await lockRecorder(tx, f.recorderId);
			await lockFlight(tx, f.id);
			// A batch may have arrived since the first look: check again under the locks.
			const [still] = await tx
				.select({ id: flights.id })
				.from(flights)
				.where(and(eq(flights.id, f.id), eq(flights.status, 'open'), sql`${flights.updatedAt} < ${cutoff.toISOString()}::timestamptz`))
				.for('update');
			return still ? closeFlightIn(tx, f.id) : false;
		});
		if (done) {
			dropComputation(f.id);
			closed.push(f.id);
		}
	}
	return closed;
}
