// Fan-out of live samples to this instance's viewers. One dedicated LISTEN connection per
// instance (reconnecting, with a heartbeat) hears the NOTIFYs committed batches send (one NOTIFY
// may name many flights); the hub then reads the new samples once per flight — the reads of all
// flights due in the same turn of the event loop in one query — and hands every viewer exactly
// the run after its own cursor, as one pre-encoded SSE frame shared by the viewers at the same
// cursor. A viewer's cursor only moves by whole contiguous runs, so nothing is lost or repeated.
import { drizzle } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { serverConfig } from '../config';
import { db } from '../db';
import { NEAR_HEAD, PAGE_SAMPLES } from './config';
import { loadMeta, type FlightMeta } from './meta';
import { EVENT_META, EVENT_SAMPLES, samplesEventOf, type MetaEvent } from '$lib/wire/live';
import { NOTIFY_CHANNEL, noticesOf, type AccessNotice } from './protocol';
import { readRuns, type Queryable, type RunRequest, type SampleRun } from './samples';
import { sseFrame } from './sse';

/** One connected viewer: its cursor (last sequence delivered) and how to send it an event. */
interface Viewer {
	cursor: number;
	/** Queues one SSE frame; false once the connection is gone. */
	send(frame: Uint8Array): boolean;
	/** Ends the connection: the flight is closed and this viewer holds all of it. */
	end?(): void;
}

interface FlightState {
	id: string;
	/** Highest contiguous sequence known to be committed. */
	head: number;
	/** Commit time of the newest batch heard of (epoch ms). */
	at: number;
	viewers: Set<Viewer>;
	meta: FlightMeta | null;
	/** The meta event as a frame, empty until read. */
	metaFrame: Uint8Array | null;
	metaDirty: boolean;
	ready: Promise<void>;
	pumping: boolean;
	again: boolean;
}

export interface HubOptions {
	connectionString?: string;
	/** A name in log lines, so two hubs in one test process can be told apart. */
	name?: string;
	heartbeatMs?: number;
}

export interface HubStats {
	flights: number;
	viewers: number;
	/** Open streams waiting to hear of an access change of their user. */
	accessWatchers: number;
	listening: boolean;
	notices: number;
	reconnects: number;
	queries: number;
	/** Of those, the reads of new samples, and how many flights' runs they served. */
	reads: number;
	runsRead: number;
}

let metaVersion = 0;
/** Flights whose new samples one query reads at most. */
const READS_PER_QUERY = 500;

/** The cursor of a viewer that holds nothing of the flight yet. */
const startCursor = (fs: { meta: FlightMeta | null }) => (fs.meta ? fs.meta.flight.firstSeq - 1 : -1);

export class LiveHub {
	private flights = new Map<string, FlightState>();
	/** Streams to ask again when the database reports an access change for their user. */
	private accessWatchers = new Map<string, Set<() => void>>();
	private client: pg.Client | null = null;
	/** The LISTEN connection as a query runner for the samples reads; null while it is down. */
	private readDb: Queryable | null = null;
	/** Reads on the LISTEN connection run one at a time (one connection runs one query). */
	private readChain: Promise<void> = Promise.resolve();
	private connecting: Promise<void> | null = null;
	private retryMs = 250;
	private retryTimer: ReturnType<typeof setTimeout> | null = null;
	private heartbeat: ReturnType<typeof setInterval> | null = null;
	private stopped = false;
	private everConnected = false;
	private counters = { notices: 0, reconnects: 0, queries: 0, reads: 0, runsRead: 0 };
	/** Sample reads asked for in this turn of the event loop, served by one query. */
	private pendingReads: { req: RunRequest; resolve: (run: SampleRun) => void; reject: (error: unknown) => void }[] = [];

	constructor(private readonly options: HubOptions = {}) {}

