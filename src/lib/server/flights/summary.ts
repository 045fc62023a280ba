// The one place a flight's stored figures are derived: flights.summary (the cached FlightSummary
// the lists read) and the aircraft's "last known on board", recomputed from the stored samples and
// fuel inputs with the same engine the browser runs. Every write that changes an input (upload,
// declaration, fuel event, close, aircraft fuel profile, meter factor) calls it in its transaction.
import { and, asc, eq, gt, isNull } from 'drizzle-orm';
import { computeFlight, summarize, type FlightComputation, type FlightInput, type FlightSummary } from '$lib/fuel';
import { db, type Db } from '../db';
import { aircraft, flights, type Flight } from '../db/schema';
import { newestShutdownOnBoard } from '../ingest/placement';
import { storeComputedFigures } from './figures';
import { loadFlight, type LoadedFlight, type Queryable } from './load';
import type { Progress } from './recompute-jobs';

/**
 * The version of how stored figures are derived. Raise it with any change to the engine or to
 * what storeDerived stores that changes a stored figure: flights written by an older version are
 * recomputed once at start (refreshStaleFlights in ./refresh.ts), so no list, history or export
 * keeps figures the replay would no longer show.
 */
export const DERIVED_VERSION = 2;

export interface Computed {
	computation: FlightComputation;
	summary: FlightSummary;
}

/** The one derivation of a flight's figures from its engine input. */
export function computeInput(input: FlightInput): Computed {
	const computation = computeFlight(input);
	return { computation, summary: summarize(computation, input.columns, input.options) };
}

export function computeLoaded(f: LoadedFlight): Computed {
	return computeInput(f.input);
}

/** Any Drizzle handle that reads and writes: the pool, a transaction, the upload's own client. */
type Writer = Pick<Db, 'select' | 'update' | 'insert' | 'delete'>;

/**
 * Stores what was derived for a flight: its cached summary, the history's per-flight and
 * per-phase figures, and the aircraft's last known fuel on board. `computed` is null for an open
 * flight (nothing stored). recomputeSummary and the upload both end here.
 */
export async function storeDerived(flight: Pick<Flight, 'id' | 'aircraftId'>, input: FlightInput, computed: Computed | null, q: Writer): Promise<void> {
	await q.update(flights).set({ summary: computed?.summary ?? null, derivedVersion: DERIVED_VERSION, updatedAt: new Date() }).where(eq(flights.id, flight.id));
	// The history's typed per-flight and per-phase figures, from this same computation.
	await storeComputedFigures(flight.id, computed, input.columns, input.profile.meterFactor, q);
	await refreshLastOnBoard(flight.aircraftId, q);
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
	await storeDerived(loaded.flight, loaded.input, computed, q);
	return computed?.summary ?? null;
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
 * samples are in memory. With `after`: only the flights out of the trash that started after it —
 * those whose figures use the recent flights' cruise flow, after a flight went into the trash or
 * came back. Call lockAircraftFlights first. Returns how many flights were recomputed.
 */
export async function recomputeAircraftFlights(aircraftId: string, q: Queryable, after?: Date, progress?: Progress): Promise<number> {
	const which = after ? and(eq(flights.aircraftId, aircraftId), gt(flights.startedAt, after), isNull(flights.deletedAt)) : eq(flights.aircraftId, aircraftId);
	const ids = await q.select({ id: flights.id }).from(flights).where(which).orderBy(asc(flights.startedAt));
	await recomputeFlights(ids.map((r) => r.id), q, progress);
	return ids.length;
}

/** Recomputes the given flights in order, one at a time (one flight's samples in memory), reporting each. */
export async function recomputeFlights(ids: readonly string[], q: Queryable, progress?: Progress): Promise<void> {
	await progress?.begin(ids.length);
	for (let i = 0; i < ids.length; i++) {
		await recomputeSummary(ids[i], q);
		await progress?.step(i + 1);
	}
}

/**
 * The aircraft's last known fuel on board is its newest flight's fuel at shutdown (the rule in
 * ingest/placement.ts). An aircraft with no such flight keeps the figure it was given (a fleet
 * entry, the demo data).
 */
async function refreshLastOnBoard(aircraftId: string, q: Writer): Promise<void> {
	const onBoardL = await newestShutdownOnBoard(q, aircraftId);
	if (onBoardL === null) return;
	await q.update(aircraft).set({ lastOnBoardL: onBoardL, updatedAt: new Date() }).where(eq(aircraft.id, aircraftId));
}
