// The exports: the engine's figures as a fuel log (one row per sample or one per minute) and the
// flight summary with its declaration, fuel events and notes, in one chosen fuel unit (distances
// NM, speeds kt, altitude ft, positions in degrees), named with the screens' words and the unit in
// brackets. The summary is one list of rows that both the CSV and the JSON are written from, so the
// two say the same in the same units. Times are UTC, as ISO 8601 or as "yyyy-mm-dd hh:mm:ss" that
// spreadsheets read as a date and time; a file may start with a UTF-8 byte-order mark. The log is
// written a few thousand rows at a time, so a long flight streams out in bounded memory.
import type { FlightComputation, FlightSummary, SampleColumns } from '$lib/fuel';
import type { Declaration } from '$lib/fuel';
import { alarmKinds, cruiseBasisCodes, WPT_NONE } from '$lib/fuel';
import { fromLitres, fuelUnitLabels, type FuelUnit } from '$lib/units';
import { alarmLabels, arrivalWords, eventLabels, figureLabels as L, flagWords, phaseLabels } from '$lib/labels';
import { declarationKindLabels } from '$lib/schemas/declaration';
import { BOM, csvLines, numberCell as num, type Cell } from './csv-writer';

export type LogEvery = 'sample' | 'minute';
/** How times are written: ISO 8601 (2026-05-02T09:00:00.000Z) or for spreadsheets (2026-05-02 09:00:00). */
export type TimeStyle = 'iso' | 'spreadsheet';

export interface ExportStyle {
	unit: FuelUnit;
	densityKgPerL: number;
	times: TimeStyle;
	/** Start the file with a UTF-8 byte-order mark. */
	bom: boolean;
}

/**
 * Rows for a per-minute log: the first sample of each UTC minute that has samples, and the last
 * sample of the flight so the shutdown figures are always there.
 */
export function minuteRows(t: Float64Array, n: number): number[] {
	const rows: number[] = [];
	let lastMinute = -Infinity;
	for (let i = 0; i < n; i++) {
		const minute = Math.floor(t[i] / 60);
		if (minute > lastMinute) {
			rows.push(i);
			lastMinute = minute;
		}
	}
	if (n > 0 && rows[rows.length - 1] !== n - 1) rows.push(n - 1);
	return rows;
}

/** A moment (epoch seconds) as text in the style asked for; empty when there is none. */
export function timeText(epochS: number | null | undefined, style: TimeStyle): string {
	if (epochS === null || epochS === undefined || !Number.isFinite(epochS)) return '';
	const iso = new Date(Math.round(epochS * 1000)).toISOString();
	return style === 'iso' ? iso : iso.slice(0, 19).replace('T', ' ');
}

const withUnit = (label: string, unit: string) => `${label} (${unit})`;

export interface FuelLogInput extends ExportStyle {
	columns: SampleColumns;
	computation: FlightComputation;
	waypoints: readonly string[];
	every: LogEvery;
}

/** Rows of the fuel log per piece of text fuelLogChunks yields. */
export const LOG_ROWS_PER_CHUNK = 2000;

/** The log's column names: the screens' words, each with its unit. */
export function fuelLogHeader(unit: FuelUnit): string[] {
	const u = fuelUnitLabels[unit];
	return [
		withUnit(L.time, 'UTC'),
		withUnit(L.elapsed, 's'),
		L.phase,
		withUnit(L.flow, `${u}/h`),
		withUnit(L.used, u),
		withUnit(L.onBoard, u),
		withUnit(L.endurance, 'min'),
		withUnit(L.groundSpeed, 'kt'),
		withUnit(L.distanceToGo, 'NM'),
		L.waypoint,
		withUnit(L.timeToGo, 'min'),
		withUnit(L.fuelToGetThere, u),
		withUnit(L.leftOnArrival, u),
		withUnit(L.reserveAmount, u),
		L.reserveBasis,
		withUnit(L.againstReserve, u),
		withUnit(L.againstReserve, 'min at normal cruise'),
		L.arrival,
		withUnit(L.specificRange, `NM/${u}`),
		L.alarms,
		L.flags,
		withUnit(L.latitude, '°'),
		withUnit(L.longitude, '°'),
		withUnit(L.altitude, 'ft')
	];
}

/** CSV text of the whole log (for tests and small flights). */
export function fuelLogCsv(x: FuelLogInput): string {
	let out = '';
	for (const piece of fuelLogChunks(x)) out += piece;
	return out;
}

