// The audit trail of a flight's fuel inputs as stored (fuel_corrections, its jsonb columns typed
// with CorrectionSnapshot) and as sent to the replay page (CorrectionView). Only type imports from
// $lib here: the database schema imports this module when drizzle-kit reads it.
import type { Declaration, FuelEventKind } from '$lib/fuel';

/** The one list of correction kinds; the database enum takes it. */
export const CORRECTION_KINDS = ['declaration', 'eventAdded', 'eventRemoved'] as const;
export type CorrectionKind = (typeof CORRECTION_KINDS)[number];

export interface DeclarationSnapshot {
	declaration: Declaration;
	previousOnBoardL: number | null;
	/** False while the start fuel was only assumed (a live flight opened without a declaration). */
	confirmed: boolean;
}

export interface EventSnapshot {
	/** ISO time of the event. */
	t: string;
	kind: FuelEventKind;
	amountL: number | null;
	note: string;
}

/** What a correction's `before` and `after` hold (canonical litres); null for "no such thing". */
export type CorrectionSnapshot = DeclarationSnapshot | EventSnapshot;

export function isDeclarationSnapshot(s: CorrectionSnapshot): s is DeclarationSnapshot {
	return 'declaration' in s;
}

export interface CorrectionView {
	id: string;
	at: Date;
	/** The member's name; null once the account is gone. */
	by: string | null;
	kind: CorrectionKind;
	before: CorrectionSnapshot | null;
	after: CorrectionSnapshot | null;
	reason: string;
}
