// Export of a flight's computed fuel log: ?what=log (default) as CSV, one row per sample or
// ?every=minute, with each sample's position; ?what=summary (figures, declaration, fuel events and
// notes) as CSV or ?format=json, the same rows. Fuel in ?unit= (default: the aircraft's display
// unit), named in every column; ?times=spreadsheet and ?bom=true for spreadsheets. Computed on the
// server with the same engine and inputs as the replay page.
// The log streams out as the client reads it; a flight with many samples is a heavy export, and
// only a few of those run at once (the rest answer 429 with a wait), so a crowd of viewers cannot
// exhaust the server's memory.
import { error, json } from '@sveltejs/kit';
import { apiHandler, problem } from '$lib/server/problem';
import { exportQuerySchema } from '$lib/schemas/flight';
import { requireFlightById } from '$lib/server/access';
import { fuelLogChunks, summaryCsv, summaryRows } from '$lib/server/flights/fuel-log';
import { listNotes } from '$lib/server/flights/notes';
import { fuelUnitLabels } from '$lib/units';
import { parseQuery, streamText } from '$lib/server/flights/http';
import { exportLimits, heavyExports } from '$lib/server/limits';
import { loadFlight } from '$lib/server/flights/load';
import { flightPeople } from '$lib/server/flights/people';
import { computeLoaded } from '$lib/server/flights/summary';
import type { RequestHandler } from './$types';

function fileName(registration: string, startedAt: Date, what: string, ext: string): string {
	const stamp = startedAt.toISOString().slice(0, 16).replace(/[-:]/g, '').replace('T', '-');
	return `burndown-${registration.replace(/[^A-Za-z0-9-]/g, '')}-${stamp}-${what}.${ext}`;
}

export const GET: RequestHandler = apiHandler('read', async (event) => {
	const { flight } = await requireFlightById(event, event.params.id, 'view');
	const query = parseQuery(exportQuerySchema, event.url);
	if (!query.ok) return query.response;
	const q = query.data;
	const limits = exportLimits();
	let release = () => {};
	if (flight.sampleCount >= limits.heavySamples) {
		const place = heavyExports.tryAcquire();
		if (!place) {
			const retryAfterS = 15;
			return problem(429, `The server is exporting ${limits.heavyConcurrent} long flights already; try again in ${retryAfterS} s.`, {
				instance: event.url.pathname,
				extra: { retryAfterS },
				headers: { 'retry-after': String(retryAfterS) }
			});
		}
		release = place;
	}
	let streaming = false;
	try {
		const loaded = await loadFlight(flight.id);
		if (!loaded) error(404, 'Flight not found.');
		const { computation, summary } = computeLoaded(loaded);
		const a = loaded.aircraft;
		const unit = q.unit ?? a.displayUnit;
		const headers = { 'cache-control': 'private, no-store' };

		const style = { unit, densityKgPerL: a.densityKgPerL, times: q.times, bom: q.bom };

		if (q.what === 'summary') {
			const [{ pilot }, notes] = await Promise.all([flightPeople(flight), listNotes(flight.id)]);
			const rows = summaryRows({
				...style,
				summary,
				computation,
				registration: a.registration,
				title: flight.title,
				pilot,
				waypoints: loaded.samples.waypoints,
				declaration: loaded.input.declaration,
				events: loaded.events,
				flightNotes: flight.notes,
				notes
			});
			if (q.format === 'json') {
				return json(
					{
						flight: { id: flight.id, title: flight.title, startedAt: flight.startedAt.toISOString(), registration: a.registration, pilot },
						unit: { code: unit, label: fuelUnitLabels[unit] },
						times: q.times === 'iso' ? 'UTC, ISO 8601' : 'UTC, yyyy-mm-dd hh:mm:ss',
						rows,
						warnings: computation.warnings
					},
					{ headers: { ...headers, 'content-disposition': `attachment; filename="${fileName(a.registration, flight.startedAt, 'summary', 'json')}"` } }
				);
			}
			return new Response(summaryCsv(rows, q.bom), {
				headers: { ...headers, 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${fileName(a.registration, flight.startedAt, 'summary', 'csv')}"` }
			});
		}

		const pieces = fuelLogChunks({ ...style, columns: loaded.input.columns, computation, waypoints: loaded.samples.waypoints, every: q.every });
		const response = streamText(
			event.request,
			pieces,
			{
				...headers,
				'content-type': 'text/csv; charset=utf-8',
				'content-disposition': `attachment; filename="${fileName(a.registration, flight.startedAt, q.every === 'minute' ? 'fuel-log-per-minute' : 'fuel-log', 'csv')}"`
			},
			release
		);
		// The place is given back when the body has been sent (or the client went away).
		streaming = true;
		return response;
	} finally {
		if (!streaming) release();
	}
});
