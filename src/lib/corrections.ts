// The audit trail of a flight's fuel inputs, as stored and as shown: the snapshots written before
// and after each correction (canonical litres) and the one wording the replay page uses for them.
// Shared by the server (which writes them) and the page (which lists them in the viewer's unit).
import type { Declaration, FuelEventKind } from '$lib/fuel';
import { declarationKindLabels } from '$lib/schemas/declaration';

export type CorrectionKind = 'declaration' | 'eventAdded' | 'eventRemoved';

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

export interface CorrectionView {
	id: string;
	at: Date;
	/** The member's name; null once the account is gone. */
	by: string | null;
	kind: CorrectionKind;
	before: DeclarationSnapshot | EventSnapshot | null;
	after: DeclarationSnapshot | EventSnapshot | null;
	reason: string;
}

/** Most a reason may say; the form and the server share it. */
export const REASON_MAX = 200;

const eventLabels: Record<FuelEventKind, string> = {
	added: 'fuel added',
	removed: 'fuel removed',
	toFull: 'filled to full',
	toLower: 'filled to the lower level',
	resetUsed: 'fuel used counter reset'
};

type FuelText = (litres: number) => string;

function declarationText(s: DeclarationSnapshot, fuel: FuelText): string {
	const d = s.declaration;
	const label = declarationKindLabels[d.kind];
	const amount = 'amountL' in d ? ` ${fuel(d.amountL)}` : '';
	const previous = (d.kind === 'added' || d.kind === 'removed') && s.previousOnBoardL !== null ? ` (on board before: ${fuel(s.previousOnBoardL)})` : '';
	return `${label}${amount}${previous}${s.confirmed ? '' : ', assumed'}`;
}

function eventText(s: EventSnapshot, fuel: FuelText): string {
	const amount = s.amountL !== null ? ` ${fuel(s.amountL)}` : '';
	return `${eventLabels[s.kind]}${amount} at ${s.t.slice(11, 19)} UTC${s.note ? ` (“${s.note}”)` : ''}`;
}

/** One line of the "Corrections" list: what changed, from what, to what. */
export function describeCorrection(c: Pick<CorrectionView, 'kind' | 'before' | 'after'>, fuel: FuelText): { what: string; from: string; to: string } {
	if (c.kind === 'declaration') {
		return {
			what: 'Fuel at engine start',
			from: c.before ? declarationText(c.before as DeclarationSnapshot, fuel) : '—',
			to: c.after ? declarationText(c.after as DeclarationSnapshot, fuel) : '—'
		};
	}
	return {
		what: c.kind === 'eventAdded' ? 'Fuel event added' : 'Fuel event removed',
		from: c.before ? eventText(c.before as EventSnapshot, fuel) : 'none',
		to: c.after ? eventText(c.after as EventSnapshot, fuel) : 'none'
	};
}
