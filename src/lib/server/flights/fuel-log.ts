// The exported fuel log: the engine's figures as CSV, one row per sample or one per minute, in a
// chosen fuel unit (distances in NM, speeds in kt, times UTC), and the flight summary as CSV.
// The log is written a few thousand rows at a time, so a long flight streams out in bounded
// memory; every text cell goes through textCell (formula injection), numbers through numberCell.
import type { FlightComputation, FlightSummary, SampleColumns } from '$lib/fuel';
import { alarmKinds, cruiseBasisCodes, WPT_NONE } from '$lib/fuel';
import { fromLitres, type FuelUnit } from '$lib/units';
import { alarmLabels, arrivalWords, flagWords, phaseIds } from '$lib/labels';
import { csvLine, numberCell as cell, textCell } from './csv-cell';

export type LogEvery = 'sample' | 'minute';

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

const iso = (epochS: number) => new Date(Math.round(epochS * 1000)).toISOString();

export interface FuelLogInput {
	columns: SampleColumns;
	computation: FlightComputation;
	waypoints: readonly string[];
	unit: FuelUnit;
	densityKgPerL: number;
	every: LogEvery;
}

/** Rows of the fuel log per piece of text fuelLogChunks yields. */
export const LOG_ROWS_PER_CHUNK = 2000;

/** CSV text; header names carry their units, e.g. on_board_usgal, flow_usgal_per_h. */
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
	const header = [
		'time_utc',
		'elapsed_s',
		'phase',
		`flow_${unit}_per_h`,
		`used_${unit}`,
		`on_board_${unit}`,
		'endurance_min',
		'gs_kt',
		'dtg_nm',
		'waypoint',
		'time_to_wpt_min',
		`fuel_to_wpt_${unit}`,
		`left_on_arrival_${unit}`,
		`reserve_${unit}`,
		'reserve_basis',
		`arrival_margin_${unit}`,
		'arrival_margin_cruise_min',
		'arrival',
		`specific_range_nm_per_${unit}`,
		'alarms',
		'flags'
	];
	const n = r.length;
	const minutes = x.every === 'minute' ? minuteRows(c.t, n) : null;
	const count = minutes ? minutes.length : n;
	const t0 = n > 0 ? c.t[0] : 0;
	yield csvLine(header.map(textCell)) + '\r\n';
	let lines: string[] = [];
	for (let k = 0; k < count; k++) {
		const i = minutes ? minutes[k] : k;
		const w = c.wpt ? c.wpt[i] : WPT_NONE;
		const alarms = alarmKinds.filter((_, b) => r.alarmState[i] & (1 << b)).map((b) => alarmLabels[b]);
		lines.push(
			csvLine([
				iso(c.t[i]),
				cell(c.t[i] - t0, 1),
				textCell(phaseIds[r.phase[i]] ?? ''),
				cell(fuel(r.flow[i]), 3),
				cell(fuel(r.used[i]), 3),
				cell(fuel(r.onBoard[i]), 3),
				cell(r.endurance[i] * 60, 1),
				cell(c.gs[i], 1),
				cell(c.dtg[i], 2),
				textCell(w === WPT_NONE ? '' : (x.waypoints[w] ?? '')),
				cell(r.timeToWpt[i] * 60, 1),
				cell(fuel(r.fuelToWpt[i]), 3),
				cell(fuel(r.arrivalL[i]), 3),
				cell(fuel(r.reserveL[i]), 3),
				textCell(Number.isFinite(r.reserveL[i]) ? (cruiseBasisCodes[r.reserveBasis[i]] ?? '') : ''),
				cell(fuel(r.arrivalL[i] - r.reserveL[i]), 3),
				cell(r.arrivalMarginMin[i], 1),
				textCell(arrivalWords[r.arrivalState[i]]?.id ?? ''),
				cell(r.specificRange[i] * perUnit, 3),
				textCell(alarms.join('; ')),
				textCell(flagWords(r.flags[i]).join(' '))
			])
		);
		if (lines.length >= rowsPerChunk) {
			yield lines.join('\r\n') + '\r\n';
			lines = [];
		}
	}
	if (lines.length > 0) yield lines.join('\r\n') + '\r\n';
}

