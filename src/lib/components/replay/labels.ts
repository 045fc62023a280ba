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
