// The aircraft's dated calibration: which meter factor and K-factor were in force at a moment
// (a flight uses those in force at its engine start), and writing a new entry — from a
// reconciliation or by hand — with its author and old → new, recomputing in the same transaction
// the stored figures of exactly the flights the entry changes.
import { and, asc, count, desc, eq, gt, gte, isNotNull, lt, lte, sql, type SQL } from 'drizzle-orm';
import type { Factors } from '$lib/fuel';
import { db } from '../db';
import { aircraft as aircraftTable, calibrations, flights, users, type Aircraft, type Calibration } from '../db/schema';
import { lockAircraftFlights, recomputeSummary } from '../flights/summary';
import type { Queryable } from '../flights/load';
import { BEGINNING, entryInForce } from './in-force';

export { BEGINNING, aircraftAt, entryInForce } from './in-force';

/** The next applied entry after `from`: where a new entry written at `from` stops applying. */
async function nextEntryAfter(aircraftId: string, from: Date, q: Queryable): Promise<Date | null> {
	const [row] = await q
		.select({ at: calibrations.inForceFrom })
		.from(calibrations)
		.where(and(eq(calibrations.aircraftId, aircraftId), gt(calibrations.inForceFrom, from)))
		.orderBy(asc(calibrations.inForceFrom))
		.limit(1);
	return row?.at ?? null;
}

function rangeOf(aircraftId: string, from: Date, until: Date | null): SQL {
	const where = [eq(flights.aircraftId, aircraftId), gte(flights.startedAt, from)];
	if (until) where.push(lt(flights.startedAt, until));
	return and(...where)!;
}

export interface AffectedRange {
	from: Date;
	/** The next dated entry's time, where this one stops applying; null = up to now and on. */
	until: Date | null;
	flights: number;
}

/** How many flights an entry in force from `from` would apply to (the preview before applying). */
export async function flightsAffected(aircraftId: string, from: Date, q: Queryable = db): Promise<AffectedRange> {
	const until = await nextEntryAfter(aircraftId, from, q);
	const [{ n }] = await q.select({ n: count() }).from(flights).where(rangeOf(aircraftId, from, until));
	return { from, until, flights: n };
}

export interface NewEntry {
	source: 'reconciliation' | 'hand';
	inForceFrom: Date;
	factors: Factors;
	indicatedL?: number | null;
	pumpedL?: number | null;
	receiptFromId?: string | null;
	receiptToId?: string | null;
	note?: string;
}

export type WriteResult = { ok: true; entry: Calibration; range: AffectedRange } | { ok: false; field: 'inForceFrom'; message: string };

/**
 * Writes one dated entry inside `tx`: keeps the factors in force before it as an 'initial' entry
 * the first time, records old → new (the factors in force at `inForceFrom`), refreshes the
 * aircraft's factors now in force, and recomputes every flight from `inForceFrom` up to the next
 * entry — one flight at a time. Call with the aircraft's flights locked (lockAircraftFlights).
 */
const TIME_PROBLEM = 'Choose an “in force from” time in the past (or now), after 1970.';
const timeOk = (from: Date, now: Date) => Number.isFinite(from.getTime()) && from.getTime() > BEGINNING.getTime() && from.getTime() <= now.getTime();

export async function writeEntryIn(tx: Queryable, a: Aircraft, input: NewEntry, userId: string | null, now = new Date()): Promise<WriteResult> {
	if (!timeOk(input.inForceFrom, now)) return { ok: false, field: 'inForceFrom', message: TIME_PROBLEM };
	let before = await entryInForce(a.id, input.inForceFrom, tx);
	const [anyEntry] = await tx.select({ id: calibrations.id }).from(calibrations).where(and(eq(calibrations.aircraftId, a.id), isNotNull(calibrations.inForceFrom))).limit(1);
	if (!anyEntry) {
		// Every flight so far was computed with the aircraft's own factors: keep them as the first entry.
		[before] = await tx
			.insert(calibrations)
			.values({ aircraftId: a.id, source: 'initial', meterFactorOld: a.meterFactor, meterFactorNew: a.meterFactor, kFactorOld: a.kFactor, kFactorNew: a.kFactor, inForceFrom: BEGINNING, createdBy: null, createdAt: new Date(now.getTime() - 1), note: 'Factors in force before dated calibration.' })
			.returning();
	}
	const old: Factors = before ? { meterFactor: before.meterFactorNew, kFactor: before.kFactorNew } : { meterFactor: a.meterFactor, kFactor: a.kFactor };
	const range = await flightsAffected(a.id, input.inForceFrom, tx);
	const ids = await tx.select({ id: flights.id }).from(flights).where(rangeOf(a.id, range.from, range.until)).orderBy(asc(flights.startedAt));
	const [entry] = await tx
		.insert(calibrations)
		.values({
			aircraftId: a.id,
			source: input.source,
			indicatedL: input.indicatedL ?? null,
			pumpedL: input.pumpedL ?? null,
			meterFactorOld: old.meterFactor,
			meterFactorNew: input.factors.meterFactor,
			kFactorOld: old.kFactor,
			kFactorNew: input.factors.kFactor,
			inForceFrom: input.inForceFrom,
			receiptFromId: input.receiptFromId ?? null,
			receiptToId: input.receiptToId ?? null,
			flightsRecomputed: ids.length,
			note: input.note ?? '',
			createdBy: userId,
			createdAt: now
		})
		.returning();
	// The aircraft row carries the factors in force now: new flights and the aircraft page read it.
	const current = await entryInForce(a.id, now, tx);
	if (current) await tx.update(aircraftTable).set({ meterFactor: current.meterFactorNew, kFactor: current.kFactorNew, updatedAt: now }).where(eq(aircraftTable.id, a.id));
	for (const { id } of ids) await recomputeSummary(id, tx);
	return { ok: true, entry, range };
}

/** writeEntryIn in its own transaction, the aircraft's flights locked first. */
export async function writeEntry(a: Aircraft, input: NewEntry, userId: string | null): Promise<WriteResult> {
	const now = new Date();
	// Checked before the transaction, so a refused entry writes nothing at all.
	if (!timeOk(input.inForceFrom, now)) return { ok: false, field: 'inForceFrom', message: TIME_PROBLEM };
	return db.transaction(async (tx) => {
		await lockAircraftFlights(a.id, tx);
		const [fresh] = await tx.select().from(aircraftTable).where(eq(aircraftTable.id, a.id)).for('no key update');
		return writeEntryIn(tx, fresh ?? a, input, userId, now);
	});
}

/** The aircraft's calibration history with each entry's author, newest in force first (entries recorded only last). */
export async function calibrationHistory(aircraftId: string, q: Queryable = db): Promise<(Calibration & { author: string | null })[]> {
	const rows = await q
		.select({ c: calibrations, author: users.name })
		.from(calibrations)
		.leftJoin(users, eq(users.id, calibrations.createdBy))
		.where(eq(calibrations.aircraftId, aircraftId))
		.orderBy(sql`${calibrations.inForceFrom} desc nulls last`, desc(calibrations.createdAt))
		.limit(200);
	return rows.map((r) => ({ ...r.c, author: r.author }));
}
