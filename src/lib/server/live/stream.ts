// The viewer's stream (GET or POST /api/v1/flights/[id]/stream?after=<seq>), produced with
// sveltekit-sse. That library neither resumes nor sends Last-Event-ID, so the client carries its
// own cursor: it asks for everything after the last sequence it holds, on every (re)connection.
import { produce } from 'sveltekit-sse';
import { PING_MS } from './config';
import type { LiveHub } from './hub';
import { EVENT_END, EVENT_HELLO, type HelloEvent } from './protocol';

/** The cursor from the query string: -1 (nothing seen yet) when absent or unusable. */
export function parseAfter(raw: string | null): number {
	if (raw === null || raw === '') return -1;
	const n = Number(raw);
	return Number.isInteger(n) && n >= -1 && n <= 2_147_483_647 ? n : -1;
}

/**
 * A text/event-stream response: hello, meta, then sample runs after `after`, and pings; for a
 * closed flight, `end` once the client holds all of it, and the stream closes.
 */
export function liveStream(hub: LiveHub, flightId: string, after: number): Response {
	let unsubscribe: (() => void) | null = null;
	let gone = false;
	const stop = () => {
		gone = true;
		unsubscribe?.();
		unsubscribe = null;
	};
	return produce(
		async ({ emit, lock }) => {
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
