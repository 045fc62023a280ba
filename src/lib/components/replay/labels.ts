// Our words for the engine's codes (phases, alarms, flags, warnings), shared by the replay and
// live pages and the fuel-log export, so a phase is called the same thing everywhere.
import { FLAG_EVENT, FLAG_FLOW_HELD, FLAG_GAP_FILLED, FLAG_REJECTED, type AlarmKind, type FuelEventKind } from '$lib/fuel';

export const phaseLabels: readonly string[] = ['Not known', 'Engine stopped', 'Taxi', 'Climb', 'Cruise', 'Descent'];

/** Short ids for CSV cells. */
export const phaseIds: readonly string[] = ['unknown', 'stopped', 'taxi', 'climb', 'cruise', 'descent'];

export const alarmLabels: Record<AlarmKind, string> = {
	lowFuel: 'Low fuel on board',
	lowEndurance: 'Low endurance',
	negativeReserve: 'Short of reserve at the next waypoint'
};

export const eventLabels: Record<FuelEventKind, string> = {
	added: 'Fuel added',
	removed: 'Fuel removed',
	toFull: 'Filled to full',
	toLower: 'Filled to the lower level',
	resetUsed: 'Fuel used reset'
};

/** Flag bits as words, for the export and the sample inspector. */
export function flagWords(flags: number): string[] {
	const words: string[] = [];
	if (flags & FLAG_REJECTED) words.push('rejected');
	if (flags & FLAG_GAP_FILLED) words.push('gap-filled');
	if (flags & FLAG_FLOW_HELD) words.push('flow-held');
	if (flags & FLAG_EVENT) words.push('fuel-event');
	return words;
}

/**
 * Our words for a stretch without samples: with the engine stopped on both sides it is a stop
 * with the recorder off, otherwise a dropout in flight (filled with the higher adjacent flow).
 */
export function gapTitle(g: { kind: 'time' | 'flow'; start: number; end: number; filledFlowLph: number }): string {
	const minutes = (g.end - g.start) / 60;
	const length = minutes >= 2 ? `${Math.round(minutes)} min` : `${Math.round(g.end - g.start)} s`;
	if (g.kind === 'flow') return `No flow readings for ${length}`;
	if (!(g.filledFlowLph > 0)) return `No samples for ${length}, engine stopped (a stop with the recorder off)`;
	return `Recorder dropout, ${length}`;
}
