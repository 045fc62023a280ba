// Writes the demo recorder files in samples/ from an invented scenario: Kestrel Field Flying Club
// and its fleet (registrations from scripts/demo-scenario.ts), fictional airfields and waypoints,
// positions over open sea so no real place is implied. Deterministic: the same files every run.
//
//   npx tsx scripts/make-samples.ts            (writes samples/*.csv)
//
// Flows are typical figures for the aircraft types, labelled as such: 4-cylinder 150–200 hp
// engines cruise at roughly 7–11 US gal/h (from memory); climb flow close to twice cruise near
// sea level (common practice); leaning saves about 10 % (FAA AC 61-23C).
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const outDir = path.join(root, 'samples');

/** mulberry32: a small seeded generator, so noise is the same on every run. */
function rng(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

interface Wpt {
	id: string;
	lat: number;
	lon: number;
	elevFt: number;
}

// Invented airfields and turning points (ids are ours, not ICAO codes).
const W: Record<string, Wpt> = {
	KESTRL: { id: 'KESTRL', lat: 47.2, lon: -31.4, elevFt: 240 },
	SALTMR: { id: 'SALTMR', lat: 47.95, lon: -30.1, elevFt: 35 },
	BRAMBL: { id: 'BRAMBL', lat: 47.55, lon: -28.75, elevFt: 610 },
	HOLLOW: { id: 'HOLLOW', lat: 47.38, lon: -31.05, elevFt: 0 },
	CAIRNS: { id: 'CAIRNS', lat: 47.7, lon: -30.9, elevFt: 0 },
	FENWAY: { id: 'FENWAY', lat: 47.42, lon: -29.6, elevFt: 0 },
	LOWGAP: { id: 'LOWGAP', lat: 46.9, lon: -30.2, elevFt: 0 },
	MERROW: { id: 'MERROW', lat: 46.6, lon: -29.3, elevFt: 420 }
};

const NM_PER_DEG_LAT = 60;
function distanceNm(a: Wpt, b: Wpt): number {
	// Flat-earth approximation over a few dozen NM: plenty for demo files.
	const dLat = (b.lat - a.lat) * NM_PER_DEG_LAT;
	const dLon = (b.lon - a.lon) * NM_PER_DEG_LAT * Math.cos((((a.lat + b.lat) / 2) * Math.PI) / 180);
	return Math.hypot(dLat, dLon);
}

/** How an engine burns, in the recorder's flow unit per hour, and how the aircraft flies. */
interface Performance {
	taxiFlow: number;
	runupFlow: number;
	climbFlow: number;
	cruiseFlow: number;
	descentFlow: number;
	climbKt: number;
	cruiseKt: number;
	descentKt: number;
	climbFpm: number;
	/** Extra seconds of full-power climb before the pilot reduces to climb power (rich scenario). */
	fullPowerS?: number;
}

interface Sample {
	t: number;
	flow: number | null;
	gs: number;
	dtg: number;
	wpt: string;
	lat: number;
	lon: number;
	alt: number;
}

/** Flies one engine run: taxi, run-up, take-off, the route, landing, taxi in, shutdown. */
class Recorder {
	samples: Sample[] = [];
	t: number;
	private rand: () => number;

	constructor(startMs: number, seed: number) {
		this.t = startMs / 1000;
		this.rand = rng(seed);
	}

	private noise(scale: number): number {
		return (this.rand() - 0.5) * 2 * scale;
	}

	private push(s: Omit<Sample, 't'>): void {
		this.samples.push({ ...s, t: this.t });
		this.t += 1;
	}

	/** Recorder off: no samples for this long (engine off at a stop, or a dropout). */
	pause(seconds: number): void {
		this.t += seconds;
	}

	run(route: Wpt[], perf: Performance, o: { cruiseAltFt: number; windKt: number; taxiS?: number; circuits?: number }): void {
		const at = (p: Wpt, extra: Partial<Omit<Sample, 't'>> & { flow: number | null; gs: number; alt: number; dtg: number; wpt: string }) =>
			this.push({ lat: p.lat, lon: p.lon, ...extra });
		const origin = route[0];
		const first = route[1];
		const firstLeg = distanceNm(origin, first);
		const f = (x: number) => Math.max(0, x * (1 + this.noise(0.015)));
		// Start-up: a few seconds of zero flow, taxi, run-up.
		for (let i = 0; i < 8; i++) at(origin, { flow: 0, gs: 0, alt: origin.elevFt, dtg: firstLeg, wpt: first.id });
		const taxiS = o.taxiS ?? 240;
		for (let i = 0; i < taxiS; i++) at(origin, { flow: f(perf.taxiFlow), gs: Math.max(0, 9 + this.noise(3)), alt: origin.elevFt, dtg: firstLeg, wpt: first.id });
		for (let i = 0; i < 90; i++) at(origin, { flow: f(i > 30 && i < 70 ? perf.runupFlow : perf.taxiFlow), gs: 0, alt: origin.elevFt, dtg: firstLeg, wpt: first.id });

		let alt = origin.elevFt;
		let climbing = true;
		let sinceTakeoff = 0;
		for (let leg = 1; leg < route.length; leg++) {
			const from = route[leg - 1];
			const to = route[leg];
			const len = distanceNm(from, to);
			const last = leg === route.length - 1;
			let flown = 0;
			let gs = leg === 1 ? 0 : perf.cruiseKt - o.windKt;
			while (flown < len) {
				const left = len - flown;
				// Start down so as to arrive at circuit height near the field, at about 500 ft/min.
				const descend = last && left < ((alt - to.elevFt) / 500) * (perf.descentKt / 60) + 2;
				let targetKt: number;
				let flow: number;
				if (climbing && alt < o.cruiseAltFt && !descend) {
					targetKt = perf.climbKt - o.windKt;
					const fullPower = sinceTakeoff < 60 + (perf.fullPowerS ?? 0);
					flow = fullPower ? perf.climbFlow * 1.08 : perf.climbFlow;
					alt = Math.min(o.cruiseAltFt, alt + (perf.climbFpm + this.noise(60)) / 60);
				} else if (descend) {
					climbing = false;
					targetKt = perf.descentKt - o.windKt;
					flow = perf.descentFlow;
					alt = Math.max(to.elevFt + 300, alt - (500 + this.noise(80)) / 60);
				} else {
					climbing = false;
					targetKt = perf.cruiseKt - o.windKt;
					flow = perf.cruiseFlow;
					alt = o.cruiseAltFt + this.noise(25);
				}
				// Accelerate on the take-off roll, then follow the target speed with a little lag.
				gs = leg === 1 && sinceTakeoff < 25 ? Math.min(targetKt, sinceTakeoff * 3) : gs + (targetKt - gs) * 0.05 + this.noise(0.8);
				flown += Math.max(0, gs) / 3600;
				const k = Math.min(1, flown / len);
				this.push({
					flow: f(flow),
					gs: Math.max(0, gs),
					dtg: Math.max(0, len - flown),
					wpt: to.id,
					lat: from.lat + (to.lat - from.lat) * k,
					lon: from.lon + (to.lon - from.lon) * k,
					alt: Math.round(alt)
				});
				sinceTakeoff++;
			}
			if (last) {
				const field = to;
				// Circuits: climb to 1000 ft above the field, round the pattern, touch and go.
				for (let c = 0; c < (o.circuits ?? 0); c++) {
					for (let i = 0; i < 360; i++) {
						const up = i < 120;
						const down = i >= 240;
						const gsC = i < 15 ? 55 + i * 2 : down ? 75 - (i - 240) * 0.1 : 85;
						const a = up ? field.elevFt + i * 8 : down ? field.elevFt + 1000 - (i - 240) * 8.3 : field.elevFt + 1000;
						this.push({ flow: f(up ? perf.climbFlow : down ? perf.descentFlow * 0.8 : perf.cruiseFlow * 0.9), gs: gsC + this.noise(2), dtg: Math.abs(Math.sin((i / 360) * Math.PI)) * 2.2, wpt: field.id, lat: field.lat, lon: field.lon, alt: Math.round(Math.max(field.elevFt, a)) });
					}
				}
				// Landing roll and taxi in.
				for (let i = 0; i < 30; i++) this.push({ flow: f(perf.descentFlow * 0.5), gs: Math.max(8, 60 - i * 2), dtg: 0, wpt: field.id, lat: field.lat, lon: field.lon, alt: field.elevFt });
				for (let i = 0; i < 150; i++) this.push({ flow: f(perf.taxiFlow), gs: Math.max(0, 8 + this.noise(3)), dtg: 0, wpt: field.id, lat: field.lat, lon: field.lon, alt: field.elevFt });
				for (let i = 0; i < 12; i++) this.push({ flow: 0, gs: 0, dtg: 0, wpt: field.id, lat: field.lat, lon: field.lon, alt: field.elevFt });
			}
		}
	}
}

// ---- the fleet's engines, in the unit each recorder logs -------------------------------------

/** BD-KTR, four-seat trainer, 160 hp: US gal/h. */
const trainer: Performance = { taxiFlow: 2.4, runupFlow: 4.5, climbFlow: 10.6, cruiseFlow: 8.2, descentFlow: 4.8, climbKt: 76, cruiseKt: 108, descentKt: 115, climbFpm: 650 };
/** The same trainer flown full rich throughout: long full-power climb, cruise never leaned. */
const trainerRich: Performance = { ...trainer, climbFlow: 12.4, cruiseFlow: 10.7, descentFlow: 6.2, climbFpm: 560, fullPowerS: 420 };
/** BD-KTT, six-seat tourer, 285 hp: US gal/h. */
const tourer: Performance = { taxiFlow: 4, runupFlow: 7, climbFlow: 22, cruiseFlow: 13.4, descentFlow: 8.5, climbKt: 100, cruiseKt: 148, descentKt: 155, climbFpm: 800 };
/** BD-KTD, four-seat diesel tourer, 155 hp on jet fuel: L/h. */
const diesel: Performance = { taxiFlow: 6, runupFlow: 14, climbFlow: 31, cruiseFlow: 22, descentFlow: 12, climbKt: 80, cruiseKt: 122, descentKt: 128, climbFpm: 700 };

// ---- writers -----------------------------------------------------------------------------------

const iso = (t: number) => new Date(Math.round(t * 1000)).toISOString().replace('.000Z', 'Z');
const fix = (x: number, d: number) => x.toFixed(d);

interface OurFormat {
	flowColumn: 'fuel_flow_usgph' | 'fuel_flow_lbph' | 'fuel_flow_lph';
	/** Multiplies the simulated flow into the file's unit (e.g. 6 lb per US gal of avgas). */
	flowFactor?: number;
	seq?: boolean;
	blankFlow?: [number, number];
}

function writeOurs(name: string, samples: Sample[], o: OurFormat): string {
	const cols = ['time_utc', o.flowColumn, 'ground_speed_kt', 'distance_to_go_nm', 'waypoint', 'latitude', 'longitude', 'altitude_ft', ...(o.seq ? ['seq'] : [])];
	const lines = [cols.join(',')];
	samples.forEach((s, i) => {
		const blank = o.blankFlow && i >= o.blankFlow[0] && i < o.blankFlow[1];
		const flow = s.flow === null || blank ? '' : fix(s.flow * (o.flowFactor ?? 1), 2);
		lines.push([iso(s.t), flow, fix(s.gs, 1), fix(s.dtg, 2), s.wpt, fix(s.lat, 5), fix(s.lon, 5), String(s.alt), ...(o.seq ? [String(100_000 + i)] : [])].join(','));
	});
	return write(name, lines.join('\n') + '\n');
}

function write(name: string, text: string): string {
	fs.writeFileSync(path.join(outDir, name), text);
	return `${name} (${text.split('\n').length - 2} samples, ${(text.length / 1024).toFixed(0)} KB)`;
}

const utc = (y: number, mo: number, d: number, h: number, mi: number) => Date.UTC(y, mo - 1, d, h, mi);

function crossCountry(): Sample[] {
	// Kestrel Field → Saltmere (lands, takes on fuel) → Bramble Down (lands) → Kestrel Field.
	const r = new Recorder(utc(2026, 6, 20, 8, 42), 11);
	r.run([W.KESTRL, W.CAIRNS, W.SALTMR], tourer, { cruiseAltFt: 5500, windKt: 12 });
	r.pause(47 * 60);
	r.run([W.SALTMR, W.BRAMBL], tourer, { cruiseAltFt: 4500, windKt: -6 });
	r.pause(24 * 60);
	r.run([W.BRAMBL, W.FENWAY, W.KESTRL], tourer, { cruiseAltFt: 6500, windKt: -9 });
	return r.samples;
}

function localTraining(): Sample[] {
	const r = new Recorder(utc(2026, 5, 9, 9, 15), 21);
	r.run([W.KESTRL, W.HOLLOW, W.KESTRL], trainer, { cruiseAltFt: 3000, windKt: 8, circuits: 4 });
	return r.samples;
}

function trainerTrip(rich: boolean): Sample[] {
	// The same out-and-back to Merrow on two days: leaned as the book says, then full rich.
	const r = new Recorder(rich ? utc(2026, 7, 4, 13, 5) : utc(2026, 6, 27, 13, 10), rich ? 41 : 31);
	r.run([W.KESTRL, W.LOWGAP, W.MERROW], rich ? trainerRich : trainer, { cruiseAltFt: 4500, windKt: 10 });
	r.pause(35 * 60);
	r.run([W.MERROW, W.LOWGAP, W.KESTRL], rich ? trainerRich : trainer, { cruiseAltFt: 3500, windKt: -10 });
	return r.samples;
}

function dropout(): { samples: Sample[]; blank: [number, number] } {
	const r = new Recorder(utc(2026, 6, 6, 15, 30), 51);
	r.run([W.KESTRL, W.FENWAY, W.BRAMBL], tourer, { cruiseAltFt: 7500, windKt: 15 });
	// A loose connector: the recorder stops for 6 min 40 s in cruise, and earlier the flow sensor
	// reads blank for 45 s while position and speed keep coming.
	const s = r.samples;
	const cut = s.findIndex((x) => x.t - s[0].t > 2400);
	const gone = s.splice(cut, 400);
	void gone;
	const blankAt = s.findIndex((x) => x.t - s[0].t > 1500);
	return { samples: s, blank: [blankAt, blankAt + 45] };
}

function longWayRound(): Sample[] {
	// BD-KTR filled only to the tabs for a long way round against a headwind, no stop: it lands
	// below the 30 min reserve (the demo's flight whose verdict and alarm say so).
	const r = new Recorder(utc(2026, 7, 11, 9, 20), 81);
	r.run([W.KESTRL, W.LOWGAP, W.MERROW, W.BRAMBL, W.SALTMR, W.CAIRNS, W.FENWAY, W.KESTRL], trainer, { cruiseAltFt: 4500, windKt: -18 });
	return r.samples;
}

function dieselNight(): string {
	// BD-KTD's panel logger: its own layout, semicolons, decimal commas, metric units and clock
	// times; the evening flight runs past midnight UTC, so the clock rolls over.
	const r = new Recorder(utc(2026, 8, 14, 23, 5), 61);
	r.run([W.KESTRL, W.SALTMR, W.KESTRL], diesel, { cruiseAltFt: 4000, windKt: 5 });
	const comma = (x: number, d: number) => x.toFixed(d).replace('.', ',');
	const lines = ['# Panel logger export · unit 4471 · BD-KTD', 'Clock;Fuel flow (l/h);Speed over ground (km/h);Distance remaining (km);Altitude (m);Next WP'];
	for (const s of r.samples) {
		const clock = new Date(s.t * 1000).toISOString().slice(11, 19);
		// 1 NM = 1.852 km exactly (BIPM), 1 ft = 0.3048 m exactly.
		lines.push([clock, comma(s.flow ?? 0, 1), comma(s.gs * 1.852, 1), comma(s.dtg * 1.852, 2), comma(s.alt * 0.3048, 0), s.wpt].join(';'));
	}
	return write('kestrel-diesel-panel-log.csv', lines.join('\r\n') + '\r\n');
}

function broken(): string {
	// A short trainer flight whose file went wrong in every way the checks know about.
	const r = new Recorder(utc(2026, 5, 16, 10, 0), 71);
	r.run([W.KESTRL, W.HOLLOW], trainer, { cruiseAltFt: 2500, windKt: 0, taxiS: 60 });
	const s = r.samples.slice(0, 240);
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint,latitude,longitude,altitude_ft'];
	s.forEach((x) => lines.push([iso(x.t), fix(x.flow ?? 0, 2), fix(x.gs, 1), fix(x.dtg, 2), x.wpt, fix(x.lat, 5), fix(x.lon, 5), String(x.alt)].join(',')));
	const cells = (i: number) => lines[i].split(',');
	const set = (i: number, col: number, v: string) => {
		const c = cells(i);
		c[col] = v;
		lines[i] = c.join(',');
	};
	set(14, 1, '8,4'); // a decimal comma in a comma-separated file: one field too many
	set(60, 0, iso(s[40].t)); // the recorder clock jumped back 20 s
	set(95, 1, '-3.20'); // negative flow
	set(130, 2, '612.0'); // ground speed no light aircraft reaches
	set(170, 0, '2026-05-16T10:6:00Z'); // malformed time
	set(200, 3, 'n/a'); // text in a number column
	lines[lines.length - 1] = lines[lines.length - 1].slice(0, 28); // power lost mid-line
	return write('kestrel-broken.csv', lines.join('\n') + '\n');
}

fs.mkdirSync(outDir, { recursive: true });
const written = [
	writeOurs('kestrel-crosscountry-3leg.csv', crossCountry(), { flowColumn: 'fuel_flow_usgph', seq: true }),
	writeOurs('kestrel-local-training.csv', localTraining(), { flowColumn: 'fuel_flow_usgph' }),
	writeOurs('kestrel-trainer-merrow-leaned.csv', trainerTrip(false), { flowColumn: 'fuel_flow_usgph' }),
	writeOurs('kestrel-trainer-merrow-rich.csv', trainerTrip(true), { flowColumn: 'fuel_flow_usgph' }),
	writeOurs('kestrel-trainer-long-way-round.csv', longWayRound(), { flowColumn: 'fuel_flow_usgph' }),
	(() => {
		const d = dropout();
		// Avgas at its standard weight, 6.0 lb per US gallon (FAA-H-8083-30): this recorder logs lb/h.
		return writeOurs('kestrel-tourer-dropout.csv', d.samples, { flowColumn: 'fuel_flow_lbph', flowFactor: 6.0, blankFlow: d.blank });
	})(),
	dieselNight(),
	broken()
];
console.log(`make-samples: wrote ${written.length} files to samples/\n  ${written.join('\n  ')}`);
