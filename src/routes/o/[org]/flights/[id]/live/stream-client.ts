// The live page's connection to the flight's event stream, in the browser and in Node (the
// integration tests drive this same code). Its cursor (last sequence held) is the stream's last
// event id: every samples event's id is its last sequence. After any drop or server restart it
// reconnects with the standard Last-Event-ID header, as the browser's EventSource does by itself,
// so it never loses or repeats a sample; a watchdog reconnects when even the pings stop (a dead
// link looks like silence).
import type { HelloEvent, MetaEvent, SamplesEvent } from '$lib/wire/live';

/** ended: the flight is closed and everything was received; closed: close() was called. */
export type StreamStatus = 'connecting' | 'open' | 'reconnecting' | 'denied' | 'ended' | 'closed';

export interface LiveStreamOptions {
	/** The stream URL without the query string, e.g. /api/v1/flights/<id>/stream. */
	url: string;
	/** Last sequence already held; -1 for none. */
	after?: number;
	fetch?: typeof fetch;
	headers?: Record<string, string>;
	onHello?: (hello: HelloEvent) => void;
	onMeta?: (meta: MetaEvent) => void;
	/** Runs that continue exactly from the previous cursor: from === previous to + 1. */
	onSamples?: (run: SamplesEvent) => void;
	onStatus?: (status: StreamStatus, detail?: string) => void;
	/** No bytes at all for this long (pings come every 15 s) means the link is dead. */
	watchdogMs?: number;
	minRetryMs?: number;
	maxRetryMs?: number;
}

export interface LiveStream {
	readonly cursor: number;
	/** Connections opened so far (1 + reconnects). */
	readonly connections: number;
	/**
	 * Samples the server sent that this client already held (dropped), and runs that skipped
	 * ahead of the cursor (the connection is then reopened from the cursor). Both stay 0 when the
	 * server keeps the protocol; the tests and the live benchmark check it.
	 */
	readonly repeated: number;
	readonly skipped: number;
	/** Drops the current connection and reconnects from the cursor (e.g. the tab came back). */
	reconnect(): void;
	close(): void;
}

/** Splits SSE text into events; returns the unparsed rest. */
function parseEvents(buffer: string, dispatch: (event: string, data: string, id: string | null) => void): string {
	for (;;) {
		const m = /\r?\n\r?\n/.exec(buffer);
		if (!m) return buffer;
		const block = buffer.slice(0, m.index);
		buffer = buffer.slice(m.index + m[0].length);
		let event = 'message';
		let id: string | null = null;
		const data: string[] = [];
		for (const line of block.split(/\r?\n/)) {
			if (line === '' || line.startsWith(':')) continue;
			const colon = line.indexOf(':');
			const field = colon < 0 ? line : line.slice(0, colon);
			let value = colon < 0 ? '' : line.slice(colon + 1);
			if (value.startsWith(' ')) value = value.slice(1);
			if (field === 'event') event = value;
			else if (field === 'data') data.push(value);
			else if (field === 'id') id = value;
		}
		dispatch(event, data.join('\n'), id);
	}
}

