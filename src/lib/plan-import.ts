// Legs for the fuel-plan form from a file: a CSV of legs (one row per leg, papaparse) or a GPX 1.1
// route (<rte>/<rtept>, the open GPX standard, parsed with fast-xml-parser), whose first point is
// the departure and each next point a leg's waypoint, its distance the great circle between them.
// The rows fill the form's table; saving goes through the form's own checks.
import Papa from 'papaparse';
import { XMLParser } from 'fast-xml-parser';
import { greatCircleNm } from '$lib/fuel';
import { MAX_PLAN_LEGS, type PlanLegValues } from '$lib/schemas/plan';

export type PlanImport = { ok: true; rows: PlanLegValues[]; warnings: string[] } | { ok: false; message: string };

/** Files of legs are small; anything larger is not a plan. */
export const MAX_PLAN_FILE_BYTES = 256 * 1024;

const HEADERS: Record<string, keyof PlanLegValues> = {
	to: 'to',
	waypoint: 'to',
	wpt: 'to',
	distance: 'distance',
	distance_nm: 'distance',
	nm: 'distance',
	gs: 'gs',
	gs_kt: 'gs',
	ground_speed_kt: 'gs',
	time: 'time',
	time_min: 'time',
	flow: 'flow',
	fuel: 'fuel',
	refuel: 'refuel',
	refuel_to: 'refuel'
};

const blankRow = (): PlanLegValues => ({ to: '', distance: '', gs: '', time: '', flow: '', fuel: '', refuel: '' });
const nm = (x: number) => String(Math.round(x * 10) / 10);

/** A CSV with a header line naming at least the waypoint and the distance columns. */
export function legsFromCsv(text: string): PlanImport {
	const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), {
		header: true,
		skipEmptyLines: 'greedy',
		transformHeader: (h) => h.trim().toLowerCase().replace(/[\s-]+/g, '_')
	});
	const fields = parsed.meta.fields ?? [];
	const known = fields.filter((f) => f in HEADERS);
	if (!known.some((f) => HEADERS[f] === 'to')) return { ok: false, message: 'Line 1: name a waypoint column (waypoint or to).' };
	if (!known.some((f) => HEADERS[f] === 'distance')) return { ok: false, message: 'Line 1: name a distance column (distance_nm).' };
	const bad = parsed.errors.find((e) => e.type !== 'Delimiter');
	if (bad) return { ok: false, message: `Line ${(bad.row ?? 0) + 2}: ${bad.message}.` };
	if (parsed.data.length === 0) return { ok: false, message: 'The file has a header but no legs.' };
	if (parsed.data.length > MAX_PLAN_LEGS) return { ok: false, message: `The file has ${parsed.data.length} legs; a plan has at most ${MAX_PLAN_LEGS}.` };
	const rows = parsed.data.map((rec) => {
		const row = blankRow();
		for (const f of known) row[HEADERS[f]] = (rec[f] ?? '').trim();
		return row;
	});
	const ignored = fields.filter((f) => !(f in HEADERS) && f !== '');
	return { ok: true, rows, warnings: ignored.length ? [`Columns not used: ${ignored.join(', ')}.`] : [] };
}

interface RoutePoint {
	lat: number;
	lon: number;
	name: string;
}

const asArray = <T,>(x: T | T[] | undefined): T[] => (x === undefined ? [] : Array.isArray(x) ? x : [x]);

/** A GPX 1.1 file's first route; leg distances are great circles between its points. */
export function legsFromGpx(text: string): PlanImport {
	const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '', processEntities: false, parseTagValue: false });
	let doc: Record<string, unknown>;
	try {
		doc = parser.parse(text, true) as Record<string, unknown>;
	} catch (e) {
		return { ok: false, message: `This is not a readable GPX file: ${e instanceof Error ? e.message : String(e)}` };
	}
	const gpx = doc.gpx as Record<string, unknown> | undefined;
	if (!gpx) return { ok: false, message: 'This file has no <gpx> element.' };
	const rte = asArray(gpx.rte as Record<string, unknown> | Record<string, unknown>[] | undefined)[0];
	if (!rte) return { ok: false, message: 'This GPX file has no route (<rte>); tracks and loose waypoints are not a plan.' };
	const raw = asArray(rte.rtept as Record<string, unknown> | Record<string, unknown>[] | undefined);
	const points: RoutePoint[] = [];
	for (const [i, p] of raw.entries()) {
		const lat = Number(p.lat);
		const lon = Number(p.lon);
		if (!Number.isFinite(lat) || lat < -90 || lat > 90 || !Number.isFinite(lon) || lon < -180 || lon > 180)
			return { ok: false, message: `Route point ${i + 1}: lat and lon must be numbers within ±90 and ±180.` };
		const name = typeof p.name === 'string' ? p.name.trim() : '';
		points.push({ lat, lon, name: name || `WP${i + 1}` });
	}
	if (points.length < 2) return { ok: false, message: 'The route needs a departure and at least one more point.' };
	if (points.length - 1 > MAX_PLAN_LEGS) return { ok: false, message: `The route has ${points.length - 1} legs; a plan has at most ${MAX_PLAN_LEGS}.` };
	const rows = points.slice(1).map((p, i) => ({ ...blankRow(), to: p.name, distance: nm(greatCircleNm(points[i].lat, points[i].lon, p.lat, p.lon)) }));
	const unnamed = raw.filter((p) => typeof p.name !== 'string' || p.name.trim() === '').length;
	return { ok: true, rows, warnings: unnamed ? [`${unnamed} route point(s) had no name and were numbered.`] : [] };
}
