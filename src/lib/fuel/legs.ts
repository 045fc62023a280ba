// Logbook legs: a flight's samples cut at its engine-off stops, each leg with its own block time,
// engine time, fuel used and the average flow over that engine time. A pass over the engine's
// answer (its flow after the meter factor, fuel used, rejected rows) and the recorded ground speed.

import { FLAG_REJECTED, type FlightComputation, type SampleColumns } from './types';

/**
 * The stop rule (our choice, not from a source): the aircraft stands still (ground speed below
 * the engine's minGsKt, or blank) with the engine stopped (flow at or below minFlowLph, or none
 * yet) — or the recorder sent nothing while it stood still at both ends of the silence — for at
 * least this long, with engine running or movement both before and after. A turn-round with the
 * engine shut down usually takes longer than five minutes; a shorter pause at the holding point
 * or a flow sensor blinking to zero does not cut a leg.
 */
export const LEG_STOP_MIN_S = 300;

/** How a stop was seen: engine off while standing, or a recorder silence on the ground. */
export type StopKind = 'engineOff' | 'recorderGap';

export interface EngineStop {
	/** Last sample of the leg before the stop, and first sample of the leg after it. */
	startIndex: number;
	endIndex: number;
	start: number;
	end: number;
	durationS: number;
	/** 'recorderGap' when some of the stop's time has no samples. */
	kind: StopKind;
}

export interface FlightLeg {
	/** Samples of the leg, both ends included: the first and last accepted sample of its stretch. */
	startIndex: number;
	endIndex: number;
	start: number;
	end: number;
	/** From first movement to coming to rest within the leg; engine start to stop without movement. */
	blockTimeS: number;
	blockTimeBasis: 'movement' | 'engine' | 'none';
	/** Time with the engine running (either end of a segment above minFlowLph), as the flight's. */
	engineTimeS: number;
	/** Fuel used over the leg, litres (the engine's figure, across any reset of fuel used). */
	fuelUsedL: number;
	/** fuelUsedL ÷ engineTimeS, L/h; null when the engine never ran in the leg. */
	averageFlowLph: number | null;
	/** Distance flown over the leg, NM (trapezoid over ground speed, as the flight's). */
	distanceNm: number;
}

export interface LegOptions {
	minFlowLph?: number;
	minGsKt?: number;
	stopMinS?: number;
}

/** The engine's own thresholds (engine.ts DEFAULT_OPTIONS); repeated there would be a second home. */
export interface LegThresholds {
	minFlowLph: number;
	minGsKt: number;
}

/**
 * Fuel used since the first sample, continuous across "used" resets: the engine's used column
 * plus what each reset took away.
 */
function continuousUsed(c: FlightComputation): Float64Array {
	const out = new Float64Array(c.length);
	const resets = c.events.filter((e) => e.event.kind === 'resetUsed' && e.index >= 0).sort((a, b) => a.index - b.index);
	let offset = 0;
	let r = 0;
	for (let i = 0; i < c.length; i++) {
		while (r < resets.length && resets[r].index <= i) offset += resets[r++].usedBeforeL;
		out[i] = c.used[i] + offset;
	}
	return out;
}

