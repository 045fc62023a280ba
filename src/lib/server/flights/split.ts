// Splitting a flight in two at one of its engine-off stops, and merging two flights of one aircraft
// that a recorder restart cut in two. The samples move between flight rows (never copied or
// re-read from the file); the original uploads stay; both flights' stored figures, the later
// flights' and the aircraft's last fuel are recomputed in the same transaction.
import { and, asc, eq, gt, gte, isNull, lt, max, min, ne, sql } from 'drizzle-orm';
import type { FuelEventKind } from '$lib/fuel';
import { utcDateTime } from '$lib/format';
import { db } from '../db';
import { debriefs, flightNotes, flights, fuelEvents, fuelPlans, samples, uploads, type Flight } from '../db/schema';
import { loadFlight } from './load';
import { computeLoaded, lockAircraftFlights, recomputeAircraftFlights, recomputeSummary } from './summary';

export type SplitResult = { ok: true; flightIds: [string, string] } | { ok: false; status: 404 | 409; message: string };

/**
 * Cuts the flight at its stop number `stop` (0-based, in the order of the summary's stops). The
 * first flight keeps the samples before the stop ends (it closes with the engine stopped); the new
 * one takes the rest, with the fuel events and pinned notes after the stop began (a refuel at the
 * stop belongs to the second leg), and starts with the first one's fuel at shutdown ("unchanged").
 */
export async function splitFlight(flight: Pick<Flight, 'id' | 'aircraftId'>, stop: number): Promise<SplitResult> {
	return db.transaction(async (tx): Promise<SplitResult> => {
		await lockAircraftFlights(flight.aircraftId, tx);
		const loaded = await loadFlight(flight.id, tx);
		if (!loaded || loaded.flight.deletedAt !== null) return { ok: false, status: 404, message: 'Flight not found.' };
		const f = loaded.flight;
		if (f.status !== 'closed') return { ok: false, status: 409, message: 'This flight is still open (live). It can be split once it has closed.' };
		const stops = computeLoaded(loaded).summary.stops;
		const at = stops[stop];
		if (!at) return { ok: false, status: 409, message: stops.length === 0 ? 'This flight has no engine-off stop to split it at.' : `Choose one of the flight's ${stops.length} stops.` };

		const cut = new Date(at.end * 1000);
		const stopStart = new Date(at.start * 1000);
		const [second] = await tx
			.insert(flights)
			.values({
				orgId: f.orgId,
				aircraftId: f.aircraftId,
				pilotId: f.pilotId,
				instructorId: f.instructorId,
				title: f.title,
				route: '',
				source: f.source,
				status: 'closed',
				uploadId: f.uploadId,
				recorderId: f.recorderId,
				startedAt: cut,
				endedAt: f.endedAt,
				declaration: { kind: 'added', amountL: 0 },
				declarationConfirmed: true
			})
			.returning();
		await tx.update(samples).set({ flightId: second.id }).where(and(eq(samples.flightId, f.id), gte(samples.t, cut)));
		await tx.update(fuelEvents).set({ flightId: second.id }).where(and(eq(fuelEvents.flightId, f.id), gt(fuelEvents.t, stopStart)));
		await tx.update(flightNotes).set({ flightId: second.id }).where(and(eq(flightNotes.flightId, f.id), gt(flightNotes.t, stopStart)));
		await refreshSampleRange(tx, f.id);
		await refreshSampleRange(tx, second.id);

		// The first part's figures first: its fuel at shutdown is where the second one starts.
		const first = await recomputeSummary(f.id, tx);
		await tx.update(flights).set({ previousOnBoardL: first?.onBoardAtShutdownL ?? null }).where(eq(flights.id, second.id));
		await recomputeSummary(second.id, tx);
		await recomputeAircraftFlights(f.aircraftId, tx, cut);
		return { ok: true, flightIds: [f.id, second.id] };
	});
}

/**
 * The longest silence between two parts that merging still treats as one trip cut by a recorder
 * restart (our choice): flights further apart are separate flights, and are not offered.
 */
export const MERGE_MAX_GAP_S = 12 * 3600;

