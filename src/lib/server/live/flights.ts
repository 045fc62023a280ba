// Opening and closing live flights. A flight opens on an explicit open call (which may carry the
// start-of-flight declaration) or on a recorder's first batch (the aircraft's last known fuel
// assumed, flagged for the pilot to confirm). It closes on an explicit close call or when the
// sweeper finds it idle; then it is an ordinary flight with its summary, exactly like an upload.
import { and, eq, sql } from 'drizzle-orm';
import type { Declaration } from '$lib/fuel';
import { UNCHANGED_DECLARATION } from '$lib/schemas/declaration';
import { can } from '$lib/permissions';
import { db, type Tx } from '../db';
import { aircraft, flights, memberships, recorders, users, type Aircraft, type Flight, type Recorder } from '../db/schema';
import { findAircraftOf } from '../aircraft/lookup';
import { recomputeSummary } from '../flights/summary';
import { attachWaitingPlan } from '../plans';
import { dropComputation } from './computation';
import type { LiveNotice } from './protocol';
import { NOTIFY_CHANNEL, noticePayloads } from './protocol';
import type { Queryable } from './samples';

// Advisory lock classes (two-key form): every write of one recorder, and the fuel computation of
// one flight, run one at a time across all app instances.
const LOCK_RECORDER = 5_120_001;
const LOCK_FLIGHT = 5_120_002;

export async function lockRecorder(q: Queryable, recorderId: string): Promise<void> {
	await q.execute(sql`select pg_advisory_xact_lock(${LOCK_RECORDER}, hashtext(${recorderId}))`);
}
export async function lockFlight(q: Queryable, flightId: string): Promise<void> {
	await q.execute(sql`select pg_advisory_xact_lock(${LOCK_FLIGHT}, hashtext(${flightId}))`);
}

/** Queues one NOTIFY; PostgreSQL delivers it to every listener when the transaction commits. */
export async function notify(q: Queryable, notice: LiveNotice): Promise<void> {
	await notifyAll(q, [notice]);
}

/** The news of many flights in as few NOTIFYs as fit (one statement), delivered at commit. */
export async function notifyAll(q: Queryable, notices: readonly LiveNotice[]): Promise<void> {
	if (notices.length === 0) return;
	const payloads = noticePayloads(notices);
	await q.execute(sql`select pg_notify(${NOTIFY_CHANNEL}, p) from unnest(${sql.param(payloads)}::text[]) with ordinality as u(p, i) order by i`);
}

/** A refusal inside a transaction: thrown to roll it back, answered with its status and body. */
export class LiveRefusal extends Error {
	constructor(
		readonly status: 400 | 403 | 404 | 409,
		readonly body: { error: string; [k: string]: unknown }
	) {
		super(body.error);
	}
}

/** The recorder's aircraft (aircraft/lookup.ts), refused in the recorder API's own words. */
export async function aircraftOf(q: Queryable, recorder: Recorder): Promise<Aircraft> {
	const a = await findAircraftOf(recorder, q);
	if (!a) throw new LiveRefusal(404, { error: 'The aircraft of this recorder no longer exists.' });
	return a;
}

/**
 * The recorder's aircraft for a write (open, samples): an archived aircraft takes no new flights
 * or samples until it is restored; closing a flight stays possible.
 */
export async function activeAircraftOf(q: Queryable, recorder: Recorder): Promise<Aircraft> {
	const a = await aircraftOf(q, recorder);
	if (a.archivedAt)
		throw new LiveRefusal(409, {
			error: `The aircraft ${a.registration} is archived: it takes no live flights or samples. An admin can restore it on its page, or register the recorder for another aircraft.`,
			field: 'aircraft'
		});
	return a;
}

export async function openFlightOf(q: Queryable, recorderId: string): Promise<Flight | null> {
	const [f] = await q
		.select()
		.from(flights)
		.where(and(eq(flights.recorderId, recorderId), eq(flights.status, 'open'), eq(flights.source, 'live')))
		.orderBy(flights.createdAt)
		.for('update')
		.limit(1);
	return f ?? null;
}

export interface NewFlight {
	declaration: Declaration | null;
	firstSeq: number;
	startedAt: Date;
	title?: string;
	pilotId?: string | null;
}

export async function createFlight(tx: Tx, recorder: Recorder, a: Aircraft, o: NewFlight): Promise<Flight> {
	const pilotId = o.pilotId ?? (await pilotFlyingToday(tx, recorder));
	const [f] = await tx
		.insert(flights)
		.values({
			orgId: recorder.orgId,
			aircraftId: a.id,
			recorderId: recorder.id,
			source: 'live',
			status: 'open',
			title: o.title ?? '',
			pilotId,
			startedAt: o.startedAt,
			declaration: o.declaration ?? UNCHANGED_DECLARATION,
			previousOnBoardL: a.lastOnBoardL,
			declarationConfirmed: o.declaration !== null,
			firstSeq: o.firstSeq,
			lastSeq: o.firstSeq - 1
		})
		.returning();
	// A plan made before this flight for this aircraft and about this time becomes its plan (and
	// may name the pilot and instructor: read the row back if so).
	if (await attachWaitingPlan(tx, f)) return (await tx.select().from(flights).where(eq(flights.id, f.id)).limit(1))[0];
	return f;
}