/** The flight's stops and the legs between them; one leg without stops, none without samples. */
export function findLegs(
	columns: SampleColumns,
	c: FlightComputation,
	thresholds: LegThresholds,
	o: LegOptions = {}
): { legs: FlightLeg[]; stops: EngineStop[] } {
	const minFlow = o.minFlowLph ?? thresholds.minFlowLph;
	const minGs = o.minGsKt ?? thresholds.minGsKt;
	const stopMin = o.stopMinS ?? LEG_STOP_MIN_S;
	const t = columns.t;
	const gs = columns.gs;

	// Accepted samples only: a rejected row carries no reading.
	const idx: number[] = [];
	for (let i = 0; i < c.length; i++) if ((c.flags[i] & FLAG_REJECTED) === 0) idx.push(i);
	if (idx.length === 0) return { legs: [], stops: [] };

	const running = (i: number) => c.flow[i] > minFlow;
	const moving = (i: number) => gs[i] >= minGs;
	const idle = (i: number) => !running(i) && !moving(i);
	const gapEnds = new Set(c.gaps.filter((g) => g.kind === 'time').map((g) => g.endIndex));

	// A segment (idx[k-1] → idx[k]) is "stopped" when both ends stand still with the engine off,
	// or when it is a recorder silence with both ends standing still.
	const stoppedSeg = (k: number): { stopped: boolean; silent: boolean } => {
		const a = idx[k - 1];
		const b = idx[k];
		if (idle(a) && idle(b)) return { stopped: true, silent: gapEnds.has(b) };
		if (gapEnds.has(b) && !moving(a) && !moving(b)) return { stopped: true, silent: true };
		return { stopped: false, silent: false };
	};

	const firstActive = idx.findIndex((i) => !idle(i));
	let lastActive = -1;
	for (let k = idx.length - 1; k >= 0; k--)
		if (!idle(idx[k])) {
			lastActive = k;
			break;
		}

	const stops: EngineStop[] = [];
	if (firstActive >= 0) {
		let runStart = -1;
		let silent = false;
		for (let k = firstActive + 1; k <= lastActive; k++) {
			const s = stoppedSeg(k);
			if (s.stopped) {
				if (runStart < 0) {
					runStart = k - 1;
					silent = false;
				}
				silent ||= s.silent;
				continue;
			}
			if (runStart >= 0) {
				const a = idx[runStart];
				const b = idx[k - 1];
				if (t[b] - t[a] >= stopMin)
					stops.push({ startIndex: a, endIndex: b, start: t[a], end: t[b], durationS: t[b] - t[a], kind: silent ? 'recorderGap' : 'engineOff' });
				runStart = -1;
			}
		}
	}

	const used = continuousUsed(c);
	const legs: FlightLeg[] = [];
	// Leg ranges in positions of idx: from the start (or a stop's end) to a stop's start (or the end).
	const bounds: [number, number][] = [];
	let from = 0;
	const pos = new Map(idx.map((i, k) => [i, k]));
	for (const s of stops) {
		bounds.push([from, pos.get(s.startIndex)!]);
		from = pos.get(s.endIndex)!;
	}
	bounds.push([from, idx.length - 1]);

	for (const [ka, kb] of bounds) {
		let engineTimeS = 0;
		let distanceNm = 0;
		let firstMove = NaN;
		let lastMove = NaN;
		let firstRun = NaN;
		let lastRun = NaN;
		let lastGsK = -1;
		for (let k = ka; k <= kb; k++) {
			const i = idx[k];
			if (k > ka) {
				const p = idx[k - 1];
				if (running(p) || running(i)) engineTimeS += t[i] - t[p];
			}
			// Distance bridges blank ground-speed cells, as the engine's does.
			if (gs[i] === gs[i]) {
				if (lastGsK >= 0) distanceNm += ((gs[i] + gs[idx[lastGsK]]) * (t[i] - t[idx[lastGsK]])) / 7200;
				lastGsK = k;
			}
			if (running(i)) {
				if (firstRun !== firstRun) firstRun = t[i];
				lastRun = t[i];
			}
			if (moving(i)) {
				if (firstMove !== firstMove) firstMove = t[i];
				lastMove = t[i];
			}
		}
		const a = idx[ka];
		const b = idx[kb];
		const fuelUsedL = used[b] - used[a];
		let blockTimeS = 0;
		let blockTimeBasis: FlightLeg['blockTimeBasis'] = 'none';
		if (firstMove === firstMove) {
			blockTimeS = lastMove - firstMove;
			blockTimeBasis = 'movement';
		} else if (firstRun === firstRun) {
			blockTimeS = lastRun - firstRun;
			blockTimeBasis = 'engine';
		}
		legs.push({
			startIndex: a,
			endIndex: b,
			start: t[a],
			end: t[b],
			blockTimeS,
			blockTimeBasis,
			engineTimeS,
			fuelUsedL,
			averageFlowLph: engineTimeS > 0 ? fuelUsedL / (engineTimeS / 3600) : null,
			distanceNm
		});
	}
	return { legs, stops };
}
