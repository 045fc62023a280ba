// Stored figures written by an older derivation are brought up to date: each closed flight whose
// derived_version is below DERIVED_VERSION is recomputed from its samples in a transaction of its
// own, holding the flight's row lock as every other flight write does, so a flight changed
// meanwhile is recomputed from its new inputs. Run at start after the migrations
// (scripts/refresh-derived.ts), before the app serves; safe to run again or from two instances.
import { and, asc, eq, lt } from 'drizzle-orm';
import { db } from '../db';
import { flights } from '../db/schema';
import { DERIVED_VERSION, recomputeSummary } from './summary';

/** Recomputes every stale closed flight; returns how many were recomputed. */
export async function refreshStaleFlights(onFlight?: (done: number, total: number) => void): Promise<number> {
	const stale = await db
		.select({ id: flights.id })
		.from(flights)
		.where(and(eq(flights.status, 'closed'), lt(flights.derivedVersion, DERIVED_VERSION)))
		.orderBy(asc(flights.startedAt));
	let done = 0;
	for (const { id } of stale) {
		const recomputed = await db.transaction(async (tx) => {
			// Taken again under the lock: another instance may have recomputed it, or it reopened.
			const [row] = await tx.select({ status: flights.status, derivedVersion: flights.derivedVersion }).from(flights).where(eq(flights.id, id)).for('update');
			if (!row || row.status !== 'closed' || row.derivedVersion >= DERIVED_VERSION) return false;
			await recomputeSummary(id, tx);
			return true;
		});
		if (recomputed) done++;
		onFlight?.(done, stale.length);
	}
	return done;
}