/** The fuel log as CSV text in pieces of LOG_ROWS_PER_CHUNK rows (the header first), for streaming. */
export function* fuelLogChunks(x: FuelLogInput, rowsPerChunk = LOG_ROWS_PER_CHUNK): Generator<string> {
	const { columns: c, computation: r, unit } = x;
	const fuel = (litres: number) => fromLitres(litres, unit, x.densityKgPerL);
	// Specific range is distance per unit of fuel: NM/L × litres per unit.
	const perUnit = 1 / fromLitres(1, unit, x.densityKgPerL);
	const n = r.length;
	const minutes = x.every === 'minute' ? minuteRows(c.t, n) : null;
	const count = minutes ? minutes.length : n;
	const t0 = n > 0 ? c.t[0] : 0;
	// Each sample's position (degrees) when the flight has any: columns.lat / columns.lon.
	const pos = c.lat && c.lon ? { lat: c.lat, lon: c.lon } : null;
	yield (x.bom ? BOM : '') + csvLines([fuelLogHeader(unit)]);
	let rows: Cell[][] = [];
	for (let k = 0; k < count; k++) {
		const i = minutes ? minutes[k] : k;
		const w = c.wpt ? c.wpt[i] : WPT_NONE;
		const alarms = alarmKinds.filter((_, b) => r.alarmState[i] & (1 << b)).map((b) => alarmLabels[b]);
		rows.push([
			timeText(c.t[i], x.times),
			num(c.t[i] - t0, 1),
			phaseLabels[r.phase[i]] ?? '',
			num(fuel(r.flow[i]), 3),
			num(fuel(r.used[i]), 3),
			num(fuel(r.onBoard[i]), 3),
			num(r.endurance[i] * 60, 1),
			num(c.gs[i], 1),
			num(c.dtg[i], 2),
			w === WPT_NONE ? '' : (x.waypoints[w] ?? ''),
			num(r.timeToWpt[i] * 60, 1),
			num(fuel(r.fuelToWpt[i]), 3),
			num(fuel(r.arrivalL[i]), 3),
			num(fuel(r.reserveL[i]), 3),
			Number.isFinite(r.reserveL[i]) ? (cruiseBasisCodes[r.reserveBasis[i]] ?? '') : '',
			num(fuel(r.arrivalL[i] - r.reserveL[i]), 3),
			num(r.arrivalMarginMin[i], 1),
			arrivalWords[r.arrivalState[i]]?.id ?? '',
			num(r.specificRange[i] * perUnit, 3),
			alarms.join('; '),
			flagWords(r.flags[i]).join(' '),
			pos ? num(pos.lat[i], 6) : null,
			pos ? num(pos.lon[i], 6) : null,
			c.alt ? num(c.alt[i], 0) : null
		]);
		if (rows.length >= rowsPerChunk) {
			yield csvLines(rows);
			rows = [];
		}
	}
	if (rows.length > 0) yield csvLines(rows);
}

/** One line of the summary: a stable key for scripts, the screen's words, the value and its unit. */
export interface SummaryRow {
	key: string;
	label: string;
	value: string | number | null;
	unit: string;
}

export interface SummaryInput extends ExportStyle {
	summary: FlightSummary;
	computation: FlightComputation;
	registration: string;
	title: string;
	pilot: string | null;
	waypoints: readonly string[];
	declaration: Declaration;
	events: readonly { t: Date; kind: keyof typeof eventLabels; amountL: number | null; note: string }[];
	/** The flight's own notes (its details) and the notes written on its timeline. */
	flightNotes: string;
	notes: readonly { t: Date | null; body: string; author: string | null }[];
}

