// The aircraft's dated calibration: which meter factor and K-factor were in force at a moment
// (a flight uses those in force at its engine start), and writing a new entry — from a
// reconciliation or by hand — with its author and old → new, recomputing in the same transaction
// the stored figures of exactly the flights the entry changes.
import { and, asc, count, desc, eq, gt, gte, isNotNull, lt, lte, sql, type SQL } from 'drizzle-orm';
import type { Factors } from '$lib/fuel';
import { db } from '../db';
import { aircraft as aircraftTable, calibrations, flights, users, type Aircraft, type Calibration } from '../db/schema';
import { lockAircraftFlights, recomputeFlights } from '../flights/summary';
import { withRecomputeJob, type Progress } from '../flights/recompute-jobs';
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
	/** Where the entry stops applying; null = up to now and on. */
	until: Date | null;
	/** What ends it: the end date chosen, the next dated entry, or nothing. */
	endsAt: 'chosen' | 'nextEntry' | null;
	flights: number;
}

/** Where an entry from `from`, optionally chosen to end at `to`, stops: the chosen end or the next entry, whichever is first. */
async function rangeEnd(aircraftId: string, from: Date, to: Date | null, q: Queryable): Promise<Pick<AffectedRange, 'until' | 'endsAt'>> {
	const next = await nextEntryAfter(aircraftId, from, q);
	if (to && (!next || to.getTime() < next.getTime())) return { until: to, endsAt: 'chosen' };
	return next ? { until: next, endsAt: 'nextEntry' } : { until: null, endsAt: null };
}

/** How many flights an entry in force from `from` (until `to`, if given) would apply to: the preview before applying. */
export async function flightsAffected(aircraftId: string, from: Date, to: Date | null = null, q: Queryable = db): Promise<AffectedRange> {
	const end = await rangeEnd(aircraftId, from, to, q);
	const [{ n }] = await q.select({ n: count() }).from(flights).where(rangeOf(aircraftId, from, end.until));
	return { from, ...end, flights: n };
}

export interface NewEntry {
	source: 'reconciliation' | 'hand';
	inForceFrom: Date;
	/** Optional end of the range: flights from then on keep the factors in force before. */
	inForceUntil?: Date | null;
	factors: Factors;
	indicatedL?: number | null;
	pumpedL?: number | null;
	receiptFromId?: string | null;
	receiptToId?: string | null;
	note?: string;
}

export type WriteResult = { ok: true; entry: Calibration; range: AffectedRange } | { ok: false; field: 'inForceFrom' | 'inForceUntil'; message: string };

const TIME_PROBLEM = 'Choose an “in force from” time in the past (or now), after 1970.';
const UNTIL_PROBLEM = 'Choose an “until” time after the “in force from” time and not in the future, or leave it blank.';
const timeOk = (from: Date, now: Date) => Number.isFinite(from.getTime()) && from.getTime() > BEGINNING.getTime() && from.getTime() <= now.getTime();

/** The entry's times, checked before anything is written. */
export function rangeProblem(input: Pick<NewEntry, 'inForceFrom' | 'inForceUntil'>, now = new Date()): Extract<WriteResult, { ok: false }> | null {
	if (!timeOk(input.inForceFrom, now)) return { ok: false, field: 'inForceFrom', message: TIME_PROBLEM };
	const to = input.inForceUntil;
	if (to && !(Number.isFinite(to.getTime()) && to.getTime() > input.inForceFrom.getTime() && to.getTime() <= now.getTime())) return { ok: false, field: 'inForceUntil', message: UNTIL_PROBLEM };
	return null;
}

/**
 * Writes one dated entry inside `tx`: keeps the factors in force before it as an 'initial' entry
 * the first time, records old → new (the factors in force at `inForceFrom`), and recomputes every
 * flight from `inForceFrom` up to the next entry or the chosen end, one flight at a time, reporting
 * to `progress`. A chosen end before the next entry writes a 'rangeEnd' entry there bringing the
 * old factors back, so the flights after it keep their figures. Refreshes the aircraft's factors
 * now in force. Call with the aircraft's flights locked (lockAircraftFlights).
 */
export async function writeEntryIn(tx: Queryable, a: Aircraft, input: NewEntry, userId: string | null, now = new Date(), progress?: Progress): Promise<WriteResult> {
	const problem = rangeProblem(input, now);
	if (problem) return problem;
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
	const range = await flightsAffected(a.id, input.inForceFrom, input.inForceUntil ?? null, tx);
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
	if (range.endsAt === 'chosen' && range.until) {
		// No entry lies between the two times, so the factors in force at the end were `old`.
		await tx.insert(calibrations).values({
			aircraftId: a.id,
			source: 'rangeEnd',
			meterFactorOld: input.factors.meterFactor,
			meterFactorNew: old.meterFactor,
			kFactorOld: input.factors.kFactor,
			kFactorNew: old.kFactor,
			inForceFrom: range.until,
			note: `End of the range from ${input.inForceFrom.toISOString().slice(0, 16).replace('T', ' ')} UTC.`,
			createdBy: userId,
			createdAt: now
		});
	}
	// The aircraft row carries the factors in force now: new flights and the aircraft page read it.
	const current = await entryInForce(a.id, now, tx);
	if (current) await tx.update(aircraftTable).set({ meterFactor: current.meterFactorNew, kFactor: current.kFactorNew, updatedAt: now }).where(eq(aircraftTable.id, a.id));
	await recomputeFlights(ids.map((r) => r.id), tx, progress);
	return { ok: true, entry, range };
}

/**
 * writeEntryIn in its own transaction, the aircraft's flights locked first, its progress recorded
 * as a recompute job the page can poll (done once the transaction committed).
 */
export async function writeEntry(a: Aircraft, input: NewEntry, userId: string | null, opts: { everyMs?: number; onBegin?: (jobId: string) => void } = {}): Promise<WriteResult> {
	const now = new Date();
	// Checked before the transaction, so a refused entry writes nothing at all.
	const problem = rangeProblem(input, now);
	if (problem) return problem;
	return withRecomputeJob(
		a.id,
		'calibration',
		userId,
		(progress) =>
			db.transaction(async (tx) => {
				await lockAircraftFlights(a.id, tx);
				const [fresh] = await tx.select().from(aircraftTable).where(eq(aircraftTable.id, a.id)).for('no key update');
				return writeEntryIn(tx, fresh ?? a, input, userId, now, progress);
			}),
		opts
	);
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
