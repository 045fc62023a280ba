// Server-sent events written by us rather than by a package, because the ids must be ours: a
// samples event's `id:` is the last sequence it carries, so a client reconnecting with the
// standard Last-Event-ID header (the browser's EventSource does so by itself) resumes exactly
// after it. Events without an id (hello, meta, ping) leave the client's last id as it was
// (WHATWG HTML, server-sent events: the last event ID buffer is only set by an id field).
// Each event is one pre-encoded chunk, so one frame can go to many viewers without copying.

const encoder = new TextEncoder();

/** One event as bytes: `id` (when given), `event`, one `data:` line per line of data, blank line. */
export function sseFrame(event: string, data: string, id?: number): Uint8Array {
	if (/[\r\n]/.test(event)) throw new Error('An event name cannot hold a line break.');
	let text = id === undefined ? '' : `id: ${id}\n`;
	text += `event: ${event}\n`;
	for (const line of data.split(/\r\n|\r|\n/)) text += `data: ${line}\n`;
	return encoder.encode(text + '\n');
}

const PING = sseFrame('ping', '');

export interface EventStreamControl {
	/** Queues a frame; false once the client is gone or the stream was closed. */
	send(frame: Uint8Array): boolean;
	/** Ends the response. */
	close(): void;
	readonly open: boolean;
}

/**
 * A text/event-stream response. `start` runs once the stream is set up and may return a clean-up
 * function, called exactly once however the stream ends (client gone, close(), a failed send).
 */
export function eventStream(
	start: (control: EventStreamControl) => void | (() => void) | Promise<void | (() => void)>,
	options: { pingMs: number; headers?: Record<string, string> }
): Response {
	let controller: ReadableStreamDefaultController<Uint8Array> | null = null;
	let open = true;
	let cleanup: (() => void) | null = null;
	let ping: ReturnType<typeof setInterval> | null = null;
	const finish = () => {
		if (!open) return;
		open = false;
		if (ping) clearInterval(ping);
		ping = null;
		try {
			controller?.close();
		} catch {
			// Already closed or errored: the client went away first.
		}
		const c = cleanup;
		cleanup = null;
		c?.();
	};
	const control: EventStreamControl = {
		send(frame) {
			if (!open || !controller) return false;
			try {
				controller.enqueue(frame);
				return true;
			} catch {
				finish();
				return false;
			}
		},
		close: finish,
		get open() {
			return open;
		}
	};
	const body = new ReadableStream<Uint8Array>({
		start(c) {
			controller = c;
			ping = setInterval(() => control.send(PING), options.pingMs);
			ping.unref?.();
			void Promise.resolve()
				.then(() => start(control))
				.then(
					(c) => {
						if (typeof c !== 'function') return;
						if (open) cleanup = c;
						else c();
					},
					(error) => {
						console.error('[live] event stream failed to start:', (error as Error).message);
						finish();
					}
				);
		},
		cancel() {
			finish();
		}
	});
	return new Response(body, {
		headers: { 'content-type': 'text/event-stream', 'cache-control': 'no-store', connection: 'keep-alive', ...options.headers }
	});
}
