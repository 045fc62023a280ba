// Keeps flights.summary (the cached FlightSummary the lists read) in step with the samples and the
// fuel inputs: recomputed from the stored rows with the same engine the browser runs, after an
// upload, a declaration change or a fuel event added or removed.
import { and, desc, eq, ne } from 'drizzle-orm';
import { computeFlight, summarize, type FlightComputation, type FlightSummary } from '$lib/fuel';
import { db } from '../db';
import { aircraft, flights } from '../db/schema';
import { loadFlight, type LoadedFlight, type Queryable } from './load';

export function computeLoaded(f: LoadedFlight): { computation: FlightComputation; summary: FlightSummary } {
	const computation = computeFlight(f.input);
	return { computation, summary: summarize(computation) };
}

/**
 * Recomputes and stores one flight's summary; null when the flight does not exist. Pass the
 * transaction that changed the flight so the summary commits with the change. When the flight is
 * the aircraft's latest closed one, the aircraft's "last known on board" follows the correction.
 */
export async function recomputeSummary(flightId: string, q: Queryable = db): Promise<FlightSummary | null> {
	const loaded = await loadFlight(flightId, q);
	if (!loaded) return null;
	const { summary } = computeLoaded(loaded);
	await q.update(flights).set({ summary, updatedAt: new Date() }).where(eq(flights.id, flightId));
	const f = loaded.flight;
	if (f.status === 'closed' && summary.onBoardAtShutdownL !== null) {
		const [latest] = await q
			.select({ startedAt: flights.startedAt })
			.from(flights)
			.where(and(eq(flights.aircraftId, f.aircraftId), eq(flights.status, 'closed'), ne(flights.id, f.id)))
			.orderBy(desc(flights.startedAt))
			.limit(1);
		if (!latest || latest.startedAt <= f.startedAt) {
			await q.update(aircraft).set({ lastOnBoardL: summary.onBoardAtShutdownL, updatedAt: new Date() }).where(eq(aircraft.id, f.aircraftId));
		}
	}
	return summary;
}