export function openLiveStream(o: LiveStreamOptions): LiveStream {
	const doFetch = o.fetch ?? fetch;
	const watchdogMs = o.watchdogMs ?? 45_000;
	const minRetry = o.minRetryMs ?? 500;
	const maxRetry = o.maxRetryMs ?? 8000;
	let cursor = o.after ?? -1;
	let closed = false;
	let ended = false;
	let connections = 0;
	let repeated = 0;
	let skipped = 0;
	let current: AbortController | null = null;
	let wake: (() => void) | null = null;

	const status = (s: StreamStatus, detail?: string) => o.onStatus?.(s, detail);

	/** Returns false when the connection must be dropped (a hole: reconnect from the cursor). */
	const dispatch = (event: string, data: string, id: string | null): boolean => {
		if (event === 'samples') {
			const run = JSON.parse(data) as SamplesEvent;
			// The event id is the run's last sequence: the value this client resumes from.
			if (id !== null && Number(id) !== run.to) {
				skipped++;
				return false;
			}
			if (run.to <= cursor) {
				repeated += run.to - run.from + 1;
				return true;
			}
			if (run.from > cursor + 1) {
				skipped++;
				return false;
			}
			const cut = cursor + 1 - run.from;
			repeated += cut;
			const part: SamplesEvent =
				cut === 0
					? run
					: {
							...run,
							from: cursor + 1,
							t0Ms: run.t0Ms + run.tMs[cut],
							tMs: run.tMs.slice(cut).map((t) => t - run.tMs[cut]),
							flow: run.flow.slice(cut),
							gs: run.gs.slice(cut),
							dtg: run.dtg.slice(cut),
							alt: run.alt.slice(cut),
							wpt: run.wpt.slice(cut)
						};
			cursor = run.to;
			o.onSamples?.(part);
		} else if (event === 'meta') {
			const meta = JSON.parse(data) as MetaEvent;
			// Holding nothing yet means holding everything below the flight's first sequence.
			cursor = Math.max(cursor, meta.flight.firstSeq - 1);
			o.onMeta?.(meta);
		}
		else if (event === 'hello') o.onHello?.(JSON.parse(data) as HelloEvent);
		else if (event === 'end') {
			ended = true;
			return false;
		}
		return true;
	};

	async function once(): Promise<'retry' | 'stop'> {
		const ctrl = new AbortController();
		current = ctrl;
		let timer: ReturnType<typeof setTimeout> | null = null;
		const arm = () => {
			if (timer) clearTimeout(timer);
			timer = setTimeout(() => ctrl.abort(), watchdogMs);
		};
		try {
			arm();
			const res = await doFetch(o.url, {
				headers: { accept: 'text/event-stream', ...(cursor >= 0 ? { 'last-event-id': String(cursor) } : {}), ...o.headers },
				signal: ctrl.signal,
				cache: 'no-store'
			});
			if (res.status === 401 || res.status === 403 || res.status === 404) {
				status('denied', `HTTP ${res.status}`);
				return 'stop';
			}
			if (!res.ok || !res.body) throw new Error(`HTTP ${res.status}`);
			connections++;
			status('open');
			const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
			let buffer = '';
			let ok = true;
			for (;;) {
				const { done, value } = await reader.read();
				if (done) break;
				arm();
				buffer = parseEvents(buffer + value, (event, data, id) => {
					if (ok && !dispatch(event, data, id)) ok = false;
				});
				if (!ok) break;
			}
			await reader.cancel().catch(() => {});
			if (ended) {
				status('ended');
				return 'stop';
			}
			return 'retry';
		} catch {
			return closed ? 'stop' : 'retry';
		} finally {
			if (timer) clearTimeout(timer);
			ctrl.abort();
			current = null;
		}
	}

	void (async () => {
		let attempt = 0;
		status('connecting');
		while (!closed) {
			const before = connections;
			const outcome = await once();
			if (outcome === 'stop' || closed) break;
			// A connection that opened resets the back-off; refusals and resets back off more.
			attempt = connections > before ? 0 : attempt + 1;
			status('reconnecting');
			const delay = Math.min(maxRetry, minRetry * 2 ** Math.min(attempt, 6)) * (0.75 + Math.random() * 0.5);
			await new Promise<void>((resolve) => {
				const t = setTimeout(resolve, delay);
				wake = () => {
					clearTimeout(t);
					resolve();
				};
			});
			wake = null;
		}
		if (closed) status('closed');
	})();

	return {
		get cursor() {
			return cursor;
		},
		get connections() {
			return connections;
		},
		get repeated() {
			return repeated;
		},
		get skipped() {
			return skipped;
		},
		reconnect() {
			current?.abort();
			wake?.();
		},
		close() {
			closed = true;
			current?.abort();
			wake?.();
		}
	};
}