/** The UTC day of a moment, as the recorders' flying_on column holds it. */
export const utcDay = (d: Date) => d.toISOString().slice(0, 10);

/**
 * The pilot assigned to the recorder for today (UTC), if still a member of its organisation who
 * flies; otherwise null and the flight waits to be claimed.
 */
async function pilotFlyingToday(q: Queryable, recorder: Recorder): Promise<string | null> {
	if (!recorder.flyingPilotId || recorder.flyingOn !== utcDay(new Date())) return null;
	const [m] = await q
		.select({ role: memberships.role })
		.from(memberships)
		.where(and(eq(memberships.orgId, recorder.orgId), eq(memberships.userId, recorder.flyingPilotId)));
	return m && can(m.role, 'upload') ? recorder.flyingPilotId : null;
}

/** The member with this e-mail in the recorder's organisation, for "who is flying". */
export async function pilotIdOf(q: Queryable, orgId: string, email: string): Promise<string> {
	const [m] = await q
		.select({ id: users.id })
		.from(users)
		.innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.orgId, orgId)))
		.where(eq(sql`lower(${users.email})`, email.toLowerCase()))
		.limit(1);
	if (!m) throw new LiveRefusal(400, { error: `pilot ${email} is not a member of this recorder's organisation.`, field: 'pilot' });
	return m.id;
}

/**
 * Closes an open live flight inside `tx`: status, end time, the summary every list reads, and the
 * aircraft's last known fuel on board (through the replay side's recomputeSummary). False when it
 * was not open.
 */
export async function closeFlightIn(tx: Tx, flightId: string): Promise<boolean> {
	const [closed] = await tx
		.update(flights)
		.set({ status: 'closed', endedAt: sql`coalesce(${flights.lastSampleAt}, now())`, updatedAt: new Date() })
		.where(and(eq(flights.id, flightId), eq(flights.status, 'open')))
		.returning({ id: flights.id, lastSeq: flights.lastSeq });
	if (!closed) return false;
	await recomputeSummary(flightId, tx);
	await notify(tx, { f: flightId, s: closed.lastSeq, at: Date.now(), m: 1 });
	return true;
}

export async function touchRecorder(recorderId: string): Promise<void> {
	await db.update(recorders).set({ lastContactAt: new Date() }).where(eq(recorders.id, recorderId));
}

/** Explicit close by a recorder: its open flight, or the one named. */
export async function closeByRecorder(recorder: Recorder, flightId: string | undefined): Promise<{ flightId: string; closed: boolean }> {
	const result = await db.transaction(async (tx) => {
		await lockRecorder(tx, recorder.id);
		let target: Flight | null;
		if (flightId) {
			const [f] = await tx.select().from(flights).where(eq(flights.id, flightId)).for('update').limit(1);
			if (!f) throw new LiveRefusal(404, { error: 'No such flight.', field: 'flightId' });
			if (f.aircraftId !== recorder.aircraftId) throw new LiveRefusal(403, { error: 'This recorder writes only to flights of its own aircraft.', field: 'flightId' });
			target = f;
		} else target = await openFlightOf(tx, recorder.id);
		if (!target) throw new LiveRefusal(404, { error: 'This recorder has no open flight.' });
		await lockFlight(tx, target.id);
		const closed = await closeFlightIn(tx, target.id);
		return { flightId: target.id, closed };
	});
	dropComputation(result.flightId);
	return result;
}

export interface OpenOptions {
	declaration: Declaration | null;
	firstSeq?: number;
	title?: string;
	pilot?: string;
}

/**
 * Explicit open. A flight of this recorder that is open but has no samples yet is reused (a
 * retried open call); one with samples is closed first, since the recorder says a new one starts.
 */
export async function openByRecorder(recorder: Recorder, o: OpenOptions): Promise<{ flight: Flight; closedFlightId: string | null }> {
	const result = await db.transaction(async (tx) => {
		await lockRecorder(tx, recorder.id);
		const a = await activeAircraftOf(tx, recorder);
		const pilotId = o.pilot ? await pilotIdOf(tx, recorder.orgId, o.pilot) : null;
		const existing = await openFlightOf(tx, recorder.id);
		const firstSeq = o.firstSeq ?? 0;
		if (existing && existing.sampleCount === 0) {
			const [f] = await tx
				.update(flights)
				.set({
					declaration: o.declaration ?? UNCHANGED_DECLARATION,
					declarationConfirmed: o.declaration !== null,
					previousOnBoardL: a.lastOnBoardL,
					lastSeq: firstSeq - 1,
					title: o.title ?? existing.title,
					pilotId: pilotId ?? existing.pilotId,
					startedAt: new Date(),
					updatedAt: new Date()
				})
				.where(eq(flights.id, existing.id))
				.returning();
			await notify(tx, { f: f.id, s: f.lastSeq, at: Date.now(), m: 1 });
			return { flight: f, closedFlightId: null };
		}
		let closedFlightId: string | null = null;
		if (existing) {
			await lockFlight(tx, existing.id);
			await closeFlightIn(tx, existing.id);
			closedFlightId = existing.id;
		}
		const flight = await createFlight(tx, recorder, a, { declaration: o.declaration, firstSeq, startedAt: new Date(), title: o.title, pilotId });
		return { flight, closedFlightId };
	});
	if (result.closedFlightId) dropComputation(result.closedFlightId);
	dropComputation(result.flight.id);
	return result;
}