	stats(): HubStats {
		let viewers = 0;
		for (const f of this.flights.values()) viewers += f.viewers.size;
		let accessWatchers = 0;
		for (const s of this.accessWatchers.values()) accessWatchers += s.size;
		return { flights: this.flights.size, viewers, accessWatchers, listening: this.client !== null, ...this.counters };
	}

	/**
	 * Adds a viewer of `flightId` that has seen everything up to `after`. It gets the flight's meta
	 * at once, then every sample after its cursor, as catch-up pages and then live runs. Returns
	 * the function that removes it.
	 */
	async subscribe(flightId: string, after: number, send: Viewer['send'], end?: Viewer['end']): Promise<() => void> {
		if (this.stopped) throw new Error('The live hub is stopped.');
		// Listen first: a batch committed between reading the head and listening would be missed.
		await this.listen();
		let fs = this.flights.get(flightId);
		if (!fs) {
			const created: FlightState = {
				id: flightId,
				head: -1,
				at: 0,
				viewers: new Set(),
				meta: null,
				metaFrame: null,
				metaDirty: false,
				ready: Promise.resolve(),
				pumping: false,
				again: false
			};
			created.ready = this.refreshMeta(created).catch((error) => {
				// A failed first read must not leave a broken entry for the next viewer.
				if (this.flights.get(flightId) === created) this.flights.delete(flightId);
				throw error;
			});
			this.flights.set(flightId, created);
			fs = created;
		}
		await fs.ready;
		const state = fs;
		// "Everything" starts at the flight's first sequence, which need not be 0.
		const viewer: Viewer = { cursor: Math.max(after, startCursor(state)), send, end };
		state.viewers.add(viewer);
		if (state.metaFrame) viewer.send(state.metaFrame);
		this.pump(state);
		return () => {
			state.viewers.delete(viewer);
			if (state.viewers.size === 0 && this.flights.get(state.id) === state) this.flights.delete(state.id);
		};
	}

	/** Calls `onChange` whenever a session, token or membership of `userId` changes; returns the off switch. */
	watchAccess(userId: string, onChange: () => void): () => void {
		let set = this.accessWatchers.get(userId);
		if (!set) this.accessWatchers.set(userId, (set = new Set()));
		set.add(onChange);
		return () => {
			set.delete(onChange);
			if (set.size === 0 && this.accessWatchers.get(userId) === set) this.accessWatchers.delete(userId);
		};
	}

	private async refreshMeta(fs: FlightState): Promise<void> {
		this.counters.queries++;
		const meta = await loadMeta(fs.id);
		fs.meta = meta;
		if (!meta) return;
		if (meta.flight.lastSeq > fs.head) fs.head = meta.flight.lastSeq;
		for (const v of fs.viewers) v.cursor = Math.max(v.cursor, startCursor(fs));
		const event: MetaEvent = { v: ++metaVersion, serverTime: Date.now(), ...meta };
		fs.metaFrame = sseFrame(EVENT_META, JSON.stringify(event));
	}

	private onNotice(payload: string | undefined): void {
		let parsed: unknown;
		try {
			parsed = JSON.parse(payload ?? '');
		} catch {
			return;
		}
		this.counters.notices++;
		if (parsed && typeof parsed === 'object' && 'u' in parsed) {
			for (const onChange of this.accessWatchers.get((parsed as AccessNotice).u) ?? []) onChange();
			return;
		}
		for (const n of noticesOf(parsed)) {
			const fs = this.flights.get(n.f);
			if (!fs) continue;
			if (n.s > fs.head) fs.head = n.s;
			if (n.at > fs.at) fs.at = n.at;
			if (n.m) fs.metaDirty = true;
			this.pump(fs);
		}
	}

	/** The samples after..upTo of one flight, read together with every other flight's asked for in this turn. */
	private read(req: RunRequest): Promise<SampleRun> {
		return new Promise((resolve, reject) => {
			if (this.pendingReads.length === 0) setImmediate(() => void this.flushReads());
			this.pendingReads.push({ req, resolve, reject });
		});
	}

