// Words for codes shown to people, one map per list, so a code is worded the same on every page,
// in exports and in e-mails; each map is keyed by the list the code comes from, so a new code
// without words fails the type check.
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
	type BandPosition,
	type BaselinePhase,
	type CruiseBasis,
	type FuelEventKind,
	type HighBurnCause,
	type StopKind,
	type VerdictState
} from '$lib/fuel';
import type { DebriefStatus, PlanImportFormat } from '$lib/wire/plan';
import type { RecomputeReason } from '$lib/wire/recompute';
import type { ApiTokenScope } from '$lib/permissions';
import type { LiveState } from '$lib/live-state';
import { utcClock } from '$lib/format/time';

/**
 * Names of the fuel figures, the same on the replay page's figures, the flight summary and the
 * exports' columns (which add the unit in brackets).
 */
export const figureLabels = {
	time: 'Time',
	elapsed: 'Elapsed',
	phase: 'Phase',
	onBoard: 'Fuel on board',
	endurance: 'Endurance at this flow',
	flow: 'Fuel flow',
	used: 'Fuel used',
	timeToGo: 'Time to go',
	fuelToGetThere: 'Fuel to get there',
	leftOnArrival: 'Left on arrival',
	againstReserve: 'Against the reserve',
	specificRange: 'Specific range',
	groundSpeed: 'Ground speed',
	altitude: 'Altitude',
	latitude: 'Latitude',
	longitude: 'Longitude',
	distanceToGo: 'Distance to go',
	waypoint: 'Waypoint',
	reserveAmount: 'Reserve amount',
	reserveBasis: 'Reserve basis',
	arrival: 'Arrival',
	alarms: 'Alarms',
	flags: 'Flags',
	onBoardAtShutdown: 'On board at shutdown',
	blockTime: 'Block time',
	engineTime: 'Engine time',
	averageFlow: 'Average flow',
	maxFlow: 'Highest flow',
	cruiseFlow: 'Cruise flow',
	cruiseSpecificRange: 'Cruise specific range',
	distance: 'Distance',
	thinnestMargin: 'Thinnest airborne margin at a waypoint',
	belowReserve: 'Fuel below the reserve',
	declaration: 'Declared at engine start',
	declaredAmount: 'Declared amount',
	startFuel: 'Fuel on board at engine start',
	fuelEvent: 'Fuel event',
	notes: 'Notes',
	note: 'Note',
	leg: 'Leg'
} as const;

export const apiTokenScopeLabels: Record<ApiTokenScope, string> = {
	read: 'Read only',
	upload: 'Read and upload'
};

export const debriefStatusLabels: Record<DebriefStatus, string> = {
	draft: 'Draft — not yet shown to the student',
	published: 'Published to the student'
};

export const planImportFormatLabels: Record<PlanImportFormat, string> = {
	csv: 'CSV of legs',
	gpx: 'GPX 1.1 route'
};

export const baselinePhaseLabels: Record<BaselinePhase, string> = {
	taxi: 'Taxi',
	climb: 'Climb',
	cruise: 'Cruise',
	descent: 'Descent'
};

/** Possible causes of a high burn, as possibilities for the owner to check, never a diagnosis. */
export const highBurnCauseLabels: Record<HighBurnCause, string> = {
	sensorCalibration: 'Every phase is up by about the same factor: the flow sensor’s calibration may have drifted.',
	belowPumped: 'Computed fuel has stayed below the fuel pumped at fill-ups: the calibration, or a leak — check the aircraft.',
	mixtureNotLeaned: 'Cruise flow stayed high after the top of climb with no leaning step: the mixture may not have been leaned.',
	longClimbFullPower: 'A long climb, or one at full power for longer than usual.',
	longGroundRunning: 'The engine ran on the ground for longer than usual (taxi, run-up, waiting).'
};

export const baselineSourceLabels = {
	learned: 'learned from its flights',
	manual: 'set by hand',
	configured: 'the aircraft’s configured cruise flow (too few flights to learn from)'
} as const;

/** A leaning moment on the replay timeline. */
export const leaningTitle = 'Mixture leaned';

// The engine's codes for the replay and live pages, the fuel-log export and the alarm e-mails.

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
	resetUsed: 'Fuel used counter reset'
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
/** How a stop between two logbook legs was seen (the rule in $lib/fuel/legs.ts). */
export const stopKindLabels: Record<StopKind, string> = {
	engineOff: 'engine stopped on the ground',
	recorderGap: 'recorder off on the ground'
};

/** A logbook leg's name, counted from 1. */
export const legName = (k: number): string => `Leg ${k + 1}`;

/** Beside an average flow: the engine time it was divided by. */
export const flowOverEngineTime = (engineTime: string): string => `over ${engineTime} engine time`;

/** Where a calibration entry's factors came from. */
export const calibrationSourceLabels = {
	reconciliation: 'From a reconciliation with fuel pumped',
	hand: 'Set by hand',
	initial: 'Factors before dated history',
	rangeEnd: 'End of a dated range: the factors before it again'
} as const;

