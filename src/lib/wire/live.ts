// The live stream's server-sent events, as the server sends them and the live page reads them.
import { ColumnBuilder, type AlarmKind, type Declaration, type SampleColumns } from '$lib/fuel';
import type { PayloadEvent } from './replay';

/** First event of every stream. */
export interface HelloEvent {
	flightId: string;
	/** The cursor this connection resumes after: samples with seq > after follow. */
	after: number;
	serverTime: number;
}

/**
 * A run of samples. `from` is always the receiving connection's cursor + 1 and the sequence
 * numbers run from..to without holes, so a client that keeps `to` as its cursor never loses or
 * repeats a sample. Times are integer ms after t0Ms (exact); null = not recorded.
 */
export interface SamplesEvent extends SampleRunRows {
	from: number;
	to: number;
	/** Commit time (epoch ms) of the newest batch included, for latency figures. */
	at: number;
	t0Ms: number;
	/** Here: integer ms after t0Ms. */
	tMs: number[];
}

export interface WireAlarm {
	id: string;
	kind: AlarmKind;
	/** Epoch seconds, as the engine's AlarmEpisode. */
	raisedAt: number;
	clearedAt: number | null;
	value: number | null;
	/** The e-mail step ran for this episode (once, on one instance). */
	emailed: boolean;
	/**
	 * Watchers actually e-mailed about it: 0 when nobody watches, or all were in their quiet
	 * period; null when not known (an alarm e-mailed before the count was kept).
	 */
	mailedTo: number | null;
	/** Who acknowledged it and when (epoch seconds), oldest first; shared by every viewer. */
	acks: { by: string; at: number }[];
}

/** One acknowledgement of a stored alarm, for the timeline of the live and replay pages. */
export interface AlarmAck {
	alarmId: string;
	kind: AlarmKind;
	/** Epoch seconds, as WireAlarm.raisedAt. */
	raisedAt: number;
	by: string;
	at: number;
}

/** Everything about the flight but its samples; sent on connect and after every change. */
export interface MetaEvent {
	/** Changes on every send, so no client ever sees two identical payloads. */
	v: number;
	serverTime: number;
	flight: {
		id: string;
		title: string;
		status: 'open' | 'closed';
		startedAt: string;
		endedAt: string | null;
		lastSeq: number;
		/**
		 * The sequence the flight starts at (a recorder may not count from 0): a new viewer's
		 * cursor starts just below it.
		 */
		firstSeq: number;
		/** When the server last stored samples for this flight (epoch ms). */
		receivedAt: number | null;
		declarationConfirmed: boolean;
	};
	declaration: Declaration;
	previousOnBoardL: number | null;
	events: PayloadEvent[];
	alarms: WireAlarm[];
}

/** Event names on the stream (besides `ping`, every 15 s). */
export const EVENT_HELLO = 'hello';
export const EVENT_META = 'meta';
export const EVENT_SAMPLES = 'samples';
/** The flight is closed and the client holds every sample: do not reconnect. */
export const EVENT_END = 'end';

/**
 * A run's samples as engine columns, through the engine's one rows→columns builder: times as
 * (t0 + offset) ms ÷ 1000, the same double the server's engine is fed. Waypoint ids continue in
 * `waypointIds` from run to run.
 */
export function samplesEventColumns(run: SamplesEvent, waypointIds: Map<string, number>): SampleColumns {
	const n = run.tMs.length;
	const rows = new ColumnBuilder(n, waypointIds);
	const { lat, lon } = run;
	for (let i = 0; i < n; i++) rows.push(run.from + i, run.t0Ms + run.tMs[i], run.flow[i], run.gs[i], run.dtg[i], run.alt[i], run.wpt[i], lat?.[i] ?? null, lon?.[i] ?? null);
	return rows.columns();
}

/** Samples as rows for the wire, in sequence order without holes; tMs epoch ms unless said otherwise. */
export interface SampleRunRows {
	tMs: number[];
	flow: (number | null)[];
	gs: (number | null)[];
	dtg: (number | null)[];
	alt: (number | null)[];
	wpt: (string | null)[];
	/**
	 * Position, degrees WGS 84. Left out of an event whose samples have none, so a flight without
	 * positions streams exactly as before.
	 */
	lat?: (number | null)[];
	lon?: (number | null)[];
}

/** The samples event for rows a..n-1 of a run whose first row has sequence `first`; `at` as in SamplesEvent. */
export function samplesEventOf(run: SampleRunRows, a: number, n: number, first: number, at: number): SamplesEvent {
	const tMs = run.tMs.slice(a, n);
	const t0Ms = tMs[0] ?? 0;
	const event: SamplesEvent = {
		from: first + a,
		to: first + n - 1,
		at,
		t0Ms,
		tMs: tMs.map((t) => t - t0Ms),
		flow: run.flow.slice(a, n),
		gs: run.gs.slice(a, n),
		dtg: run.dtg.slice(a, n),
		alt: run.alt.slice(a, n),
		wpt: run.wpt.slice(a, n)
	};
	if (run.lat && run.lon) {
		const lat = run.lat.slice(a, n);
		const lon = run.lon.slice(a, n);
		if (lat.some((v, i) => v !== null && lon[i] !== null)) {
			event.lat = lat;
			event.lon = lon;
		}
	}
	return event;
}