/** The summary as rows: the figures, then the declaration, the fuel events and the notes. */
export function summaryRows(x: SummaryInput): SummaryRow[] {
	const s = x.summary;
	const u = fuelUnitLabels[x.unit];
	const fuel = (l: number | null | undefined) => (l === null || l === undefined ? null : num(fromLitres(l, x.unit, x.densityKgPerL), 3));
	const when = (t: number | null | undefined) => timeText(t, x.times) || null;
	const perUnit = 1 / fromLitres(1, x.unit, x.densityKgPerL);
	const rows: SummaryRow[] = [];
	const row = (key: string, label: string, value: string | number | null, unit = '') => rows.push({ key, label, value, unit });
	row('aircraft', 'Aircraft', x.registration);
	row('title', 'Title', x.title);
	row('pilot', 'Pilot', x.pilot ?? '');
	row('start', 'Engine start', when(s.start), 'UTC');
	row('end', 'Engine stop', when(s.end), 'UTC');
	row('samples', 'Samples', s.sampleCount);
	row('rejectedSamples', 'Rejected samples', s.rejectedCount);
	row('blockTime', L.blockTime, num(s.blockTimeS / 60, 1), `min (${s.blockTimeBasis})`);
	row('engineTime', L.engineTime, num(s.engineTimeS / 60, 1), 'min');
	row('fuelUsed', L.used, fuel(s.fuelUsedL), u);
	row('onBoardAtShutdown', L.onBoardAtShutdown, fuel(s.onBoardAtShutdownL), u);
	row('averageFlow', L.averageFlow, fuel(s.averageFlowLph), `${u}/h`);
	row('maxFlow', L.maxFlow, fuel(s.maxFlowLph), `${u}/h`);
	row('cruiseFlow', L.cruiseFlow, fuel(s.cruiseFlowLph), `${u}/h`);
	row('cruiseSpecificRange', L.cruiseSpecificRange, num(s.cruiseSpecificRangeNmPerL === null ? null : s.cruiseSpecificRangeNmPerL * perUnit, 3), `NM/${u}`);
	row('distance', L.distance, num(s.distanceNm, 1), 'NM');
	row('averageGroundSpeed', `Average ${L.groundSpeed.toLowerCase()}`, num(s.averageGsKt, 1), 'kt');
	row('reserveRule', 'Reserve rule', s.reserve?.rule.label ?? '', s.reserve?.rule.citation ?? '');
	row('reserveAmount', L.reserveAmount, fuel(s.reserve?.amountL), u);
	row('reserveBasis', L.reserveBasis, s.reserve?.basis ?? '', s.reserve?.note ?? '');
	row('verdict', 'Verdict', s.verdict?.state ?? '', 'fuel on board at shutdown against the reserve amount');
	row('landedMargin', 'Landed margin', fuel(s.verdict?.marginL), u);
	row('landedMarginMin', 'Landed margin', num(s.verdict?.marginMin, 1), 'min at normal cruise');
	row('thinnestMargin', L.thinnestMargin, fuel(s.thinnestMargin?.marginL), `${u}, airborne, held for the alarm persistence`);
	row('thinnestMarginMin', L.thinnestMargin, num(s.thinnestMargin?.minutes, 1), 'min at normal cruise');
	row('thinnestMarginTime', `${L.thinnestMargin}: time`, when(s.thinnestMargin?.t), 'UTC');
	row('thinnestMarginWaypoint', `${L.thinnestMargin}: waypoint`, s.thinnestMargin?.wpt === null || s.thinnestMargin?.wpt === undefined ? '' : (x.waypoints[s.thinnestMargin.wpt] ?? ''));
	row('belowReserveFrom', L.belowReserve, when(s.reserveReachedAt?.t), 'UTC, first moment with fuel on board below the reserve amount');
	row('gaps', 'Data gaps', s.gapCount);
	row('gapTime', 'Time in data gaps', num(s.gapTimeS / 60, 1), 'min');
	row('alarms', L.alarms, s.alarmCount);
	for (const p of s.phases) {
		row(`phase.${p.name}.time`, `${L.phase} ${p.name}: time`, num(p.timeS / 60, 1), 'min');
		row(`phase.${p.name}.fuel`, `${L.phase} ${p.name}: fuel`, fuel(p.fuelL), u);
		row(`phase.${p.name}.averageFlow`, `${L.phase} ${p.name}: ${L.averageFlow.toLowerCase()}`, fuel(p.averageFlowLph), `${u}/h`);
	}
	(s.legs ?? []).forEach((leg, k) => {
		const n = k + 1;
		row(`leg.${n}.start`, `${L.leg} ${n}: start`, when(leg.start), 'UTC');
		row(`leg.${n}.end`, `${L.leg} ${n}: end`, when(leg.end), 'UTC');
		row(`leg.${n}.blockTime`, `${L.leg} ${n}: ${L.blockTime.toLowerCase()}`, num(leg.blockTimeS / 60, 1), `min (${leg.blockTimeBasis})`);
		row(`leg.${n}.engineTime`, `${L.leg} ${n}: ${L.engineTime.toLowerCase()}`, num(leg.engineTimeS / 60, 1), 'min');
		row(`leg.${n}.fuelUsed`, `${L.leg} ${n}: ${L.used.toLowerCase()}`, fuel(leg.fuelUsedL), u);
		row(`leg.${n}.averageFlow`, `${L.leg} ${n}: ${L.averageFlow.toLowerCase()}`, fuel(leg.averageFlowLph), `${u}/h over the leg's engine time`);
	});
	const d = x.declaration;
	row('declaration', L.declaration, declarationKindLabels[d.kind]);
	if ('amountL' in d) row('declaredAmount', L.declaredAmount, fuel(d.amountL), u);
	row('startFuel', L.startFuel, x.computation.length > 0 ? fuel(x.computation.onBoard[0]) : null, u);
	x.events.forEach((e, k) => {
		const n = k + 1;
		row(`fuelEvent.${n}`, `${L.fuelEvent} ${n}`, eventLabels[e.kind]);
		row(`fuelEvent.${n}.time`, `${L.fuelEvent} ${n}: time`, when(e.t.getTime() / 1000), 'UTC');
		if (e.amountL !== null) row(`fuelEvent.${n}.amount`, `${L.fuelEvent} ${n}: amount`, fuel(e.amountL), u);
		if (e.note) row(`fuelEvent.${n}.note`, `${L.fuelEvent} ${n}: note`, e.note);
	});
	if (x.flightNotes) row('notes', L.notes, x.flightNotes);
	x.notes.forEach((note, k) => {
		const n = k + 1;
		row(`note.${n}`, `${L.note} ${n}`, note.body, note.author ? `by ${note.author}` : '');
		if (note.t) row(`note.${n}.time`, `${L.note} ${n}: time`, when(note.t.getTime() / 1000), 'UTC');
	});
	return rows;
}

/** The summary as Field, Value, Unit lines. */
export function summaryCsv(rows: readonly SummaryRow[], bom: boolean): string {
	return (bom ? BOM : '') + csvLines([['Field', 'Value', 'Unit'], ...rows.map((r) => [r.label, r.value, r.unit])]);
}
