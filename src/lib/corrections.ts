// The audit trail of a flight's fuel inputs as shown: the one wording the replay page uses for each
// correction (the snapshots themselves are in $lib/wire/corrections). Shared by the server (which
// limits reasons) and the page (which lists them in the viewer's unit).
import type { FuelEventKind } from '$lib/fuel';
import { declarationKindLabels } from '$lib/schemas/declaration';
import { isDeclarationSnapshot, type CorrectionView, type DeclarationSnapshot, type EventSnapshot } from '$lib/wire/corrections';

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
	const text = (s: CorrectionView['before'], none: string) => (s === null ? none : isDeclarationSnapshot(s) ? declarationText(s, fuel) : eventText(s, fuel));
	if (c.kind === 'declaration') return { what: 'Fuel at engine start', from: text(c.before, '—'), to: text(c.after, '—') };
	return { what: c.kind === 'eventAdded' ? 'Fuel event added' : 'Fuel event removed', from: text(c.before, 'none'), to: text(c.after, 'none') };
}
