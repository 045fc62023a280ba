// The server's own running fuel computation of each open live flight, kept in memory between
// batches so alarm detection only processes the samples a batch made contiguous (the incremental
// engine gives exactly the figures a replay of the same samples gives). Rebuilt from the database
// whenever the fuel inputs changed or this instance has not seen the flight yet.
import { asc, inArray } from 'drizzle-orm';
import { engineInputsOf, fuelSetupOf } from '$lib/flight-inputs';
import { aircraftAtAll } from '../calibration/in-force';
import { createLiveComputation, type LiveComputation } from '$lib/fuel';
import type { Aircraft, Flight, FuelEventRow } from '../db/schema';
import { fuelEvents } from '../db/schema';
import { recentCruiseFlowsLph } from '../flights/recent-cruise';
import type { LiveSample } from './batch';
import { PAGE_SAMPLES } from './config';
import { readRun, runColumns, type Queryable, type SampleRun } from './samples';

interface Cached {
	signature: string;
	comp: LiveComputation;
	/** Highest sequence appended so far. */
	processedSeq: number;
	waypointIds: Map<string, number>;
	usedAt: number;
	/** The alarm episodes last written for this computation (alarmsSynced). */
	syncedAlarms: string | null;
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
	return (await computationsFor(q, [{ flight, aircraft: current }]))[0];
}

export interface ComputationAsk {
	flight: Flight;
	aircraft: Aircraft;
	/**
	 * Samples just stored that end at flight.lastSeq, when the caller has them: appended as they
	 * are (the values the table now holds) instead of read back, when they continue the cache.
	 */
	appended?: readonly LiveSample[];
}

/** computationFor for several flights, their inputs read in one query per kind (calibration, fuel events, recent cruise). */
export async function computationsFor(q: Queryable, asked: readonly ComputationAsk[]): Promise<Computed[]> {
	if (asked.length === 0) return [];
	const ids = asked.map((x) => x.flight.id);
	// The factors in force at each flight's engine start (dated calibration).
	const [inForce, allEvents, recents] = [
		await aircraftAtAll(asked.map((x) => ({ aircraft: x.aircraft, at: x.flight.startedAt })), q),
		await q.select().from(fuelEvents).where(inArray(fuelEvents.flightId, ids)).orderBy(asc(fuelEvents.t), asc(fuelEvents.createdAt)),
		await recentCruiseFlowsLph(asked.map((x) => ({ aircraftId: x.aircraft.id, before: x.flight })), q)
	];
	const out: Computed[] = [];
	for (let i = 0; i < asked.length; i++) {
		const { flight, appended } = asked[i];
		const a = inForce[i];
		const events = allEvents.filter((e) => e.flightId === flight.id);
		const recent = recents[i];
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
				usedAt: Date.now(),
				syncedAlarms: null
			};
			cache.set(flight.id, c);
			newFrom = 0;
		} else newFrom = c.comp.length;
		if (appended && appended.length > 0 && c.processedSeq === appended[0].seq - 1 && appended[appended.length - 1].seq === flight.lastSeq) {
			const run: SampleRun = { seq: [], tMs: [], flow: [], gs: [], dtg: [], alt: [], wpt: [], lat: [], lon: [] };
			for (const s of appended) {
				run.seq.push(s.seq);
				run.tMs.push(s.tMs);
				run.flow.push(s.flow);
				run.gs.push(s.gs);
				run.dtg.push(s.dtg);
				run.alt.push(s.alt);
				run.wpt.push(s.wpt);
				run.lat!.push(s.lat ?? null);
				run.lon!.push(s.lon ?? null);
			}
			c.comp.append(runColumns(run, c.waypointIds));
			c.processedSeq = flight.lastSeq;
		}
		while (c.processedSeq < flight.lastSeq) {
			const run = await readRun(flight.id, c.processedSeq, flight.lastSeq, PAGE_SAMPLES * 5, q);
			if (run.seq.length === 0) break;
			c.comp.append(runColumns(run, c.waypointIds));
			c.processedSeq = run.seq[run.seq.length - 1];
		}
		c.usedAt = Date.now();
		// A caller other than the grouped appends writes alarm rows its own way: sync again next time.
		if (!appended) c.syncedAlarms = null;
		out.push({ comp: c.comp, newFrom, waypoints: [...c.waypointIds.keys()] });
	}
	sweepCache();
	return out;
}

/**
 * Whether the flight's alarm rows may already match its computation: true when this instance's
 * last alarm sync of the flight (in a transaction that committed, or the cache would be dropped)
 * saw exactly these episodes. Then syncing again would change nothing.
 */
export function alarmsSynced(flightId: string, comp: LiveComputation): boolean {
	const c = cache.get(flightId);
	return c !== undefined && c.comp === comp && c.syncedAlarms === alarmsKey(comp);
}

/** Notes that the flight's alarm rows were brought in line with `comp` (call inside that transaction). */
export function noteAlarmsSynced(flightId: string, comp: LiveComputation): void {
	const c = cache.get(flightId);
	if (c && c.comp === comp) c.syncedAlarms = alarmsKey(comp);
}

const alarmsKey = (comp: LiveComputation) => JSON.stringify(comp.result().alarms.map((e) => [e.kind, e.raisedAt, e.clearedAt, e.value]));

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
