// The live page's state: the stream connection, the flight's meta (declaration, events, alarms)
// and the incremental fuel computation fed by each run of samples, so every figure updates with
// the same engine a replay runs. Redraws are batched to a few per second however fast data comes.
import { engineInputsOf, type AircraftFuelSetup } from '$lib/flight-inputs';
import { createLiveComputation, type Declaration, type FlightComputation, type LiveComputation, type SampleColumns } from '$lib/fuel';
import { samplesEventColumns, type MetaEvent, type SamplesEvent } from '$lib/wire/live';
import { openLiveStream, type LiveStream, type StreamStatus } from './stream-client';

/** Longest pause between redraws while samples stream in. */
const REDRAW_MS = 250;

export class LiveFlight {
	status = $state<StreamStatus>('connecting');
	/** True once a connection has been open: later drops are "link lost", not "connecting". */
	everOpen = $state(false);
	meta = $state.raw<MetaEvent | null>(null);
	/** Bumped when the figures changed; read it to recompute derived values. */
	version = $state(0);
	/** When the server stored the newest samples we hold (server clock, epoch ms). */
	lastReceivedAt = $state<number | null>(null);
	waypoints = $state.raw<string[]>([]);
	/** Server clock minus this browser's clock, from the stream's hello. */
	offsetMs = 0;

	private comp: LiveComputation;
	private ids = new Map<string, number>();
	private stream: LiveStream | null = null;
	private inputsKey = '';
	private redraw: ReturnType<typeof setTimeout> | null = null;

	constructor(
		private readonly setup: AircraftFuelSetup,
		private readonly url: string,
		start: { declaration: Declaration; previousOnBoardL: number | null }
	) {
		this.comp = createLiveComputation({ ...engineInputsOf(setup, start, []), initialCapacity: 8192 });
		this.inputsKey = JSON.stringify([start.declaration, start.previousOnBoardL, []]);
	}

	start(): void {
		this.stream = openLiveStream({
			url: this.url,
			after: -1,
			onHello: (h) => {
				this.offsetMs = h.serverTime - Date.now();
			},
			onMeta: (m) => this.applyMeta(m),
			onSamples: (run) => this.append(run),
			onStatus: (s) => {
				this.status = s;
				if (s === 'open') this.everOpen = true;
			}
		});
	}

	stop(): void {
		this.stream?.close();
		this.stream = null;
		if (this.redraw) clearTimeout(this.redraw);
	}

	/** After the tab slept or the network came back: reconnect now rather than at the next retry. */
	nudge(): void {
		this.stream?.reconnect();
	}

	get length(): number {
		return this.comp.length;
	}
	get cursor(): number {
		return this.stream?.cursor ?? -1;
	}

	/** The figures so far; views valid until the next change (read `version` first). */
	result(): FlightComputation {
		return this.comp.result();
	}
	columns(): SampleColumns {
		return this.comp.columns();
	}

	private applyMeta(m: MetaEvent): void {
		const key = JSON.stringify([m.declaration, m.previousOnBoardL, m.events.map((e) => [e.t, e.kind, e.amountL])]);
		if (key !== this.inputsKey) {
			// A declaration set or corrected by anyone, or a fuel event: recompute from the start.
			this.inputsKey = key;
			const inputs = engineInputsOf(this.setup, m, m.events);
			this.comp.setEvents(inputs.events);
			this.comp.setDeclaration(inputs.declaration, inputs.previousOnBoardL);
		}
		if (m.flight.receivedAt !== null && (this.lastReceivedAt === null || m.flight.receivedAt > this.lastReceivedAt)) this.lastReceivedAt = m.flight.receivedAt;
		this.meta = m;
		this.version++;
	}

	private append(run: SamplesEvent): void {
		const known = this.ids.size;
		this.comp.append(samplesEventColumns(run, this.ids));
		if (this.ids.size !== known) this.waypoints = [...this.ids.keys()];
		if (this.lastReceivedAt === null || run.at > this.lastReceivedAt) this.lastReceivedAt = run.at;
		this.redraw ??= setTimeout(() => {
			this.redraw = null;
			this.version++;
		}, REDRAW_MS);
	}
}
