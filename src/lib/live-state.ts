// The live page's one state at a time, from what the browser knows: its own stream to Burndown,
// whether the flight is open, how long since the server last stored samples, and whether the newest
// sample shows the engine stopped on the ground. Kept apart from the page so each state is decided
// in one place and tested; the words for each are in $lib/labels.ts (liveStateLabels).

/** No samples stored for this long while the flight is open: the page says no data has come from the aircraft. */
export const NO_DATA_AFTER_S = 30;

export const LIVE_STATES = ['connecting', 'link-lost', 'denied', 'ended', 'engine-stopped', 'no-data', 'live'] as const;
export type LiveState = (typeof LIVE_STATES)[number];

export interface LiveFacts {
	/** This browser's stream: a failed attempt after it was once open, or a retry. */
	linkDown: boolean;
	everOpen: boolean;
	denied?: boolean;
	/** The flight is still open (not closed by the recorder or the sweeper). */
	open: boolean;
	/** Seconds since the server last stored samples of the flight; null before any. */
	ageS: number | null;
	/** The newest sample shows the engine stopped on the ground ($lib/fuel engineStoppedOnGround). */
	stoppedOnGround: boolean;
}

export function liveState(f: LiveFacts): LiveState {
	if (f.denied) return 'denied';
	// The viewer's own link first: with it down nothing else can be known.
	if (f.linkDown) return 'link-lost';
	if (!f.everOpen) return 'connecting';
	if (!f.open) return 'ended';
	// A planned stop says so, whether or not the recorder is still sending.
	if (f.stoppedOnGround) return 'engine-stopped';
	if (f.ageS !== null && f.ageS > NO_DATA_AFTER_S) return 'no-data';
	return 'live';
}