export type MergeResult = { ok: true; flightId: string } | { ok: false; status: 404 | 409; message: string };

/**
 * Joins two flights into the earlier one: the later one's samples (numbered on after the earlier
 * one's), fuel events and notes move over, its start-of-flight declaration becomes a fuel event at
 * its first sample, and its row goes; its original upload is kept, recorded as merged into the
 * earlier flight. Refused (409, nothing changed) for different aircraft, flights that overlap, an
 * open flight, or a later flight with its own fuel plan or debrief.
 */
export async function mergeFlights(a: Pick<Flight, 'id' | 'aircraftId' | 'orgId'>, b: Pick<Flight, 'id' | 'aircraftId' | 'orgId'>): Promise<MergeResult> {
	if (a.id === b.id) return { ok: false, status: 409, message: 'Choose another flight to merge with.' };
	if (a.orgId !== b.orgId) return { ok: false, status: 404, message: 'Flight not found.' };
	if (a.aircraftId !== b.aircraftId) return { ok: false, status: 409, message: 'These flights are of different aircraft; only flights of one aircraft can be merged.' };
	return db.transaction(async (tx): Promise<MergeResult> => {
		await lockAircraftFlights(a.aircraftId, tx);
		const rows = await tx
			.select()
			.from(flights)
			.where(and(eq(flights.aircraftId, a.aircraftId), isNull(flights.deletedAt), sql`${flights.id} in (${a.id}, ${b.id})`))
			.orderBy(asc(flights.startedAt));
		if (rows.length !== 2) return { ok: false, status: 404, message: 'Flight not found.' };
		const [early, late] = rows;
		if (early.status !== 'closed' || late.status !== 'closed') return { ok: false, status: 409, message: 'A flight that is still open (live) cannot be merged; wait until it has closed.' };
		const range = async (id: string) => (await tx.select({ first: min(samples.t), last: max(samples.t), lo: min(samples.seq), hi: max(samples.seq) }).from(samples).where(eq(samples.flightId, id)))[0];
		const [ra, rb] = [await range(early.id), await range(late.id)];
		if (ra.last && rb.first && rb.first.getTime() <= ra.last.getTime()) {
			return { ok: false, status: 409, message: `These flights overlap: the later one starts at ${utcDateTime(rb.first)} UTC, before the earlier one's last sample at ${utcDateTime(ra.last)} UTC.` };
		}
		if (ra.last && rb.first && rb.first.getTime() - ra.last.getTime() > MERGE_MAX_GAP_S * 1000) {
			const hours = Math.floor((rb.first.getTime() - ra.last.getTime()) / 3_600_000);
			return { ok: false, status: 409, message: `These flights are ${hours} h apart. Only the parts of one trip can be merged: at most ${MERGE_MAX_GAP_S / 3600} h from the earlier one's last sample to the later one's first.` };
		}
		const [plan] = await tx.select({ id: fuelPlans.id }).from(fuelPlans).where(eq(fuelPlans.flightId, late.id)).limit(1);
		const [debrief] = await tx.select({ id: debriefs.flightId }).from(debriefs).where(eq(debriefs.flightId, late.id)).limit(1);
		if (plan || debrief) return { ok: false, status: 409, message: `The later flight has its own ${plan ? 'fuel plan' : 'debrief'}; remove it first, then merge.` };

		// What the earlier flight had on board at its end, for a later declaration of an amount.
		const earlyFigures = await recomputeSummary(early.id, tx);
		const startOfLate = rb.first ?? late.startedAt;
		const event = declarationAsEvent(late.declaration, earlyFigures?.onBoardAtShutdownL ?? null);
		if (event) await tx.insert(fuelEvents).values({ flightId: early.id, t: startOfLate, kind: event.kind, amountL: event.amountL, note: 'Start of the merged flight’s second part' });

		if (rb.lo !== null && rb.lo !== undefined) {
			const offset = (ra.hi ?? -1) + 1 - rb.lo;
			await tx.update(samples).set({ flightId: early.id, seq: sql`${samples.seq} + ${offset}` }).where(eq(samples.flightId, late.id));
		}
		await tx.update(fuelEvents).set({ flightId: early.id }).where(eq(fuelEvents.flightId, late.id));
		await tx.update(flightNotes).set({ flightId: early.id }).where(eq(flightNotes.flightId, late.id));
		if (late.uploadId && late.uploadId !== early.uploadId) await tx.update(uploads).set({ mergedIntoFlightId: early.id }).where(eq(uploads.id, late.uploadId));
		await tx.update(uploads).set({ mergedIntoFlightId: early.id }).where(eq(uploads.mergedIntoFlightId, late.id));
		await tx.delete(flights).where(eq(flights.id, late.id));
		await tx
			.update(flights)
			.set({ endedAt: late.endedAt ?? early.endedAt, title: early.title || late.title, route: early.route || late.route, pilotId: early.pilotId ?? late.pilotId, instructorId: early.instructorId ?? late.instructorId })
			.where(eq(flights.id, early.id));
		await refreshSampleRange(tx, early.id);
		await recomputeSummary(early.id, tx);
		await recomputeAircraftFlights(early.aircraftId, tx, early.startedAt);
		return { ok: true, flightId: early.id };
	});
}

