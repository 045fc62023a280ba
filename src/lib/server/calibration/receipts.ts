// Pump receipts of an aircraft and the reconciliation they allow: the windows between fills to
// full, each with the flights started in it (their stored figures, never samples), the fuel
// pumped against the fuel Burndown computed, and the factors proposed (fuel/reconcile.ts).
import { and, asc, eq, gte, isNotNull, lt } from 'drizzle-orm';
import { belowPumpedRatio, reconcile, type ReconciliationWindow } from '$lib/fuel';
import type { ReceiptInput } from '$lib/schemas/pump';
import { db } from '../db';
import { calibrations, flightFigures, flights, pumpReceipts, type Aircraft, type PumpReceipt } from '../db/schema';
import type { Queryable } from '../flights/load';

export async function addReceipt(a: Aircraft, input: ReceiptInput, userId: string): Promise<PumpReceipt> {
	const [row] = await db
		.insert(pumpReceipts)
		.values({ aircraftId: a.id, at: input.at, airfield: input.airfield, amount: input.amount, unit: input.unit, amountL: input.amountL, filledToFull: input.filledToFull, note: input.note, createdBy: userId })
		.returning();
	return row;
}

/** Deletes one receipt of this aircraft; false when it is not the aircraft's. */
export async function deleteReceipt(aircraftId: string, receiptId: string): Promise<boolean> {
	const gone = await db.delete(pumpReceipts).where(and(eq(pumpReceipts.aircraftId, aircraftId), eq(pumpReceipts.id, receiptId))).returning({ id: pumpReceipts.id });
	return gone.length > 0;
}

export async function receiptsOf(aircraftId: string, q: Queryable = db): Promise<PumpReceipt[]> {
	return q.select().from(pumpReceipts).where(eq(pumpReceipts.aircraftId, aircraftId)).orderBy(asc(pumpReceipts.at), asc(pumpReceipts.id));
}

export interface WindowFlightRow {
	id: string;
	startedAt: Date;
	title: string;
	status: 'open' | 'closed';
	fuelUsedL: number | null;
	meterFactor: number | null;
	engineTimeS: number;
	gapCount: number;
	gapTimeS: number;
}

export interface Reconciliation {
	receipts: PumpReceipt[];
	windows: ReconciliationWindow[];
	/** Every flight of any window, by id. */
	flights: Record<string, WindowFlightRow>;
	/** pumped ÷ computed that persists over the newest windows (fuel/reconcile.ts belowPumpedRatio). */
	belowPumpedRatio: number | null;
}

/** The aircraft's receipts and every fill-up-to-fill-up window, newest first. */
export async function reconciliationOf(a: Aircraft, q: Queryable = db): Promise<Reconciliation> {
	const receipts = await receiptsOf(a.id, q);
	const fulls = receipts.filter((r) => r.filledToFull);
	let rows: WindowFlightRow[] = [];
	if (fulls.length >= 2) {
		const found = await q
			.select({
				id: flights.id,
				startedAt: flights.startedAt,
				title: flights.title,
				status: flights.status,
				fuelUsedL: flightFigures.fuelUsedL,
				meterFactor: flightFigures.meterFactor,
				engineTimeS: flightFigures.engineTimeS,
				gapCount: flightFigures.gapCount,
				gapTimeS: flightFigures.gapTimeS
			})
			.from(flights)
			.leftJoin(flightFigures, eq(flightFigures.flightId, flights.id))
			.where(and(eq(flights.aircraftId, a.id), gte(flights.startedAt, fulls[0].at), lt(flights.startedAt, fulls[fulls.length - 1].at)))
			.orderBy(asc(flights.startedAt));
		rows = found.map((r) => ({ ...r, engineTimeS: r.engineTimeS ?? 0, gapCount: r.gapCount ?? 0, gapTimeS: r.gapTimeS ?? 0 }));
	}
	// The sensor's K-factor at each window's start: the one its pulses were counted with.
	const entries = (await q.select().from(calibrations).where(and(eq(calibrations.aircraftId, a.id), isNotNull(calibrations.inForceFrom)))).sort(
		(x, y) => x.inForceFrom!.getTime() - y.inForceFrom!.getTime() || x.createdAt.getTime() - y.createdAt.getTime()
	);
	const kFactorAt = (t: number) => {
		let k = entries.length === 0 ? a.kFactor : null;
		for (const e of entries) if (e.inForceFrom!.getTime() / 1000 <= t) k = e.kFactorNew;
		return k;
	};
	const windows = reconcile(
		receipts.map((r) => ({ id: r.id, at: r.at.getTime() / 1000, amountL: r.amountL, filledToFull: r.filledToFull })),
		rows.map((r) => ({ ...r, startedAt: r.startedAt.getTime() / 1000 })),
		{ kFactorOld: kFactorAt }
	);
	return { receipts, windows, flights: Object.fromEntries(rows.map((r) => [r.id, r])), belowPumpedRatio: belowPumpedRatio(windows) };
}