/** What asked for a recompute of an aircraft's flights (wire/recompute.ts). */
export const recomputeReasonLabels = {
	calibration: 'New factors applied to past flights',
	aircraft: 'Aircraft fuel profile changed'
} as const satisfies Record<RecomputeReason, string>;

/** A month's fuel per engine hour against the aircraft's usual band (fuel/baseline.ts). */
export const bandPositionLabels = {
	below: 'below usual',
	within: 'within usual',
	above: 'above usual'
} as const satisfies Record<BandPosition, string>;
// The live page's states (src/lib/live-state.ts): the badge beside the registration.
export const liveStateLabels: Record<LiveState, string> = {
	connecting: 'connecting…',
	'link-lost': 'your connection is lost',
	denied: 'not yours to watch',
	ended: 'flight finished',
	'engine-stopped': 'engine stopped',
	'no-data': 'no data from the aircraft',
	live: 'live'
};

/** "acknowledged by Ann at 10:14:05 UTC", from epoch seconds. */
export function ackWords(by: string, atS: number): string {
	return `acknowledged by ${by} at ${utcClock(atS, true)} UTC`;
}

/**
 * What the alarm banner says about e-mail: only that e-mails went out when they did, and to how
 * many watchers; nothing while the e-mail step has not run yet.
 */
export function alarmMailWords(a: { emailed: boolean; mailedTo: number | null }): string {
	if (a.mailedTo === null) return '';
	if (a.mailedTo > 0) return `e-mailed to ${a.mailedTo} ${a.mailedTo === 1 ? 'watcher' : 'watchers'}`;
	return a.emailed ? 'no watcher was e-mailed' : '';
}

/** The live page's scrubber: following the newest sample, and the one control back to it. */
export const liveFollowWords = {
	following: 'Following the newest sample',
	backToNow: 'Back to now'
} as const;

/** The live page's large figures at the newest sample. */
export const cockpitWords = {
	title: 'Now, at the newest sample',
	onBoard: 'Fuel on board',
	endurance: 'Endurance at this flow',
	arrival: 'Left on arrival',
	againstReserve: 'against the reserve',
	flow: 'Fuel flow'
} as const;

/** The live page's own sentences, beside its states. */
export const liveWords = {
	watch: 'Watch (alarm e-mails)',
	watching: 'Watching ✓',
	watchTitle: 'Alarm e-mails for this flight: on or off',
	units: 'Units',
	soundOff: 'Alarm sound: off',
	soundOn: 'Alarm sound: on',
	awake: 'screen kept on while following',
	ack: 'Acknowledge',
	acking: 'Acknowledging…',
	cautionRead: 'I have read this',
	cautionMore: 'Tap for the whole caution.',
	finished: 'This flight is finished and kept with everything received.',
	stoppedTitle: (since: string) => `Engine stopped on the ground since ${since} UTC`,
	stoppedText: (hours: number) =>
		`A stop between legs, or the end of the trip. The flight stays open for up to ${hours} h without data, so the next leg joins it; the recorder's close call can end it sooner.`,
	lastDataAgo: (ago: string) => `Last data received ${ago} ago.`,
	idleText: (minutes: number) => `If nothing comes for ${minutes} minutes, the flight is closed and kept with what was received.`
} as const;

/** The time-zone preference on the account page. */
export const timeZoneWords = {
	field: 'Local time beside UTC',
	hint: 'UTC stays the main clock; this zone’s time follows it in brackets.',
	browser: "This browser's zone",
	example: 'Now:'
} as const;

/** The site header's words. */
export const headerWords = {
	organisation: 'Organisation',
	chooseOrganisation: 'Choose organisation…',
	menu: 'Menu',
	themeToggle: 'Switch between day and night colours',
	day: 'Day',
	night: 'Night',
	signOut: 'Sign out',
	signIn: 'Sign in'
} as const;

/** The marks under the time scrubber, named in its legend. */
export const scrubMarkLabels = { gap: 'Data gap', alarm: 'Alarm', event: 'Fuel event', note: 'Note' } as const;

/** The time scrubber's words. */
export const scrubWords = {
	legend: 'Marks under the slider',
	back: 'One sample back',
	on: 'One sample on',
	keys: 'Arrow keys: one sample · Shift + arrows: one minute · Page Up/Down: ten minutes · Space: play or pause'
} as const;

/** The caution on the replay page, short first; the rest behind "more". */
export const cautionWords = {
	short: 'These figures come from the flow sensor and the fuel declared at engine start; they do not replace a look in the tanks, the flight manual or the pilot in command’s judgement.',
	meterFactor: 'the one in force at engine start (the aircraft’s calibration history).',
	more: 'More about these figures and the reserve rule',
	long: 'They are only as good as the sensor and the declaration, and Burndown is not a certified instrument.'
} as const;

/** The replay's column of figures at the scrubbed moment (it scrolls on its own at desk sizes). */
export const figuresColumnLabel = 'Figures at the scrubber';
