// What app instances tell each other through PostgreSQL: the NOTIFY payloads sent after batches
// commit or when someone's access changes. Server only; what a viewer's browser receives is in
// $lib/wire/live.ts.

/** The one PostgreSQL channel every app instance LISTENs on. */
export const NOTIFY_CHANNEL = 'burndown_live';

/**
 * One flight's news: the flight, its highest contiguous sequence after the commit, the commit
 * time in epoch ms, and m=1 when something other than samples changed (declaration, status,
 * alarms), so viewers re-read the flight.
 */
export interface LiveNotice {
	f: string;
	s: number;
	at: number;
	m?: 1;
}

/** Several flights' news in one NOTIFY: what a grouped commit of many batches sends. */
export interface LiveNotices {
	l: LiveNotice[];
}

/**
 * NOTIFY payload sent by the database itself (triggers in the migrations) when a user's session
 * ends, an API token is revoked or a membership changes: open streams of that user ask again
 * whether they may stay open.
 */
export interface AccessNotice {
	u: string;
}

/** PostgreSQL refuses a NOTIFY payload of 8000 bytes or more; stay well under it. */
export const MAX_NOTIFY_BYTES = 7500;

/** The payloads that carry `notices`: one notice as it is, several packed into as few as fit. */
export function noticePayloads(notices: readonly LiveNotice[]): string[] {
	if (notices.length === 1) return [JSON.stringify(notices[0])];
	const out: string[] = [];
	let part: string[] = [];
	let size = 7;
	for (const n of notices) {
		const one = JSON.stringify(n);
		if (part.length > 0 && size + one.length + 1 > MAX_NOTIFY_BYTES) {
			out.push(`{"l":[${part.join(',')}]}`);
			part = [];
			size = 7;
		}
		part.push(one);
		size += one.length + 1;
	}
	if (part.length > 0) out.push(`{"l":[${part.join(',')}]}`);
	return out;
}

/** The flight notices in a parsed payload (one or a list); nothing for anything else. */
export function noticesOf(payload: unknown): LiveNotice[] {
	const ok = (n: unknown): n is LiveNotice =>
		!!n && typeof n === 'object' && typeof (n as LiveNotice).f === 'string' && Number.isInteger((n as LiveNotice).s) && typeof (n as LiveNotice).at === 'number';
	if (ok(payload)) return [payload];
	if (payload && typeof payload === 'object' && Array.isArray((payload as LiveNotices).l)) return (payload as LiveNotices).l.filter(ok);
	return [];
}