	/**
	 * The reads go over the LISTEN connection while it is up, one after another: viewers' samples
	 * then never wait behind ingest for a pooled connection. Without it, the pool serves them.
	 */
	private async flushReads(): Promise<void> {
		const due = this.pendingReads;
		this.pendingReads = [];
		const turn = this.readChain;
		let release = () => {};
		this.readChain = new Promise<void>((r) => (release = r));
		await turn;
		try {
			await this.readAll(due);
		} finally {
			release();
		}
	}

	private async readAll(due: typeof this.pendingReads): Promise<void> {
		for (let i = 0; i < due.length; i += READS_PER_QUERY) {
			const part = due.slice(i, i + READS_PER_QUERY);
			this.counters.queries++;
			this.counters.reads++;
			this.counters.runsRead += part.length;
			try {
				const runs = await readRuns(part.map((p) => p.req), this.readDb ?? db);
				part.forEach((p, k) => p.resolve(runs[k]));
			} catch (error) {
				for (const p of part) p.reject(error);
			}
		}
	}

	/** Runs delivery rounds for a flight until every viewer is at the head; one at a time. */
	private pump(fs: FlightState): void {
		if (fs.pumping) {
			fs.again = true;
			return;
		}
		fs.pumping = true;
		void (async () => {
			try {
				do {
					fs.again = false;
					if (fs.metaDirty) {
						fs.metaDirty = false;
						await this.refreshMeta(fs);
						const frame = fs.metaFrame;
						if (frame) for (const v of fs.viewers) if (!v.send(frame)) fs.viewers.delete(v);
					}
					await this.catchUp(fs);
					if (fs.meta?.flight.status === 'closed') this.endCaughtUp(fs);
				} while ((fs.again || fs.metaDirty) && fs.viewers.size > 0);
			} catch (error) {
				console.error(`[live${this.options.name ? ` ${this.options.name}` : ''}] delivery for flight ${fs.id} failed:`, (error as Error).message);
				// Try again shortly: the cursors did not move, so nothing is lost.
				setTimeout(() => this.pump(fs), 1000).unref?.();
			} finally {
				fs.pumping = false;
			}
		})();
	}

	/** A closed flight changes no more: viewers holding all of it are told so and let go. */
	private endCaughtUp(fs: FlightState): void {
		for (const v of fs.viewers) {
			if (v.cursor < fs.head || !v.end) continue;
			fs.viewers.delete(v);
			v.end();
		}
		if (fs.viewers.size === 0 && this.flights.get(fs.id) === fs) this.flights.delete(fs.id);
	}

	private async catchUp(fs: FlightState): Promise<void> {
		for (;;) {
			let lowNear = Infinity;
			let lowFar = Infinity;
			for (const v of fs.viewers) {
				if (v.cursor >= fs.head) continue;
				if (v.cursor >= fs.head - NEAR_HEAD) lowNear = Math.min(lowNear, v.cursor);
				else lowFar = Math.min(lowFar, v.cursor);
			}
			// Viewers near the head first (one query serves them all), then one page for the
			// furthest behind; the loop comes back to the near ones before the next far page.
			const from = lowNear !== Infinity ? lowNear : lowFar;
			if (from === Infinity) return;
			const run = await this.read({ flightId: fs.id, after: from, upTo: fs.head, limit: PAGE_SAMPLES });
			if (run.seq.length === 0 || run.seq[0] !== from + 1) return;
			this.deliver(fs, run);
		}
	}

