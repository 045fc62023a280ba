// Benchmark of the fuel engine (npm run bench): batch computation over 1,000,000 generated
// samples and live appends of 10 samples, printed against the targets in the engine issue
// (≥ 10M samples/s, i.e. ≤ 100 ms per million; appends in microseconds), and the batch time as a
// ratio to a floor loop over the same columns timed in the same run (the kernel's speed guard).

import os from 'node:os';
import { performance } from 'node:perf_hooks';
import {
	ColumnBuilder,
	computeFlight,
	createLiveComputation,
	summarize,
	type FlightInput,
	type FuelEvent,
	type SampleColumns
} from '../src/lib/fuel/index';
// The same deterministic generator as the engine's tests, so every run benchmarks the same data.
import { rng } from '../src/lib/fuel/test-fixtures';

const SAMPLES = Number(process.env.BENCH_SAMPLES ?? 1_000_000);
const WARMUP_RUNS = 3;
const TIMED_RUNS = 10;
const APPEND_CHUNK = 10;
const TARGET_SAMPLES_PER_S = 10_000_000;
const TARGET_MS_PER_MILLION = 100;
/** Our reading of "appends of 10 samples in microseconds": well under a millisecond. */
const TARGET_APPEND_US = 100;

/**
 * Repeated legs of an invented touring trip at 1 Hz: taxi out, climb, cruise, descent, taxi in,
 * then a stop with the engine off and the tanks filled. Flow has sensor noise, about one cell in
 * a thousand is blank, and now and then the recorder drops out for half a minute.
 */
function generate(n: number): { columns: SampleColumns; events: FuelEvent[] } {
	const rand = rng(20261201);
	// Rows become columns the way every stored or received flight does.
	const rows = new ColumnBuilder(n);
	const events: FuelEvent[] = [];
	// Leg plan in seconds: taxi out, climb, cruise, descent, taxi in, stop.
	const plan = [480, 720, 5400, 900, 300, 2400];
	const legLength = plan.reduce((a, b) => a + b, 0);
	let clock = 1_780_000_000;
	let waypoint = 1;
	let legDistance = 0;
	for (let i = 0; i < n; i++) {
		// A 30 s dropout roughly every 20,000 samples.
		clock += rand() < 0.00005 ? 30 : 1;
		const k = i % legLength;
		let f: number, g: number, a: number;
		if (k < plan[0]) {
			f = 14 + rand() * 4;
			g = k < 120 ? 0 : 6 + rand() * 8;
			a = 450;
		} else if (k < plan[0] + plan[1]) {
			const s = k - plan[0];
			f = 52 + rand() * 4;
			g = 70 + rand() * 8;
			a = 450 + s * 10;
		} else if (k < plan[0] + plan[1] + plan[2]) {
			f = 30 + rand() * 4;
			g = 105 + rand() * 10;
			a = 7650 + (rand() - 0.5) * 40;
		} else if (k < plan[0] + plan[1] + plan[2] + plan[3]) {
			const s = k - plan[0] - plan[1] - plan[2];
			f = 18 + rand() * 4;
			g = 115 + rand() * 6;
			a = 7650 - s * 7.8;
		} else if (k < legLength - plan[5]) {
			f = 12 + rand() * 3;
			g = 5 + rand() * 6;
			a = 630;
		} else {
			f = 0;
			g = 0;
			a = 630;
			if (k === legLength - plan[5]) events.push({ t: clock + 600, kind: 'toFull' });
		}
		if (k >= plan[0] && k < legLength - plan[5] - plan[4]) {
			legDistance -= g / 3600;
			if (legDistance <= 0) {
				legDistance = 25 + rand() * 20;
				waypoint++;
			}
		}
		rows.push(i, clock * 1000, rand() < 0.001 ? null : f, g, g > 0 ? legDistance : null, a, `WP${waypoint}`);
	}
	return { columns: rows.columns(), events };
}

/**
 * The floor: the simplest loop that reads the same input columns and writes the same output
 * arrays as computeFlight (every per-sample array of its result, allocated per run as the engine
 * allocates them), with one trivial formula per output. No validation, gaps, phases, alarms or
 * reserve logic: what is left is memory traffic and the loop itself, the least any single pass
 * over these columns can cost. The engine's time divided by this is its overhead.
 */
