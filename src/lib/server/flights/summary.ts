// The one place a flight's stored figures are derived: flights.summary (the cached FlightSummary
// the lists read) and the aircraft's "last known on board", recomputed from the stored samples and
// fuel inputs with the same engine the browser runs. Every write that changes an input (upload,
// declaration, fuel event, close, aircraft fuel profile, meter factor) calls it in its transaction.
import { and, asc, desc, eq, gt, isNotNull, isNull, sql } from 'drizzle-orm';
import { computeFlight, summarize, type FlightComputation, type FlightSummary } from '$lib/fuel';
import { db } from '../db';
import { aircraft, flights } from '../db/schema';
import { storeComputedFigures } from './figures';
import { loadFlight, type LoadedFlight, type Queryable } from './load';

export function computeLoaded(f: LoadedFlight): { computation: FlightComputation; summary: FlightSummary } {
	const computation = computeFlight(f.input);
	return { computation, summary: summarize(computation) };
}

/**
 * Recomputes and stores one flight's figures; null when the flight does not exist or is still
 * open (an open flight's figures are live and change with every batch, so none are stored until
 * it closes). Pass the transaction that changed an input so the figures commit with the change.
 */
export async function recomputeSummary(flightId: string, q: Queryable = db): Promise<FlightSummary | null> {
	const loaded = await loadFlight(flightId, q);
	if (!loaded) return null;
	// A flight in the trash keeps no figures: lists, history, baselines and the last fuel skip it.
	const computed = loaded.flight.status === 'closed' && loaded.flight.deletedAt === null ? computeLoaded(loaded) : null;
	const summary = computed?.summary ?? null;
	await q.update(flights).set({ summary, updatedAt: new Date() }).where(eq(flights.id, flightId));
	// The history's typed per-flight and per-phase figures, from this same computation.
	await storeComputedFigures(flightId, computed, loaded.input.columns, loaded.input.profile.meterFactor, q);
	await refreshLastOnBoard(loaded.flight.aircraftId, q);
	return summary;
}

/**
 * Locks every flight row of an aircraft, in one order. A change to the aircraft takes these locks
 * before the aircraft's own row, the order every flight write takes them in (the flight, then the
 * aircraft's last known fuel), so two such transactions wait for each other instead of deadlocking,
 * and a flight closing meanwhile is recomputed from its closed state.
 */
export async function lockAircraftFlights(aircraftId: string, q: Queryable): Promise<void> {
	await q.select({ id: flights.id }).from(flights).where(eq(flights.aircraftId, aircraftId)).orderBy(asc(flights.id)).for('update');
}

/**
 * After a change to the aircraft's fuel profile (capacity, fill levels, baseline flow, density,
 * meter factor, reserve rule): every flight of the aircraft, one at a time so only one flight's
 * samples are in memory. Call lockAircraftFlights first. Returns how many flights were recomputed.
 */
export async function recomputeAircraftFlights(aircraftId: string, q: Queryable): Promise<number> {
	const ids = await q.select({ id: flights.id }).from(flights).where(eq(flights.aircraftId, aircraftId)).orderBy(asc(flights.startedAt));
	for (const { id } of ids) await recomputeSummary(id, q);
	return ids.length;
}

/**
 * The aircraft's last known fuel on board is the latest closed flight's fuel at shutdown. An
 * aircraft with no such flight keeps the figure it was given (a fleet entry, the demo data).
 */
async function refreshLastOnBoard(aircraftId: string, q: Queryable): Promise<void> {
	const [latest] = await q
		.select({ onBoardL: sql<number | null>`(${flights.summary}->>'onBoardAtShutdownL')::float8` })
		.from(flights)
		.where(and(eq(flights.aircraftId, aircraftId), eq(flights.status, 'closed'), isNotNull(flights.summary), isNull(flights.deletedAt)))
		.orderBy(desc(flights.startedAt))
		.limit(1);
	if (!latest || latest.onBoardL === null) return;
	await q.update(aircraft).set({ lastOnBoardL: latest.onBoardL, updatedAt: new Date() }).where(eq(aircraft.id, aircraftId));
}

/**
 * After a flight of the aircraft went into the trash or came back: the flights after it, whose
 * stored figures use the recent flights' cruise flow. Call lockAircraftFlights first.
 */
export async function recomputeFlightsAfter(aircraftId: string, startedAt: Date, q: Queryable): Promise<number> {
	const ids = await q
		.select({ id: flights.id })
		.from(flights)
		.where(and(eq(flights.aircraftId, aircraftId), gt(flights.startedAt, startedAt), isNull(flights.deletedAt)))
		.orderBy(asc(flights.startedAt));
	for (const { id } of ids) await recomputeSummary(id, q);
	return ids.length;
}