	/** Hands each viewer the part of a contiguous run that starts right after its cursor. */
	private deliver(fs: FlightState, run: SampleRun): void {
		const first = run.seq[0];
		let n = run.seq.length;
		for (let i = 1; i < n; i++)
			if (run.seq[i] !== first + i) {
				n = i;
				break;
			}
		const last = first + n - 1;
		// Viewers at the same cursor share one encoded frame; its id is the last sequence it holds.
		const frames = new Map<number, Uint8Array>();
		for (const v of fs.viewers) {
			const start = v.cursor + 1;
			if (start < first || start > last) continue;
			let frame = frames.get(start);
			if (frame === undefined) {
				frame = sseFrame(EVENT_SAMPLES, JSON.stringify(samplesEventOf(run, start - first, n, first, fs.at)), last);
				frames.set(start, frame);
			}
			if (v.send(frame)) v.cursor = last;
			else fs.viewers.delete(v);
		}
	}

	// ---- the LISTEN connection --------------------------------------------------------------

	/** Resolves once listening, or once a first attempt failed (a retry is then scheduled). */
	private listen(): Promise<void> {
		if (this.client || this.stopped) return Promise.resolve();
		this.connecting ??= this.connect().finally(() => {
			this.connecting = null;
		});
		return this.connecting;
	}

	private async connect(): Promise<void> {
		const client = new pg.Client({ connectionString: this.options.connectionString ?? serverConfig().DATABASE_URL, keepAlive: true });
		client.on('notification', (m) => {
			if (m.channel === NOTIFY_CHANNEL) this.onNotice(m.payload);
		});
		client.on('error', (error) => this.lost(client, error));
		client.on('end', () => this.lost(client));
		try {
			await client.connect();
			await client.query(`LISTEN ${NOTIFY_CHANNEL}`);
		} catch (error) {
			client.removeAllListeners('end');
			client.end().catch(() => {});
			this.scheduleReconnect(error as Error);
			return;
		}
		if (this.stopped) {
			await client.end().catch(() => {});
			return;
		}
		this.client = client;
		this.readDb = drizzle(client) as unknown as Queryable;
		this.retryMs = 250;
		const reconnected = this.everConnected;
		this.everConnected = true;
		this.heartbeat = setInterval(() => {
			// In turn with the reads: one connection runs one query at a time.
			const turn = this.readChain;
			this.readChain = turn.then(() => client.query('select 1').then(() => {}, (error) => this.lost(client, error)));
		}, this.options.heartbeatMs ?? 20_000);
		this.heartbeat.unref?.();
		if (reconnected) {
			this.counters.reconnects++;
			// Batches committed while we were not listening: re-read each watched flight's head.
			for (const fs of this.flights.values()) {
				fs.metaDirty = true;
				this.pump(fs);
			}
		}
	}

	private lost(client: pg.Client, error?: Error): void {
		if (this.client !== client) return;
		this.client = null;
		this.readDb = null;
		if (this.heartbeat) clearInterval(this.heartbeat);
		this.heartbeat = null;
		client.end().catch(() => {});
		this.scheduleReconnect(error);
	}

	private scheduleReconnect(error?: Error): void {
		if (this.stopped || this.retryTimer) return;
		if (error) console.error(`[live${this.options.name ? ` ${this.options.name}` : ''}] LISTEN connection lost (${error.message}); retrying in ${this.retryMs} ms`);
		this.retryTimer = setTimeout(() => {
			this.retryTimer = null;
			void this.listen();
		}, this.retryMs);
		this.retryTimer.unref?.();
		this.retryMs = Math.min(this.retryMs * 2, 10_000);
	}

	/** For tests: drops the LISTEN connection as a network failure would. */
	simulateConnectionLoss(): void {
		const c = this.client;
		if (c) this.lost(c, new Error('simulated connection loss'));
	}

	async stop(): Promise<void> {
		this.stopped = true;
		if (this.retryTimer) clearTimeout(this.retryTimer);
		if (this.heartbeat) clearInterval(this.heartbeat);
		const c = this.client;
		this.client = null;
		this.readDb = null;
		this.flights.clear();
		this.accessWatchers.clear();
		if (c) await c.end().catch(() => {});
	}
}