/** The flight summary as field,value,unit rows for a spreadsheet. */
export function summaryCsv(
	s: FlightSummary,
	meta: { registration: string; title: string; pilot: string | null; unit: FuelUnit; densityKgPerL: number; waypoints: readonly string[] }
): string {
	const u = meta.unit;
	// Values are cells already: numbers as they are, text (names, titles, labels) through textCell.
	const fuel = (l: number | null | undefined) => (l === null || l === undefined ? '' : cell(fromLitres(l, u, meta.densityKgPerL), 3));
	const num = cell;
	const when = (x: number | null | undefined) => (x === null || x === undefined || !Number.isFinite(x) ? '' : iso(x));
	const text = textCell;
	const perUnit = 1 / fromLitres(1, u, meta.densityKgPerL);
	const rows: [string, string, string][] = [
		['aircraft', text(meta.registration), ''],
		['title', text(meta.title), ''],
		['pilot', text(meta.pilot ?? ''), ''],
		['start_utc', when(s.start), ''],
		['end_utc', when(s.end), ''],
		['samples', String(s.sampleCount), ''],
		['rejected_samples', String(s.rejectedCount), ''],
		['block_time_min', num(s.blockTimeS / 60, 1), `min (${s.blockTimeBasis})`],
		['engine_time_min', num(s.engineTimeS / 60, 1), 'min'],
		['fuel_used', fuel(s.fuelUsedL), u],
		['on_board_at_shutdown', fuel(s.onBoardAtShutdownL), u],
		['average_flow', fuel(s.averageFlowLph), `${u}/h`],
		['max_flow', fuel(s.maxFlowLph), `${u}/h`],
		['cruise_flow', fuel(s.cruiseFlowLph), `${u}/h`],
		['cruise_specific_range', num(s.cruiseSpecificRangeNmPerL === null ? null : s.cruiseSpecificRangeNmPerL * perUnit, 3), `NM/${u}`],
		['distance', num(s.distanceNm, 1), 'NM'],
		['average_gs', num(s.averageGsKt, 1), 'kt'],
		['reserve_rule', text(s.reserve?.rule.label ?? ''), s.reserve?.rule.citation ?? ''],
		['reserve_amount', fuel(s.reserve?.amountL), u],
		['reserve_basis', text(s.reserve?.basis ?? ''), s.reserve?.note ?? ''],
		['verdict', text(s.verdict?.state ?? ''), 'fuel on board at shutdown against the reserve amount'],
		['landed_margin', fuel(s.verdict?.marginL), u],
		['landed_margin_cruise_min', num(s.verdict?.marginMin, 1), 'min at normal cruise'],
		['thinnest_arrival_margin', fuel(s.thinnestMargin?.marginL), `${u}, airborne, held for the alarm persistence`],
		['thinnest_arrival_margin_cruise_min', num(s.thinnestMargin?.minutes, 1), 'min at normal cruise'],
		['thinnest_arrival_margin_time_utc', when(s.thinnestMargin?.t), ''],
		[
			'thinnest_arrival_margin_waypoint',
			s.thinnestMargin?.wpt === null || s.thinnestMargin?.wpt === undefined ? '' : text(meta.waypoints[s.thinnestMargin.wpt] ?? ''),
			''
		],
		['below_reserve_from_utc', when(s.reserveReachedAt?.t), 'first moment in the flight with fuel on board below the reserve amount'],
		['gaps', String(s.gapCount), ''],
		['gap_time_min', num(s.gapTimeS / 60, 1), 'min'],
		['alarms', String(s.alarmCount), '']
	];
	for (const p of s.phases) {
		rows.push([`phase_${p.name}_time_min`, num(p.timeS / 60, 1), 'min']);
		rows.push([`phase_${p.name}_fuel`, fuel(p.fuelL), u]);
		rows.push([`phase_${p.name}_average_flow`, fuel(p.averageFlowLph), `${u}/h`]);
	}
	(s.legs ?? []).forEach((leg, k) => {
		const n = k + 1;
		rows.push([`leg_${n}_start_utc`, when(leg.start), '']);
		rows.push([`leg_${n}_end_utc`, when(leg.end), '']);
		rows.push([`leg_${n}_block_time_min`, num(leg.blockTimeS / 60, 1), `min (${leg.blockTimeBasis})`]);
		rows.push([`leg_${n}_engine_time_min`, num(leg.engineTimeS / 60, 1), 'min']);
		rows.push([`leg_${n}_fuel_used`, fuel(leg.fuelUsedL), u]);
		rows.push([`leg_${n}_average_flow`, fuel(leg.averageFlowLph), `${u}/h over the leg's engine time`]);
	});
	// Field names and units are ours; they go through textCell too, as every text cell does.
	return ['field,value,unit', ...rows.map(([field, value, unit]) => csvLine([textCell(field), value, textCell(unit)]))].join('\r\n') + '\r\n';
}