/** A later part's start-of-flight declaration as a fuel event on the merged timeline. */
export function declarationAsEvent(d: Flight['declaration'], onBoardBeforeL: number | null): { kind: FuelEventKind; amountL: number | null } | null {
	switch (d.kind) {
		case 'full':
			return { kind: 'toFull', amountL: null };
		case 'lower':
			return { kind: 'toLower', amountL: null };
		case 'added':
			return d.amountL > 0 ? { kind: 'added', amountL: d.amountL } : null;
		case 'removed':
			return d.amountL > 0 ? { kind: 'removed', amountL: d.amountL } : null;
		case 'onBoard': {
			if (onBoardBeforeL === null) return null;
			const delta = d.amountL - onBoardBeforeL;
			if (Math.abs(delta) < 1e-9) return null;
			return delta > 0 ? { kind: 'added', amountL: delta } : { kind: 'removed', amountL: -delta };
		}
	}
}

/** The flights of the same aircraft just before and just after this one, for choosing a merge. */
export async function mergeNeighbours(flight: Pick<Flight, 'id' | 'aircraftId' | 'startedAt' | 'endedAt'>) {
	const pick = { id: flights.id, startedAt: flights.startedAt, endedAt: flights.endedAt, title: flights.title, status: flights.status };
	const kept = and(eq(flights.aircraftId, flight.aircraftId), isNull(flights.deletedAt), ne(flights.id, flight.id));
	const [before] = await db.select(pick).from(flights).where(and(kept, lt(flights.startedAt, flight.startedAt))).orderBy(sql`${flights.startedAt} desc`).limit(1);
	const [after] = await db.select(pick).from(flights).where(and(kept, gt(flights.startedAt, flight.startedAt))).orderBy(asc(flights.startedAt)).limit(1);
	// Only neighbours close enough to be parts of the same trip (MERGE_MAX_GAP_S).
	const near = (from: Date | null, to: Date | null) => from !== null && to !== null && to.getTime() - from.getTime() <= MERGE_MAX_GAP_S * 1000;
	return { before: before && near(before.endedAt, flight.startedAt) ? before : null, after: after && near(flight.endedAt, after.startedAt) ? after : null };
}

/** A flight's sample count, first and last sequence and times, after samples moved. */
async function refreshSampleRange(tx: Parameters<Parameters<typeof db.transaction>[0]>[0], flightId: string): Promise<void> {
	const [r] = await tx
		.select({ n: sql<number>`count(*)::int`, lo: min(samples.seq), hi: max(samples.seq), first: min(samples.t), last: max(samples.t) })
		.from(samples)
		.where(eq(samples.flightId, flightId));
	await tx
		.update(flights)
		.set({
			sampleCount: Number(r.n),
			firstSeq: r.lo ?? 0,
			lastSeq: r.hi ?? -1,
			lastSampleAt: r.last,
			...(r.first ? { startedAt: r.first } : {}),
			...(r.last ? { endedAt: r.last } : {}),
			updatedAt: new Date()
		})
		.where(eq(flights.id, flightId));
}
