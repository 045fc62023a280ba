// The viewer's stream (GET or POST /api/v1/flights/[id]/stream). Every samples event carries the
// last sequence it holds as its SSE id, so a client resumes with the standard Last-Event-ID
// header (the browser's EventSource sends it by itself on reconnection; the live page's own
// client sends it too). `?after=<seq>` is only where a fresh client without a header starts.
import { PING_MS, streamRecheckMs } from './config';
import type { LiveHub } from './hub';
import { eventStream, sseFrame } from './sse';
import { EVENT_END, EVENT_HELLO, type HelloEvent } from '$lib/wire/live';

/** A cursor as a request carries it: -1 (nothing seen yet) when absent or unusable. */
export function parseAfter(raw: string | null): number {
	if (raw === null || raw.trim() === '') return -1;
	const n = Number(raw.trim());
	return Number.isInteger(n) && n >= -1 && n <= 2_147_483_647 ? n : -1;
}

/**
 * Where a connection resumes: the Last-Event-ID header when the client sends one (a reconnection
 * after holding samples), otherwise ?after, otherwise the flight's start. The header wins, since
 * an EventSource reconnects to its first URL, ?after and all, with the newer id in the header.
 */
export function resumeAfter(request: Request, url: URL): number {
	const header = request.headers.get('last-event-id');
	if (header !== null && header.trim() !== '') return parseAfter(header);
	return parseAfter(url.searchParams.get('after'));
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
	return eventStream(
		async (control) => {
			let unsubscribe: (() => void) | null = null;
			let timer: ReturnType<typeof setInterval> | null = null;
			let unwatch: (() => void) | null = null;
			const stop = () => {
				unsubscribe?.();
				unsubscribe = null;
				if (timer) clearInterval(timer);
				timer = null;
				unwatch?.();
				unwatch = null;
			};
			if (guard) {
				let asking = false;
				const ask = async () => {
					if (asking || !control.open) return;
					asking = true;
					let holds = false;
					try {
						holds = await guard.holds();
					} catch (error) {
						// Failing closed costs the viewer one reconnection; failing open could leak.
						console.error('[live] stream access re-check failed:', (error as Error).message);
					}
					asking = false;
					if (!holds) control.close();
				};
				timer = setInterval(() => void ask(), guard.everyMs ?? streamRecheckMs());
				timer.unref?.();
				if (guard.userId) unwatch = hub.watchAccess(guard.userId, () => void ask());
			}
			const hello: HelloEvent = { flightId, after, serverTime: Date.now() };
			if (!control.send(sseFrame(EVENT_HELLO, JSON.stringify(hello)))) return stop;
			try {
				const end = () => {
					control.send(sseFrame(EVENT_END, '{}'));
					control.close();
				};
				const off = await hub.subscribe(flightId, after, (frame) => control.send(frame), end);
				if (!control.open) off();
				else unsubscribe = off;
			} catch (error) {
				console.error('[live] stream subscribe failed:', (error as Error).message);
				control.close();
			}
			return stop;
		},
		{ pingMs: PING_MS, headers: { 'x-accel-buffering': 'no' } }
	);
}