function floorLoop(c: SampleColumns, startL: number, meterFactor: number): { onBoard: Float64Array; checksum: number } {
	const n = c.t.length;
	const t = c.t, flowIn = c.flow, gs = c.gs, dtg = c.dtg, alt = c.alt!, wpt = c.wpt!;
	const flow = new Float64Array(n), used = new Float64Array(n), onBoard = new Float64Array(n), endurance = new Float64Array(n);
	const timeToWpt = new Float64Array(n), fuelToWpt = new Float64Array(n), arrivalL = new Float64Array(n), arrivalMarginMin = new Float64Array(n);
	const specificRange = new Float64Array(n), reserveL = new Float64Array(n), cruiseFlow = new Float64Array(n);
	const phase = new Uint8Array(n), alarmState = new Uint8Array(n), flags = new Uint8Array(n), arrivalState = new Uint8Array(n), reserveBasis = new Uint8Array(n);
	let u = 0;
	let lastT = t[0];
	let lastF = 0;
	for (let i = 0; i < n; i++) {
		const f = flowIn[i] * meterFactor;
		const fv = f === f ? f : lastF;
		const dt = t[i] - lastT;
		u += ((fv + lastF) / 2) * (dt / 3600);
		lastT = t[i];
		lastF = fv;
		const ob = startL - u;
		const h = dtg[i] / gs[i];
		flow[i] = fv;
		used[i] = u;
		onBoard[i] = ob;
		endurance[i] = ob / fv;
		timeToWpt[i] = h;
		fuelToWpt[i] = h * fv;
		arrivalL[i] = ob - h * fv;
		arrivalMarginMin[i] = (ob - h * fv) / fv * 60;
		specificRange[i] = gs[i] / fv;
		reserveL[i] = fv * 0.5;
		cruiseFlow[i] = fv;
		phase[i] = alt[i] > 1000 ? 4 : 2;
		alarmState[i] = ob < 40 ? 1 : 0;
		flags[i] = f === f ? 0 : 4;
		arrivalState[i] = wpt[i] & 3;
		reserveBasis[i] = 1;
	}
	return { onBoard, checksum: used[n - 1] + endurance[n >> 1] + arrivalMarginMin[n >> 2] + specificRange[n >> 3] + phase[n >> 1] + flags[n >> 1] };
}

