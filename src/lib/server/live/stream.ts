// The viewer's stream (GET or POST /api/v1/flights/[id]/stream?after=<seq>), produced with
// sveltekit-sse. That library neither resumes nor sends Last-Event-ID, so the client carries its
// own cursor: it asks for everything after the last sequence it holds, on every (re)connection.
import { produce } from 'sveltekit-sse';
import { PING_MS, streamRecheckMs } from './config';
import type { LiveHub } from './hub';
import { EVENT_END, EVENT_HELLO, type HelloEvent } from '$lib/wire/live';

/** The cursor from the query string: -1 (nothing seen yet) when absent or unusable. */
export function parseAfter(raw: string | null): number {
	if (raw === null || raw === '') return -1;
	const n = Number(raw);
	return Number.isInteger(n) && n >= -1 && n <= 2_147_483_647 ? n : -1;
}

export interface StreamGuard {
	/** Asked every `everyMs` while the stream is open, and when the user's access changes: false (or a failure) closes it. */
	holds(): Promise<boolean>;
	/** Whose access it is, to hear of changes at once (AccessNotice). */
	userId?: string;
	everyMs?: number;
}

/**
 * A text/event-stream response: hello, meta, then sample runs after `after`, and pings; for a
 * closed flight, `end` once the client holds all of it, and the stream closes. With a guard, the
 * stream also closes once the viewer's right to it is gone; the client's reconnection then meets
 * the route's own refusal (401, 403 or 404), so it stops.
 */
export function liveStream(hub: LiveHub, flightId: string, after: number, guard?: StreamGuard): Response {
	let unsubscribe: (() => void) | null = null;
	let timer: ReturnType<typeof setInterval> | null = null;
	let unwatch: (() => void) | null = null;
	let gone = false;
	const stop = () => {
		gone = true;
		unsubscribe?.();
		unsubscribe = null;
		if (timer) clearInterval(timer);
		timer = null;
		unwatch?.();
		unwatch = null;
	};
	return produce(
		async ({ emit, lock }) => {
			if (guard) {
				let asking = false;
				const ask = async () => {
					if (asking || gone) return;
					asking = true;
					let holds = false;
					try {
						holds = await guard.holds();
					} catch (error) {
						// Failing closed costs the viewer one reconnection; failing open could leak.
						console.error('[live] stream access re-check failed:', (error as Error).message);
					}
					asking = false;
					if (!holds && !gone) {
						stop();
						lock.set(false);
					}
				};
				timer = setInterval(() => void ask(), guard.everyMs ?? streamRecheckMs());
				timer.unref?.();
				if (guard.userId) unwatch = hub.watchAccess(guard.userId, () => void ask());
			}
			const send = (event: string, data: string): boolean => {
				if (gone) return false;
				const { error } = emit(event, data);
				if (error) {
					lock.set(false);
					return false;
				}
				return true;
			};
			const hello: HelloEvent = { flightId, after, serverTime: Date.now() };
			if (!send(EVENT_HELLO, JSON.stringify(hello))) return stop;
			try {
				const end = () => {
					send(EVENT_END, '{}');
					stop();
					lock.set(false);
				};
				const off = await hub.subscribe(flightId, after, send, end);
				if (gone) off();
				else unsubscribe = off;
			} catch (error) {
				console.error('[live] stream subscribe failed:', (error as Error).message);
				lock.set(false);
			}
			return stop;
		},
		{ ping: PING_MS, stop, headers: { 'x-accel-buffering': 'no' } }
	);
}
