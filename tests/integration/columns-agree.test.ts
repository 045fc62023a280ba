// One flight's stored rows read back by every path that turns rows into engine columns — the
// replay loader, the server's live computation, the live page's stream decoding — give the same
// columns, and the figures computed from each equal the summary the upload stored (its own
// columns, built as the rows arrived). All of them go through $lib/fuel/columns' ColumnBuilder;
// this test is what keeps "live equals replay equals the stored summary" true.
import { beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights } from '$lib/server/db/schema';
import { computeFlight, createLiveComputation, summarize, type SampleColumns } from '$lib/fuel';
import { loadFlight, loadSampleColumns } from '$lib/server/flights/load';
import { readRun, runColumns } from '$lib/server/live/samples';
import { samplesEventColumns, samplesEventOf, type SamplesEvent } from '$lib/wire/live';
import { makeClub, sample, upload, type Club } from './upload-fixture';

let club: Club;
beforeAll(async () => {
	club = await makeClub('Columns Club');
});

/**
 * A recorder file with every kind of hole: blank flow cells, a dropout, stretches with no
 * altitude, no waypoint and no position, a waypoint that comes back after another.
 */
function holeyFile(): string {
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint,altitude_ft,latitude,longitude'];
	const start = Date.UTC(2026, 5, 21, 9, 0, 0);
	const names = ['HOLLOW', 'MERROW', 'HOLLOW'];
	for (let i = 0; i < 1500; i++) {
		if (i >= 700 && i < 760) continue; // a minute of recorder dropout
		const flow = i % 97 === 5 ? '' : (i < 200 ? 3.1 : 8.4 + (i % 13) / 10).toFixed(2);
		const gs = i < 150 ? (i % 9).toFixed(1) : (98 + (i % 7)).toFixed(1);
		const dtg = i < 150 ? '' : Math.max(0, 30 - (i % 500) / 20).toFixed(2);
		const wpt = i < 150 || (i > 1000 && i < 1100) ? '' : names[Math.floor(i / 500)];
		const alt = i < 300 ? '' : String(1200 + (i % 50));
		// No position for the first 100 samples (no fix yet) and for a stretch mid-flight.
		const pos = i < 100 || (i > 1200 && i < 1260) ? ',' : `${(47.2 + i / 1e4).toFixed(5)},${(-31.4 + i / 2e4).toFixed(5)}`;
		lines.push(`${new Date(start + i * 1000 + (i % 3)).toISOString()},${flow},${gs},${dtg},${wpt},${alt},${pos}`);
	}
	return lines.join('\n') + '\n';
}

/** Reads the stored rows back as the live paths do, a page at a time. */
async function livePaths(flightId: string, lastSeq: number, page: number) {
	const serverIds = new Map<string, number>();
	const browserIds = new Map<string, number>();
	const loaded = (await loadFlight(flightId))!;
	const { columns: _, ...inputs } = loaded.input;
	const server = createLiveComputation(inputs);
	const browser = createLiveComputation(inputs);
	let after = -2147483648;
	for (;;) {
		const run = await readRun(flightId, after, lastSeq, page);
		if (run.seq.length === 0) break;
		server.append(runColumns(run, serverIds));
		// What the browser receives: the event as sent over the wire, JSON and back.
		const event = JSON.parse(JSON.stringify(samplesEventOf(run, 0, run.seq.length, run.seq[0], Date.now()))) as SamplesEvent;
		browser.append(samplesEventColumns(event, browserIds));
		after = run.seq[run.seq.length - 1];
	}
	return { server, browser, serverIds, browserIds, loaded };
}

const plain = (c: SampleColumns) => ({
	t: Array.from(c.t),
	flow: Array.from(c.flow),
	gs: Array.from(c.gs),
	dtg: Array.from(c.dtg),
	alt: c.alt ? Array.from(c.alt) : undefined,
	wpt: c.wpt ? Array.from(c.wpt) : undefined,
	lat: c.lat ? Array.from(c.lat) : undefined,
	lon: c.lon ? Array.from(c.lon) : undefined
});

describe('rows to columns, every path', () => {
	for (const [name, file] of [
		['a file with holes of every kind', () => holeyFile()],
		['the demo dropout flight', () => sample('kestrel-tourer-dropout.csv')]
	] as const) {
		it(`gives the same columns and figures on replay, live and upload: ${name}`, async () => {
			const res = await upload(club.pilot, { aircraftId: club.tourer.id, file: file(), fileName: `${name}.csv`, declaration: 'full' });
			expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(201);
			const flightId = res.body.flightId as string;
			const [f] = await db.select().from(flights).where(eq(flights.id, flightId));

			const replay = await loadSampleColumns(flightId);
			expect(replay.seq.length).toBe(f.sampleCount);
			// Read in odd-sized pages, the packed columns and the waypoint numbering carry across them.
			const paged = await loadSampleColumns(flightId, db, { pageRows: 97 });
			expect(plain(paged.columns)).toEqual(plain(replay.columns));
			expect([...paged.seq]).toEqual([...replay.seq]);
			expect(paged.waypoints).toEqual(replay.waypoints);
			expect(replay.hasPos).toBe(true);
			// A page size that splits runs in odd places, so numbering must carry across pages.
			const { server, browser, serverIds, browserIds, loaded } = await livePaths(flightId, f.lastSeq, 113);

			expect(plain(server.columns())).toEqual(plain(replay.columns));
			expect(plain(browser.columns())).toEqual(plain(replay.columns));
			expect([...serverIds.keys()]).toEqual(replay.waypoints);
			expect([...browserIds.keys()]).toEqual(replay.waypoints);

			// The stored summary came from the upload's own columns; the same figures come from each path's.
			const stored = f.summary;
			expect(stored).not.toBeNull();
			// Legs come from the columns, as the stored summary's did.
			const options = loaded.input.options;
			expect(summarize(computeFlight(loaded.input), loaded.input.columns, options)).toEqual(stored);
			expect(summarize(server.result(), server.columns(), options)).toEqual(stored);
			expect(summarize(browser.result(), browser.columns(), options)).toEqual(stored);
		});
	}

	it('the holey file really has the holes the test is about', async () => {
		const text = holeyFile();
		const rows = text.trim().split('\n').slice(1).map((l) => l.split(','));
		expect(rows.some((r) => r[1] === '')).toBe(true);
		expect(rows.some((r) => r[4] === '')).toBe(true);
		expect(rows.some((r) => r[5] === '')).toBe(true);
		expect(rows.some((r) => r[6] === '' && r[7] === '')).toBe(true);
		expect(new Set(rows.map((r) => r[4]).filter(Boolean))).toEqual(new Set(['HOLLOW', 'MERROW']));
	});
});