function quantile(sorted: Float64Array, q: number): number {
	return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

/** Bytes held by the per-sample result arrays (every typed array of the computation). */
function resultBytes(c: object): number {
	let bytes = 0;
	for (const v of Object.values(c)) if (ArrayBuffer.isView(v)) bytes += v.byteLength;
	return bytes;
}

const mb = (bytes: number): string => `${(bytes / 1048576).toFixed(1)} MB`;
const fmt = (x: number, digits = 1): string => x.toLocaleString('en-US', { maximumFractionDigits: digits });

function main(): void {
	console.log(
		`Burndown fuel engine benchmark — Node ${process.version}, ${os.cpus().length} cores (${os.cpus()[0]?.model ?? 'unknown cpu'})`
	);
	// Other work on the machine shows up as wall time; the load average says how much there was.
	console.log(`load average before: ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
	const g0 = performance.now();
	const { columns, events } = generate(SAMPLES);
	console.log(`generated ${fmt(SAMPLES, 0)} samples and ${events.length} fuel events in ${fmt(performance.now() - g0)} ms`);

	const input: FlightInput = {
		columns,
		profile: { capacityL: 200, lowerLevelL: 130, unusableL: 8, densityKgPerL: 0.719, meterFactor: 1.02 },
		declaration: { kind: 'full' },
		events,
		thresholds: { lowFuelL: 40, lowEnduranceMin: 45 },
		reserve: { ruleId: 'faa-91.151-vfr-day' }
	};

	for (let r = 0; r < WARMUP_RUNS; r++) {
		computeFlight(input);
		floorLoop(columns, 200, 1.02);
	}
	const times = new Float64Array(TIMED_RUNS);
	const floorTimes = new Float64Array(TIMED_RUNS);
	let floorSink = 0;
	const cpuTimes = new Float64Array(TIMED_RUNS);
	let result = computeFlight(input);
	for (let r = 0; r < TIMED_RUNS; r++) {
		const cpu = process.cpuUsage();
		const a = performance.now();
		result = computeFlight(input);
		times[r] = performance.now() - a;
		const used = process.cpuUsage(cpu);
		cpuTimes[r] = (used.user + used.system) / 1000;
		// The floor in the same run, alternating with the engine, so load on the machine hits both alike.
		const f0 = performance.now();
		floorSink += floorLoop(columns, 200, 1.02).checksum;
		floorTimes[r] = performance.now() - f0;
	}
	const floorMedian = quantile(floorTimes.slice().sort(), 0.5);
	const mem = process.memoryUsage();
	const sortedTimes = times.slice().sort();
	const cpuMedian = quantile(cpuTimes.slice().sort(), 0.5);
	const median = quantile(sortedTimes, 0.5);
	const best = sortedTimes[0];
	const mean = times.reduce((a, b) => a + b, 0) / TIMED_RUNS;
	const rate = SAMPLES / (median / 1000);
	const msPerMillion = (median * 1_000_000) / SAMPLES;

	const s0 = performance.now();
	const summary = summarize(result);
	const summaryMs = performance.now() - s0;

	console.log('\nbatch computeFlight (full per-sample state)');
	console.log(`  runs: ${TIMED_RUNS} after ${WARMUP_RUNS} warm-up runs`);
	console.log(`  each run: ${Array.from(times, (x) => x.toFixed(1)).join(', ')} ms`);
	console.log(`  time: median ${fmt(median, 2)} ms, best ${fmt(best, 2)} ms, mean ${fmt(mean, 2)} ms`);
	console.log(`  process CPU time per run (includes GC threads): median ${fmt(cpuMedian, 2)} ms`);
	console.log(`  rate: ${fmt(rate / 1e6, 2)} M samples/s (median), ${fmt(SAMPLES / (best / 1000) / 1e6, 2)} M samples/s (best)`);
	console.log(
		`  vs target: ${fmt(rate / TARGET_SAMPLES_PER_S, 2)}× the ${fmt(TARGET_SAMPLES_PER_S / 1e6, 0)} M samples/s target; ${fmt(msPerMillion, 1)} ms per million = ${fmt(msPerMillion / TARGET_MS_PER_MILLION, 2)}× the ${TARGET_MS_PER_MILLION} ms budget`
	);
	console.log(
		`  floor loop (same input columns, same 16 output arrays, trivial formulas): median ${fmt(floorMedian, 2)} ms, each run ${Array.from(floorTimes, (x) => x.toFixed(1)).join(', ')} ms (checksum ${floorSink.toFixed(0)})`
	);
	console.log(
		`  engine ÷ floor: ${fmt(median / floorMedian, 2)}× (median ÷ median), ${fmt(best / floorTimes.slice().sort()[0], 2)}× (best ÷ best, less moved by other load); aim ≤ 1.5×`
	);
	console.log(
		`  memory after runs: heap used ${mb(mem.heapUsed)}, array buffers ${mb(mem.arrayBuffers)}, RSS ${mb(mem.rss)}; result arrays ${mb(resultBytes(result))}`
	);
	console.log(
		`  timeline: ${result.gaps.length} gaps, ${result.alarms.length} alarm episodes, ${result.problems.length} problems, ${result.events.length} events`
	);
	console.log(
		`  summarize: ${fmt(summaryMs, 3)} ms; fuel used ${fmt(summary.fuelUsedL)} L, cruise ${fmt(summary.cruiseFlowLph ?? NaN)} L/h`
	);

	// Live: the same samples arriving 10 at a time, timed one append at a time.
	const live = createLiveComputation({ ...input, events });
	const appends = Math.floor(SAMPLES / APPEND_CHUNK);
	const appendUs = new Float64Array(appends);
	const chunkOf = (from: number): SampleColumns => ({
		t: columns.t.subarray(from, from + APPEND_CHUNK),
		flow: columns.flow.subarray(from, from + APPEND_CHUNK),
		gs: columns.gs.subarray(from, from + APPEND_CHUNK),
		dtg: columns.dtg.subarray(from, from + APPEND_CHUNK),
		alt: columns.alt!.subarray(from, from + APPEND_CHUNK),
		wpt: columns.wpt!.subarray(from, from + APPEND_CHUNK)
	});
	const l0 = performance.now();
	for (let k = 0; k < appends; k++) {
		const chunk = chunkOf(k * APPEND_CHUNK);
		const a = performance.now();
		live.append(chunk);
		appendUs[k] = (performance.now() - a) * 1000;
	}
	const liveTotalMs = performance.now() - l0;
	const sortedAppends = appendUs.slice().sort();
	const appendMean = appendUs.reduce((a, b) => a + b, 0) / appends;
	const p50 = quantile(sortedAppends, 0.5);
	const p99 = quantile(sortedAppends, 0.99);
	const max = sortedAppends[appends - 1];

	// The same figures as the batch run, or the benchmark is measuring the wrong thing.
	const liveResult = live.result();
	let mismatches = 0;
	const n = appends * APPEND_CHUNK;
	for (let i = 0; i < n; i++) {
		if (!Object.is(liveResult.onBoard[i], result.onBoard[i])) mismatches++;
		if (!Object.is(liveResult.arrivalL[i], result.arrivalL[i])) mismatches++;
		if (!Object.is(liveResult.reserveL[i], result.reserveL[i])) mismatches++;
	}

	// Steady state: 10 more samples onto a flight that already holds a million.
	const tail = createLiveComputation({ ...input, events, initialCapacity: SAMPLES * 2 });
	tail.append(columns);
	const extra = generate(APPEND_CHUNK * 1000).columns;
	const offset = columns.t[SAMPLES - 1] - extra.t[0] + 1;
	for (let i = 0; i < extra.t.length; i++) extra.t[i] += offset;
	const steadyUs = new Float64Array(1000);
	for (let k = 0; k < 1000; k++) {
		const from = k * APPEND_CHUNK;
		const chunk: SampleColumns = {
			t: extra.t.subarray(from, from + APPEND_CHUNK),
			flow: extra.flow.subarray(from, from + APPEND_CHUNK),
			gs: extra.gs.subarray(from, from + APPEND_CHUNK),
			dtg: extra.dtg.subarray(from, from + APPEND_CHUNK),
			alt: extra.alt!.subarray(from, from + APPEND_CHUNK),
			wpt: extra.wpt!.subarray(from, from + APPEND_CHUNK)
		};
		const a = performance.now();
		tail.append(chunk);
		steadyUs[k] = (performance.now() - a) * 1000;
	}
	const steadySorted = steadyUs.slice().sort();

	console.log(`\nlive append of ${APPEND_CHUNK} samples (${fmt(appends, 0)} appends from empty, buffers doubling as needed)`);
	console.log(
		`  per append: mean ${fmt(appendMean, 2)} µs, p50 ${fmt(p50, 2)} µs, p99 ${fmt(p99, 2)} µs, max ${fmt(max, 0)} µs (max includes a buffer doubling)`
	);
	console.log(`  total: ${fmt(liveTotalMs, 1)} ms for ${fmt(n, 0)} samples; live equals batch: ${mismatches === 0 ? 'yes' : `NO (${mismatches} differences)`}`);
	console.log(
		`  onto a flight of ${fmt(SAMPLES, 0)} samples: p50 ${fmt(quantile(steadySorted, 0.5), 2)} µs, p99 ${fmt(quantile(steadySorted, 0.99), 2)} µs`
	);
	console.log(`  vs target: p50 = ${fmt(p50 / TARGET_APPEND_US, 3)}× the ${TARGET_APPEND_US} µs budget (our reading of "microseconds")`);
	console.log(`load average after: ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
	if (mismatches > 0) process.exitCode = 1;
}

main();
