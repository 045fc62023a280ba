// What app instances tell each other through PostgreSQL: the NOTIFY payloads sent after a batch
// commits or when someone's access changes. Server only; what a viewer's browser receives is in
// $lib/wire/live.ts.

/** The one PostgreSQL channel every app instance LISTENs on. */
export const NOTIFY_CHANNEL = 'burndown_live';

/**
 * NOTIFY payload, kept small (PostgreSQL caps it at 8000 bytes): the flight, its highest
 * contiguous sequence after the commit, the commit time in epoch ms, and m=1 when something
 * other than samples changed (declaration, status, alarms), so viewers re-read the flight.
 */
export interface LiveNotice {
	f: string;
	s: number;
	at: number;
	m?: 1;
}

/**
 * NOTIFY payload sent by the database itself (triggers in the migrations) when a user's session
 * ends, an API token is revoked or a membership changes: open streams of that user ask again
 * whether they may stay open.
 */
export interface AccessNotice {
	u: string;
}
