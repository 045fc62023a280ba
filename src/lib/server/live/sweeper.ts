// Closes live flights nobody has sent anything to for a while: a recorder switched off without a
// close call. Two waits (config.ts files): when the last sample stored shows the engine stopped
// on the ground, the flight is at a planned stop and stays open for LIVE_STOP_OPEN_HOURS (4 h by
// default) so the next leg joins it; otherwise the idle time (live/config.ts, 30 minutes by
// default). Every instance sweeps; the row lock and the status check make each flight close once.
import { and, eq, lt, sql } from 'drizzle-orm';
import { engineStoppedOnGround } from '$lib/fuel';
import { db } from '../db';
import { serverConfig } from '../config';
import { flights, samples } from '../db/schema';
import { dropComputation } from './computation';
import { idleCloseMinutes } from './config';
import { closeFlightIn, lockFlight, lockRecorder } from './flights';
import type { Queryable } from './samples';

/** Hours a flight at a planned stop (engine stopped on the ground) stays open without data. */
export function stopOpenHours(): number {
	return serverConfig().LIVE_STOP_OPEN_HOURS;
}

/** Whether the newest contiguous sample of the flight shows the engine stopped on the ground. */
export async function atPlannedStop(q: Queryable, flightId: string, lastSeq: number): Promise<boolean> {
	const [last] = await q
		.select({ flow: samples.flow, gs: samples.gs })
		.from(samples)
		.where(and(eq(samples.flightId, flightId), eq(samples.seq, lastSeq)))
		.limit(1);
	return !!last && engineStoppedOnGround(last.flow, last.gs);
}

export interface SweepLimits {
	idleMinutes?: number;
	stopHours?: number;
}

/** Closes the idle open live flights; returns their ids. */
export async function sweepIdleFlights(now: Date = new Date(), limits: SweepLimits = {}): Promise<string[]> {
	const idleMinutes = limits.idleMinutes ?? idleCloseMinutes();
	const stopHours = limits.stopHours ?? stopOpenHours();
	const cutoff = new Date(now.getTime() - idleMinutes * 60_000);
	const stopCutoff = new Date(now.getTime() - stopHours * 3_600_000);
	const idle = await db
		.select({ id: flights.id, recorderId: flights.recorderId, lastSeq: flights.lastSeq, updatedAt: flights.updatedAt })
		.from(flights)
		.where(and(eq(flights.status, 'open'), eq(flights.source, 'live'), lt(flights.updatedAt, cutoff)));
	const closed: string[] = [];
	for (const f of idle) {
		// A planned stop is waited for longer; past its limit the flight closes like any other.
		if (f.updatedAt >= stopCutoff && (await atPlannedStop(db, f.id, f.lastSeq))) continue;
		const done = await db.transaction(async (tx) => {
			if (f.recorderId) await lockRecorder(tx, f.recorderId);
			await lockFlight(tx, f.id);
			// A batch may have arrived since the first look: check again under the locks.
			const [still] = await tx
				.select({ id: flights.id, lastSeq: flights.lastSeq, updatedAt: flights.updatedAt })
				.from(flights)
				.where(and(eq(flights.id, f.id), eq(flights.status, 'open'), sql`${flights.updatedAt} < ${cutoff.toISOString()}::timestamptz`))
				.for('update');
			if (!still) return false;
			if (still.updatedAt >= stopCutoff && (await atPlannedStop(tx, f.id, still.lastSeq))) return false;
			return closeFlightIn(tx, f.id);
		});
		if (done) {
			dropComputation(f.id);
			closed.push(f.id);
		}
	}
	return closed;
}
