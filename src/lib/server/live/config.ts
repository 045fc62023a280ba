// The numbers that shape live flights: batch limits, the idle time after which an open flight
// closes by itself, pings and page sizes. Each can be set from the environment; the defaults are
// our choice and documented in the README's live section.

const num = (name: string, fallback: number, min: number, max: number): number => {
	const raw = process.env[name];
	const v = raw === undefined || raw === '' ? NaN : Number(raw);
	return Number.isFinite(v) && v >= min && v <= max ? v : fallback;
};

/** Most samples one batch may carry: at 1 Hz that is over 16 minutes of a backlog per request. */
export const MAX_BATCH_SAMPLES = 1000;
/** Largest request body of a batch (JSON or CSV), well under adapter-node's own limit. */
export const MAX_BATCH_BYTES = 512 * 1024;
export const MAX_BATCH_LABEL = '512 KiB';

/**
 * An open live flight with no batch received for this long, the engine running at its last sample,
 * is closed by the sweeper: longer than a link outage over open country (the recorder sends its
 * backlog when it reconnects). With the engine stopped on the ground at the last sample it is a
 * planned stop, kept open for LIVE_STOP_OPEN_HOURS instead (src/lib/server/config.ts, sweeper.ts).
 */
export function idleCloseMinutes(): number {
	return num('LIVE_IDLE_CLOSE_MINUTES', 30, 1, 24 * 60);
}
/** How often each instance's sweeper looks for idle flights. */
export function sweepIntervalMs(): number {
	return num('LIVE_SWEEP_SECONDS', 60, 1, 3600) * 1000;
}

/**
 * How often an open viewer's stream asks again whether its session or token and its membership
 * still hold, closing it when not (sign-out, removal, a role change). Also asked at once when
 * the database reports a change for that user.
 */
export function streamRecheckMs(): number {
	return num('LIVE_STREAM_RECHECK_SECONDS', 30, 0.05, 3600) * 1000;
}

/** Pings keep proxies from closing a quiet stream and let both ends notice a dead one. */
export const PING_MS = 15_000;
/** Samples read per query when a viewer catches up, and per SSE event. */
export const PAGE_SAMPLES = 2000;
/** A viewer is "caught up" within this many samples of the head; others are served by pages. */
export const NEAR_HEAD = PAGE_SAMPLES;

/**
 * Grouped commits of plain appends (appends.ts): how many groups may be committing at once on
 * this instance (each holds one pooled connection) and the most batches one group stores.
 */
export function appendGroupLimits(): { maxGroups: number; maxBatches: number } {
	return { maxGroups: num('LIVE_APPEND_GROUPS', 2, 1, 8), maxBatches: num('LIVE_APPEND_GROUP_BATCHES', 200, 1, 1000) };
}
