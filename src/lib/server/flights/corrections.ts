// Writing and reading the audit trail of a flight's fuel inputs (fuel_corrections): each change of
// the declaration or a fuel event records who, when, from what to what and why, in the
// transaction of the change, so there is never a change without its record or the reverse.
import { desc, eq } from 'drizzle-orm';
import type { CorrectionKind, CorrectionSnapshot, CorrectionView, DeclarationSnapshot, EventSnapshot } from '$lib/wire/corrections';
import { db } from '../db';
import { fuelCorrections, users, type Flight, type FuelEventRow } from '../db/schema';
import type { Queryable } from './load';

export function declarationSnapshot(f: Pick<Flight, 'declaration' | 'previousOnBoardL' | 'declarationConfirmed'>): DeclarationSnapshot {
	return { declaration: f.declaration, previousOnBoardL: f.previousOnBoardL, confirmed: f.declarationConfirmed };
}

export function eventSnapshot(e: Pick<FuelEventRow, 't' | 'kind' | 'amountL' | 'note'>): EventSnapshot {
	return { t: e.t.toISOString(), kind: e.kind, amountL: e.amountL, note: e.note };
}

export interface Correction {
	flightId: string;
	/** Null when no member made it (a script calling the service directly). */
	userId: string | null;
	kind: CorrectionKind;
	before: CorrectionSnapshot | null;
	after: CorrectionSnapshot | null;
	reason: string;
}

/** Call inside the transaction that makes the change. */
export async function recordCorrection(q: Queryable, c: Correction): Promise<void> {
	await q.insert(fuelCorrections).values(c);
}

/** A flight's corrections, newest first; whoever may view the flight may read them. */
export async function listCorrections(flightId: string, q: Queryable = db): Promise<CorrectionView[]> {
	const rows = await q
		.select({ id: fuelCorrections.id, at: fuelCorrections.at, by: users.name, kind: fuelCorrections.kind, before: fuelCorrections.before, after: fuelCorrections.after, reason: fuelCorrections.reason })
		.from(fuelCorrections)
		.leftJoin(users, eq(users.id, fuelCorrections.userId))
		.where(eq(fuelCorrections.flightId, flightId))
		.orderBy(desc(fuelCorrections.at), desc(fuelCorrections.id));
	return rows;
}

/** Who made a correction and why (the reason may be blank). */
export interface Editor {
	userId: string;
	reason: string;
}

/** One line in the audit trail when the saved declaration differs from the stored one. */
export async function recordDeclarationChange(q: Queryable, before: Flight, after: Flight, by: Editor | null): Promise<void> {
	const from = declarationSnapshot(before);
	const to = declarationSnapshot(after);
	if (JSON.stringify(from) === JSON.stringify(to)) return;
	await recordCorrection(q, { flightId: after.id, userId: by?.userId ?? null, kind: 'declaration', before: from, after: to, reason: by?.reason ?? '' });
}
