// Incremental computation for a flight in progress: samples arrive in chunks and only the new
// ones are processed, continuing the same engine pass a replay runs, so the figures match a
// batch run exactly. Changing the declaration, events or thresholds recomputes from the start.

import { columnLength } from './compute';
import {
	allocOutputs,
	createState,
	growOutputs,
	prepare,
	runKernel,
	snapshot,
	type EngineInputs,
	type EngineSetup,
	type EngineState,
	type Outputs
} from './engine';
import {
	WPT_NONE,
	type AlarmThresholds,
	type Declaration,
	type EngineWarning,
	type FlightComputation,
	type FuelEvent,
	type SampleColumns
} from './types';

/** Columns a flight may or may not have, possibly from part-way through: blank (NaN) before. */
const OPTIONAL_FLOATS = ['alt', 'lat', 'lon'] as const;
type OptionalFloat = (typeof OPTIONAL_FLOATS)[number];

export interface LiveInit extends EngineInputs {
	/** Samples to make room for up front (the buffers double when full). */
	initialCapacity?: number;
}

export interface LiveComputation {
	/** Samples held so far. */
	readonly length: number;
	/** Adds samples at the end; returns the index range they got. */
	append(chunk: SampleColumns): { from: number; to: number };
	/** Replaces the start-of-flight declaration and recomputes. */
	setDeclaration(declaration: Declaration, previousOnBoardL?: number | null): void;
	/** Replaces all fuel events and recomputes. */
	setEvents(events: readonly FuelEvent[]): void;
	/** Adds one event; recomputes only when it falls at or before the last sample. */
	addEvent(event: FuelEvent): void;
	setThresholds(thresholds: AlarmThresholds | undefined): void;
	/** The figures so far. Arrays are views, valid until the next call that changes the flight. */
	result(): FlightComputation;
	/** The samples held so far, as views. */
	columns(): SampleColumns;
}

class LiveFlight implements LiveComputation {
	private inputs: EngineInputs;
	private setup: EngineSetup;
	private state: EngineState;
	private out: Outputs;
	private n = 0;
	private capacity: number;
	private t: Float64Array;
	private flow: Float64Array;
	private gs: Float64Array;
	private dtg: Float64Array;
	/** The optional Float64 columns (altitude, position), null until a chunk brings one. */
	private extra: Record<OptionalFloat, Float64Array | null> = { alt: null, lat: null, lon: null };
	private wpt: Int32Array | null = null;
	private inputWarnings: EngineWarning[] = [];
	/** The buffers as columns for the engine; rebuilt only when a buffer is replaced. */
	private full: SampleColumns | null = null;

	constructor(init: LiveInit) {
		const { initialCapacity, ...inputs } = init;
		this.inputs = { ...inputs, events: [...(inputs.events ?? [])] };
		this.capacity = Math.max(16, Math.floor(initialCapacity ?? 4096));
		this.t = new Float64Array(this.capacity);
		this.flow = new Float64Array(this.capacity);
		this.gs = new Float64Array(this.capacity);
		this.dtg = new Float64Array(this.capacity);
		this.out = allocOutputs(this.capacity);
		this.setup = prepare(this.inputs);
		this.state = createState(this.setup);
	}

	get length(): number {
		return this.n;
	}

	columns(): SampleColumns {
		const n = this.n;
		const cols: SampleColumns = {
			t: this.t.subarray(0, n),
			flow: this.flow.subarray(0, n),
			gs: this.gs.subarray(0, n),
			dtg: this.dtg.subarray(0, n)
		};
		for (const k of OPTIONAL_FLOATS) {
			const a = this.extra[k];
			if (a) cols[k] = a.subarray(0, n);
		}
		if (this.wpt) cols.wpt = this.wpt.subarray(0, n);
		return cols;
	}

