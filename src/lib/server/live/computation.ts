// The server's own running fuel computation of each open live flight, kept in memory between
// batches so alarm detection only processes the samples a batch made contiguous (the incremental
// engine gives exactly the figures a replay of the same samples gives). Rebuilt from the database
// whenever the fuel inputs changed or this instance has not seen the flight yet.
import { asc, eq } from 'drizzle-orm';
import { engineInputsOf, fuelSetupOf } from '$lib/flight-inputs';
import { aircraftAt } from '../calibration/in-force';
import { createLiveComputation, type LiveComputation } from '$lib/fuel';
import type { Aircraft, Flight, FuelEventRow } from '../db/schema';
import { fuelEvents } from '../db/schema';
import { recentCruiseFlowLph } from '../flights/recent-cruise';
import { PAGE_SAMPLES } from './config';
import { readRun, runColumns, type Queryable } from './samples';

interface Cached {
	signature: string;
	comp: LiveComputation;
	/** Highest sequence appended so far. */
	processedSeq: number;
	waypointIds: Map<string, number>;
	usedAt: number;
}

const cache = new Map<string, Cached>();
/** Computations not touched for this long are dropped; the next batch rebuilds from the table. */
const IDLE_MS = 15 * 60_000;

function signatureOf(a: Aircraft, recent: number | null, f: Flight, events: readonly FuelEventRow[]): string {
	return JSON.stringify([fuelSetupOf(a, recent), f.declaration, f.previousOnBoardL, events.map((e) => [e.t.getTime(), e.kind, e.amountL])]);
}

export interface Computed {
	comp: LiveComputation;
	/** Index of the first sample appended by this call (samples before it were already known). */
	newFrom: number;
	waypoints: string[];
}

/**
 * The flight's computation over every sample up to flight.lastSeq (the contiguous head), reading
 * only what this instance has not appended yet. Call inside the transaction that stored a batch
 * so its rows are visible; drop() the flight if that transaction then fails.
 */
export async function computationFor(q: Queryable, flight: Flight, current: Aircraft): Promise<Computed> {
	// The factors in force at this flight's engine start (dated calibration).
	const a = await aircraftAt(current, flight.startedAt, q);
	const events = await q.select().from(fuelEvents).where(eq(fuelEvents.flightId, flight.id)).orderBy(asc(fuelEvents.t), asc(fuelEvents.createdAt));
	const recent = await recentCruiseFlowLph(a.id, flight, q);
	const signature = signatureOf(a, recent, flight, events);
	let c = cache.get(flight.id);
	let newFrom: number;
	if (!c || c.signature !== signature || c.processedSeq > flight.lastSeq) {
		const setup = fuelSetupOf(a, recent);
		c = {
			signature,
			comp: createLiveComputation({ ...engineInputsOf(setup, flight, events), initialCapacity: Math.max(1024, flight.sampleCount + 256) }),
			processedSeq: -1,
			waypointIds: new Map(),
			usedAt: Date.now()
		};
		cache.set(flight.id, c);
		newFrom = 0;
	} else newFrom = c.comp.length;
	while (c.processedSeq < flight.lastSeq) {
		const run = await readRun(flight.id, c.processedSeq, flight.lastSeq, PAGE_SAMPLES * 5, q);
		if (run.seq.length === 0) break;
		c.comp.append(runColumns(run, c.waypointIds));
		c.processedSeq = run.seq[run.seq.length - 1];
	}
	c.usedAt = Date.now();
	sweepCache();
	return { comp: c.comp, newFrom, waypoints: [...c.waypointIds.keys()] };
}

/** Forgets a flight's computation (its transaction failed, or it closed). */
export function dropComputation(flightId: string): void {
	cache.delete(flightId);
}

function sweepCache(): void {
	const cutoff = Date.now() - IDLE_MS;
	for (const [id, c] of cache) if (c.usedAt < cutoff) cache.delete(id);
}

export function computationCount(): number {
	return cache.size;
}
