// Our words for the engine's codes (phases, alarms, flags, warnings), shared by the replay and
// live pages and the fuel-log export, so a phase is called the same thing everywhere.
import {
	ARRIVAL_EATS_INTO,
	ARRIVAL_KEEPS,
	ARRIVAL_NO_RESERVE,
	ARRIVAL_NONE,
	ARRIVAL_RUNS_OUT,
	FLAG_EVENT,
	FLAG_FLOW_FILLED,
	FLAG_FLOW_HELD,
	FLAG_GAP_FILLED,
	FLAG_REJECTED,
	type AlarmKind,
	type CruiseBasis,
	type FuelEventKind,
	type VerdictState
} from '$lib/fuel';

export const phaseLabels: readonly string[] = ['Not known', 'Engine stopped', 'Taxi', 'Climb', 'Cruise', 'Descent'];

/** Short ids for CSV cells. */
export const phaseIds: readonly string[] = ['unknown', 'stopped', 'taxi', 'climb', 'cruise', 'descent'];

export const alarmLabels: Record<AlarmKind, string> = {
	lowFuel: 'Low fuel on board',
	lowEndurance: 'Low endurance',
	arrivalBelowReserve: 'Arrives below the reserve at the next waypoint'
};

/**
 * Arrival at the next waypoint, by the engine's ARRIVAL_* code: fuel left on arrival against the
 * reserve amount (never minutes at the present flow). `tone` picks the colour.
 */
export const arrivalWords: Record<number, { id: string; text: string; tone: 'steady' | 'watch' | 'act' | 'none' }> = {
	[ARRIVAL_NONE]: { id: '', text: 'No waypoint figures here (on the ground, or no distance to go recorded).', tone: 'none' },
	[ARRIVAL_KEEPS]: { id: 'keeps', text: 'Keeps the reserve on arrival.', tone: 'steady' },
	[ARRIVAL_EATS_INTO]: { id: 'eats-into', text: 'Eats into the reserve: arrives with less than the reserve amount.', tone: 'watch' },
	[ARRIVAL_RUNS_OUT]: { id: 'runs-out', text: 'Runs out before the waypoint at this flow.', tone: 'act' },
	[ARRIVAL_NO_RESERVE]: { id: 'no-reserve', text: 'Arrives with fuel left; no reserve amount to compare with.', tone: 'none' }
};

/** The flight's verdict in our words. */
export const verdictLabels: Record<VerdictState, string> = {
	kept: 'Reserve kept',
	notKept: 'Landed below the reserve',
	noReserve: 'No reserve amount to judge'
};

/** Where the normal-cruise flow behind the reserve comes from. */
export const basisLabels: Record<CruiseBasis, string> = {
	baseline: 'set normal-cruise flow',
	measured: "this flight's measured cruise",
	recent: "the aircraft's recent cruise",
	none: 'no normal-cruise flow'
};

/** How every rounded margin is rounded: say it wherever one is shown. */
export const MARGIN_ROUNDING_NOTE = 'Margins are rounded down, never up.';

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
	if (flags & FLAG_FLOW_FILLED) words.push('flow-filled');
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