	private fullColumns(): SampleColumns {
		if (this.full) return this.full;
		const cols: SampleColumns = { t: this.t, flow: this.flow, gs: this.gs, dtg: this.dtg };
		for (const k of OPTIONAL_FLOATS) {
			const a = this.extra[k];
			if (a) cols[k] = a;
		}
		if (this.wpt) cols.wpt = this.wpt;
		this.full = cols;
		return cols;
	}

	private grow(need: number): void {
		let cap = this.capacity;
		while (cap < need) cap *= 2;
		if (cap === this.capacity) return;
		const n = this.n;
		const f64 = (a: Float64Array, fill = 0): Float64Array => {
			const b = new Float64Array(cap);
			b.set(a.subarray(0, n));
			if (fill !== 0) b.fill(fill, n);
			return b;
		};
		this.t = f64(this.t);
		this.flow = f64(this.flow);
		this.gs = f64(this.gs);
		this.dtg = f64(this.dtg);
		for (const k of OPTIONAL_FLOATS) {
			const a = this.extra[k];
			if (a) this.extra[k] = f64(a, NaN);
		}
		if (this.wpt) {
			const b = new Int32Array(cap);
			b.set(this.wpt.subarray(0, n));
			this.wpt = b;
		}
		this.out = growOutputs(this.out, n, cap);
		this.capacity = cap;
		this.full = null;
	}

	append(chunk: SampleColumns): { from: number; to: number } {
		const m = columnLength(chunk, this.inputWarnings);
		const from = this.n;
		if (m === 0) return { from, to: from };
		this.grow(from + m);
		this.t.set(chunk.t.subarray(0, m), from);
		this.flow.set(chunk.flow.subarray(0, m), from);
		this.gs.set(chunk.gs.subarray(0, m), from);
		this.dtg.set(chunk.dtg.subarray(0, m), from);
		// Optional columns may start part-way through a flight: earlier samples read as blank.
		for (const k of OPTIONAL_FLOATS) {
			const c = chunk[k];
			let a = this.extra[k];
			if (c) {
				if (!a) {
					a = this.extra[k] = new Float64Array(this.capacity).fill(NaN);
					this.full = null;
				}
				a.set(c.subarray(0, m), from);
			} else if (a) a.fill(NaN, from, from + m);
		}
		if (chunk.wpt) {
			if (!this.wpt) {
				this.wpt = new Int32Array(this.capacity).fill(WPT_NONE);
				this.full = null;
			}
			this.wpt.set(chunk.wpt.subarray(0, m), from);
		} else if (this.wpt) this.wpt.fill(WPT_NONE, from, from + m);
		runKernel(this.state, this.fullColumns(), this.out, from, from + m);
		this.n = from + m;
		return { from, to: this.n };
	}

	private recompute(): void {
		this.setup = prepare(this.inputs);
		this.state = createState(this.setup);
		runKernel(this.state, this.fullColumns(), this.out, 0, this.n);
	}

	setDeclaration(declaration: Declaration, previousOnBoardL?: number | null): void {
		this.inputs = { ...this.inputs, declaration };
		if (previousOnBoardL !== undefined) this.inputs.previousOnBoardL = previousOnBoardL;
		this.recompute();
	}

	setEvents(events: readonly FuelEvent[]): void {
		this.inputs = { ...this.inputs, events: [...events] };
		this.recompute();
	}

	addEvent(event: FuelEvent): void {
		const events = [...(this.inputs.events ?? []), event];
		this.inputs = { ...this.inputs, events };
		const s = this.state;
		if (s.lastIdx < 0 || event.t > s.lastT) {
			// Every applied event is at or before the last sample, so a later one sorts after them
			// all and the pass can carry on with the new list.
			this.setup = prepare(this.inputs);
			s.setup = this.setup;
		} else this.recompute();
	}

	setThresholds(thresholds: AlarmThresholds | undefined): void {
		this.inputs = { ...this.inputs, thresholds };
		this.recompute();
	}

	result(): FlightComputation {
		return snapshot(this.state, this.out, this.n, this.inputWarnings);
	}
}

export function createLiveComputation(init: LiveInit): LiveComputation {
	return new LiveFlight(init);
}
