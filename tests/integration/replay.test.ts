// The replay side of a flight against the real database: the columnar samples API (JSON and
// binary), the fuel-log export against the engine, who may see and change a flight, declaration
// and fuel-event edits persisting into the stored summary, notes, and the flights list.
import { gunzipSync } from 'node:zlib';
import { describe, expect, it, beforeAll } from 'vitest';
import { isHttpError, type RequestEvent } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, flightNotes, flights, fuelEvents, memberships, organisations, users } from '$lib/server/db/schema';
import { computeFlight, summarize, type FlightSummary } from '$lib/fuel';
import { engineInputsOf, fuelSetupOf } from '$lib/flight-inputs';
import { decodeBinary, decodeJson, type JsonPayload } from '$lib/wire/replay';
import { recomputeSummary } from '$lib/server/flights/summary';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { GET as samplesGet } from '../../src/routes/api/v1/flights/[id]/samples/+server';
import { GET as exportGet } from '../../src/routes/api/v1/flights/[id]/export/+server';
import { load as flightLoad, actions } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { load as listLoad } from '../../src/routes/o/[org]/flights/+page.server';
import { generateFlight, insertFlight, WAYPOINTS } from './replay-fixture';

type Role = 'admin' | 'instructor' | 'pilot' | 'viewer';
interface TestUser {
	id: string;
	email: string;
	name: string;
	prefFuelUnit: null;
	timeZone: null;
}

const stamp = Date.now().toString(36);
const person = (key: string, name: string): TestUser => ({ id: `rp-${key}-${stamp}`, email: `${key}-${stamp}@replay.example`, name, prefFuelUnit: null, timeZone: null });
const U = {
	admin: person('admin', 'Ada Admin'),
	instructor: person('instr', 'Ivo Instructor'),
	pilot: person('pilot', 'Pia Pilot'),
	otherPilot: person('pilot2', 'Otto Otherpilot'),
	viewer: person('viewer', 'Vera Viewer'),
	outsider: person('outsider', 'Oona Outsider')
};
let orgSlug = '';
let otherSlug = '';
let aircraftId = '';
let flightId = '';
const samples = generateFlight({ cruiseS: 3000, dropout: { at: 2000, seconds: 45 } });
// The aircraft: a four-seat trainer, 40 US gal usable = 151.416 L (NIST HB44: 3.785411784 L/gal).
const CAPACITY_L = 40 * LITRES_PER_US_GALLON;
let setupRow: typeof aircraft.$inferSelect;

function event(user: TestUser | null, route: string, params: Record<string, string>, init: { url?: string; method?: string; body?: FormData; headers?: Record<string, string> } = {}) {
	const url = new URL(init.url ?? 'http://127.0.0.1:4173/');
	return {
		locals: { user, session: null, authVia: user ? 'session' : null },
		params,
		url,
		route: { id: route },
		request: new Request(url, { method: init.method ?? 'GET', body: init.body, headers: init.headers })
	} as unknown as RequestEvent;
}

const SAMPLES_ROUTE = '/api/v1/flights/[id]/samples';
const EXPORT_ROUTE = '/api/v1/flights/[id]/export';
const FLIGHT_ROUTE = '/o/[org]/flights/[id]';

async function statusOf(run: () => unknown): Promise<number> {
	try {
		const res = await run();
		return res instanceof Response ? res.status : 200;
	} catch (e) {
		if (isHttpError(e)) return e.status;
		if (e && typeof e === 'object' && 'status' in e && 'location' in e) return (e as { status: number }).status;
		throw e;
	}
}

const samplesAs = (user: TestUser | null, id = flightId, query = '', headers: Record<string, string> = {}) =>
	samplesGet(event(user, SAMPLES_ROUTE, { id }, { url: `http://127.0.0.1:4173/api/v1/flights/${id}/samples${query}`, headers }) as never) as Promise<Response>;
const exportAs = (user: TestUser | null, query = '', id = flightId) =>
	exportGet(event(user, EXPORT_ROUTE, { id }, { url: `http://127.0.0.1:4173/api/v1/flights/${id}/export${query}` }) as never) as Promise<Response>;
const loadAs = (user: TestUser, id = flightId, slug = orgSlug) => flightLoad(event(user, FLIGHT_ROUTE, { org: slug, id }, { url: `http://127.0.0.1:4173/o/${slug}/flights/${id}` }) as never);

function post(user: TestUser, action: keyof typeof actions, fields: Record<string, string>, id = flightId) {
	const body = new FormData();
	for (const [k, v] of Object.entries(fields)) body.set(k, v);
	const e = event(user, FLIGHT_ROUTE, { org: orgSlug, id }, { url: `http://127.0.0.1:4173/o/${orgSlug}/flights/${id}?/${action}`, method: 'POST', body });
	return actions[action](e as never) as Promise<unknown>;
}

async function storedSummary(id = flightId): Promise<FlightSummary> {
	const [row] = await db.select({ summary: flights.summary }).from(flights).where(eq(flights.id, id));
	return row.summary as FlightSummary;
}

/** What the engine says for the fixture with the flight's current stored inputs. */
async function expectedComputation(id = flightId) {
	const [f] = await db.select().from(flights).where(eq(flights.id, id));
	const events = await db.select().from(fuelEvents).where(eq(fuelEvents.flightId, id));
	const setup = fuelSetupOf(setupRow);
	const columns = { t: samples.t, flow: samples.flow, gs: samples.gs, dtg: samples.dtg, alt: samples.alt, wpt: Int32Array.from(samples.wpt, (w) => WAYPOINTS.indexOf(w!)) };
	const c = computeFlight({ columns, ...engineInputsOf(setup, f, events) });
	return { c, summary: summarize(c, columns) };
}

/** Both sides as JSON would carry them (NaN → null, -0 → 0), as jsonb stores the summary. */
const plain = <T>(x: T): T => JSON.parse(JSON.stringify(x));

function parseCsv(text: string): { header: string[]; rows: string[][] } {
	const lines = text.trimEnd().split('\r\n');
	return { header: lines[0].split(','), rows: lines.slice(1).map((l) => l.split(',')) };
}

beforeAll(async () => {
	await db.insert(users).values(Object.values(U).map((u) => ({ id: u.id, email: u.email, name: u.name, passwordHash: 'not-a-real-hash' })));
	const [org] = await db.insert(organisations).values({ name: 'Replay Test Club', slug: `replay-${stamp}` }).returning();
	const [other] = await db.insert(organisations).values({ name: 'Elsewhere Aero', slug: `elsewhere-${stamp}` }).returning();
	orgSlug = org.slug;
	otherSlug = other.slug;
	const roles: [TestUser, Role][] = [
		[U.admin, 'admin'],
		[U.instructor, 'instructor'],
		[U.pilot, 'pilot'],
		[U.otherPilot, 'pilot'],
		[U.viewer, 'viewer']
	];
	await db.insert(memberships).values(roles.map(([u, role]) => ({ orgId: org.id, userId: u.id, role })));
	await db.insert(memberships).values({ orgId: other.id, userId: U.outsider.id, role: 'admin' });
	[setupRow] = await db
		.insert(aircraft)
		.values({
			orgId: org.id,
			registration: 'RT-ONE',
			type: 'Four-seat trainer',
			fuelType: 'avgas',
			densityKgPerL: 0.719,
			capacityL: CAPACITY_L,
			lowerLevelL: 28 * LITRES_PER_US_GALLON,
			displayUnit: 'usgal',
			lowFuelL: 10 * LITRES_PER_US_GALLON,
			lowEnduranceMin: 45,
			reserveRule: 'faa-91.151-vfr-day',
			baselineCruiseLph: 31
		})
		.returning();
	aircraftId = setupRow.id;
	flightId = await insertFlight(pool, { orgId: org.id, aircraftId, pilotId: U.pilot.id, declaration: { kind: 'full' } }, samples);
	await recomputeSummary(flightId);
});

describe('samples API', () => {
	it('returns every sample as columns, with the fuel setup, declaration and events', async () => {
		const res = await samplesAs(U.pilot);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('application/json');
		const body = (await res.json()) as JsonPayload;
		const n = samples.t.length;
		expect(body.count).toBe(n);
		expect(Object.keys(body.columns).sort()).toEqual(['alt', 'dtg', 'flow', 'gs', 'seq', 'tMs', 'wpt']);
		for (const col of Object.values(body.columns)) expect(col).toHaveLength(n);
		expect(body.waypoints).toEqual(WAYPOINTS.slice(0, body.waypoints.length));
		expect(body.setup).toMatchObject({ capacityL: CAPACITY_L, reserveRule: 'faa-91.151-vfr-day', baselineCruiseLph: 31 });
		expect(body.declaration).toEqual({ kind: 'full' });
		expect(body.events).toEqual([]);

		const decoded = decodeJson(body);
		expect(Array.from(decoded.columns.t)).toEqual(Array.from(samples.t));
		expect(Array.from(decoded.columns.flow)).toEqual(Array.from(samples.flow));
		expect(Array.from(decoded.columns.dtg)).toEqual(Array.from(samples.dtg));
		expect(decoded.waypoints[decoded.columns.wpt![n - 1]]).toBe(samples.wpt[n - 1]);
	});

	it('gives the browser what it needs to reproduce the stored summary with the same engine', async () => {
		const body = (await (await samplesAs(U.pilot)).json()) as JsonPayload;
		const d = decodeJson(body);
		const c = computeFlight({ columns: d.columns, ...engineInputsOf(d.setup, d, d.events) });
		const browser = summarize(c, d.columns);
		expect(plain(browser)).toEqual(plain(await storedSummary()));
		// The dropout in the fixture shows up as a gap, and the flight used fuel.
		expect(browser.gapCount).toBe(1);
		expect(browser.fuelUsedL).toBeGreaterThan(20);
	});

	it('encodes the same content in the binary layout, gzipped when asked', async () => {
		const json = decodeJson((await (await samplesAs(U.pilot)).json()) as JsonPayload);
		const res = await samplesAs(U.pilot, flightId, '?format=binary', { 'accept-encoding': 'gzip, deflate' });
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('application/vnd.burndown.samples');
		expect(res.headers.get('content-encoding')).toBe('gzip');
		const raw = gunzipSync(Buffer.from(await res.arrayBuffer()));
		const bin = decodeBinary(new Uint8Array(raw));
		expect(bin.count).toBe(json.count);
		for (const k of ['t', 'flow', 'gs', 'dtg', 'alt'] as const) expect(Array.from(bin.columns[k]!)).toEqual(Array.from(json.columns[k]!));
		expect(Array.from(bin.seq)).toEqual(Array.from(json.seq));
		expect(Array.from(bin.columns.wpt!)).toEqual(Array.from(json.columns.wpt!));
		expect(bin.setup).toEqual(json.setup);
	});

	it('answers 400 naming the parameter for an unknown format', async () => {
		const res = await samplesAs(U.pilot, flightId, '?format=xml');
		expect(res.status).toBe(400);
		expect(await res.json()).toMatchObject({ status: 400, errors: [{ field: 'format' }] });
	});
});

describe('export', () => {
	it('writes one CSV row per sample whose figures match the engine', async () => {
		const res = await exportAs(U.pilot, '?unit=l');
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
		expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="burndown-RT-ONE-20250514-0900-fuel-log\.csv"/);
		const { header, rows } = parseCsv(await res.text());
		const { c } = await expectedComputation();
		expect(rows).toHaveLength(c.length);
		const col = (name: string) => header.indexOf(name);
		// The screens' words, with the unit asked for.
		for (const name of ['Time (UTC)', 'Fuel flow (L/h)', 'Fuel used (L)', 'Fuel on board (L)', 'Endurance at this flow (min)', 'Left on arrival (L)', 'Reserve amount (L)', 'Against the reserve (L)', 'Against the reserve (min at normal cruise)', 'Arrival', 'Specific range (NM/L)', 'Phase', 'Latitude (°)', 'Longitude (°)', 'Altitude (ft)'])
			expect(col(name), name).toBeGreaterThanOrEqual(0);
		// Every 97th row and the last one: values printed to 3 decimals (fuel) or 1 (minutes).
		for (let i = 0; i < c.length; i += i === c.length - 1 ? 1 : Math.min(97, c.length - 1 - i)) {
			const r = rows[i];
			expect(r[col('Time (UTC)')]).toBe(new Date(samples.t[i] * 1000).toISOString());
			expect(Number(r[col('Fuel on board (L)')])).toBeCloseTo(c.onBoard[i], 3);
			expect(Number(r[col('Fuel used (L)')])).toBeCloseTo(c.used[i], 3);
			expect(Number(r[col('Fuel flow (L/h)')])).toBeCloseTo(c.flow[i], 3);
			if (Number.isFinite(c.endurance[i])) expect(Number(r[col('Endurance at this flow (min)')])).toBeCloseTo(c.endurance[i] * 60, 1);
			else expect(r[col('Endurance at this flow (min)')]).toBe('');
			if (Number.isFinite(c.arrivalL[i])) expect(Number(r[col('Left on arrival (L)')])).toBeCloseTo(c.arrivalL[i], 3);
			if (i === c.length - 1) break;
		}
		expect(rows.some((r) => r[col('Flags')].includes('gap-filled'))).toBe(true);
	});

	it('converts fuel with the exact US gallon and thins to one row per minute', async () => {
		const { header, rows } = parseCsv(await (await exportAs(U.pilot, '?every=minute&unit=usgal')).text());
		const { c } = await expectedComputation();
		const minutes = new Set(Array.from(samples.t, (t) => Math.floor(t / 60)));
		// The first sample of each minute with samples, plus the very last sample.
		expect(rows).toHaveLength(minutes.size + 1);
		const last = rows[rows.length - 1];
		// 1 US gal = 3.785411784 L (NIST Handbook 44, Appendix C).
		expect(Number(last[header.indexOf('Fuel on board (US gal)')])).toBeCloseTo(c.onBoard[c.length - 1] / 3.785411784, 3);
	});

	it('exports the summary as CSV and JSON from the same computation', async () => {
		const { summary } = await expectedComputation();
		const csv = parseCsv(await (await exportAs(U.pilot, '?what=summary&unit=l')).text());
		const row = (field: string) => csv.rows.find((r) => r[0] === field)!;
		expect(csv.header).toEqual(['Field', 'Value', 'Unit']);
		expect(Number(row('Fuel used')[1])).toBeCloseTo(summary.fuelUsedL, 3);
		expect(row('Fuel used')[2]).toBe('L');
		expect(Number(row('On board at shutdown')[1])).toBeCloseTo(summary.onBoardAtShutdownL!, 3);
		expect(row('Reserve rule')[2]).toBe('14 CFR 91.151(a)(1)');
		// The JSON holds the same rows in the same unit: litres here, as asked.
		const json = await (await exportAs(U.pilot, '?what=summary&format=json&unit=l')).json();
		expect(json.unit).toEqual({ code: 'l', label: 'L' });
		const fuelUsed = json.rows.find((r: { key: string }) => r.key === 'fuelUsed');
		expect(fuelUsed).toMatchObject({ label: 'Fuel used', unit: 'L' });
		expect(fuelUsed.value).toBeCloseTo(summary.fuelUsedL, 3);
		expect(json.rows.map((r: { label: string }) => r.label)).toEqual(csv.rows.map((r) => r[0]));
	});

	it('refuses an unknown unit with 400', async () => {
		const res = await exportAs(U.pilot, '?unit=barrels');
		expect(res.status).toBe(400);
		expect((await res.json()).errors[0].field).toBe('unit');
	});
});

describe('who may see and change a flight', () => {
	it('answers 404 to a member of another organisation on the page, the samples and the export', async () => {
		expect(await statusOf(() => loadAs(U.outsider))).toBe(404);
		expect(await statusOf(() => loadAs(U.outsider, flightId, otherSlug))).toBe(404);
		expect(await statusOf(() => samplesAs(U.outsider))).toBe(404);
		expect(await statusOf(() => exportAs(U.outsider))).toBe(404);
	});

	it("answers 403 to a pilot on another pilot's flight", async () => {
		expect(await statusOf(() => loadAs(U.otherPilot))).toBe(403);
		expect(await statusOf(() => samplesAs(U.otherPilot))).toBe(403);
		expect(await statusOf(() => exportAs(U.otherPilot))).toBe(403);
		expect(await statusOf(() => post(U.otherPilot, 'declaration', { kind: 'full', unit: 'l' }))).toBe(403);
	});

	it('lets the viewer look but not change, and asks anonymous API callers to sign in', async () => {
		expect(await statusOf(() => loadAs(U.viewer))).toBe(200);
		expect(await statusOf(() => samplesAs(U.viewer))).toBe(200);
		expect(await statusOf(() => post(U.viewer, 'declaration', { kind: 'full', unit: 'l' }))).toBe(403);
		expect(await statusOf(() => post(U.viewer, 'addNote', { body: 'looks fine' }))).toBe(403);
		expect(await statusOf(() => samplesAs(null))).toBe(401);
		expect(await statusOf(() => exportAs(null))).toBe(401);
	});

	it('answers 404 for an id that is not a flight', async () => {
		expect(await statusOf(() => samplesAs(U.pilot, '00000000-0000-4000-8000-000000000000'))).toBe(404);
		expect(await statusOf(() => samplesAs(U.pilot, 'not-a-uuid'))).toBe(404);
	});
});

describe('correcting the fuel inputs', () => {
	it('persists a corrected declaration and recomputes the stored summary', async () => {
		const before = await storedSummary();
		// Filled to full (151.4 L) was wrong: the dipstick said 100 L.
		const result = await post(U.pilot, 'declaration', { kind: 'onBoard', amount: '100', unit: 'l', previous: '' });
		expect(result).toEqual({ action: 'declaration', saved: true });
		const [row] = await db.select().from(flights).where(eq(flights.id, flightId));
		expect(row.declaration).toEqual({ kind: 'onBoard', amountL: 100 });
		const after = await storedSummary();
		expect(after.fuelUsedL).toBeCloseTo(before.fuelUsedL, 9);
		expect(after.onBoardAtShutdownL! - before.onBoardAtShutdownL!).toBeCloseTo(100 - CAPACITY_L, 9);
		expect(plain(after)).toEqual(plain((await expectedComputation()).summary));
		// Everyone gets the corrected inputs from the API, and the aircraft's last known fuel follows.
		expect(((await (await samplesAs(U.instructor)).json()) as JsonPayload).declaration).toEqual({ kind: 'onBoard', amountL: 100 });
		const [a] = await db.select().from(aircraft).where(eq(aircraft.id, aircraftId));
		expect(a.lastOnBoardL).toBeCloseTo(after.onBoardAtShutdownL!, 9);
	});

	it('takes an amount typed in US gallons with a decimal comma', async () => {
		await post(U.instructor, 'declaration', { kind: 'onBoard', amount: '30,5', unit: 'usgal', previous: '' });
		const [row] = await db.select().from(flights).where(eq(flights.id, flightId));
		expect((row.declaration as { amountL: number }).amountL).toBeCloseTo(30.5 * 3.785411784, 9);
	});

	it('refuses an incomplete declaration with the field named, changing nothing', async () => {
		const before = await db.select().from(flights).where(eq(flights.id, flightId));
		const result = (await post(U.pilot, 'declaration', { kind: 'added', amount: '', unit: 'l' })) as { status: number; data: { errors: Record<string, string> } };
		expect(result.status).toBe(400);
		expect(result.data.errors.amount).toMatch(/amount added/);
		const after = await db.select().from(flights).where(eq(flights.id, flightId));
		expect(after[0].declaration).toEqual(before[0].declaration);
		expect(after[0].summary).toEqual(before[0].summary);
	});

	it('adds a refuel at a stop and removes it again, the summary following both', async () => {
		await post(U.pilot, 'declaration', { kind: 'onBoard', amount: '90', unit: 'l', previous: '' });
		const before = await storedSummary();
		const at = new Date(samples.t[3000] * 1000).toISOString().slice(0, 19);
		expect(await post(U.pilot, 'addEvent', { kind: 'added', amount: '20', unit: 'l', at, note: 'top-up at the stop' })).toEqual({ action: 'addEvent', saved: true });
		const withEvent = await storedSummary();
		expect(withEvent.onBoardAtShutdownL! - before.onBoardAtShutdownL!).toBeCloseTo(20, 9);
		expect(plain(withEvent)).toEqual(plain((await expectedComputation()).summary));

		const [ev] = await db.select().from(fuelEvents).where(eq(fuelEvents.flightId, flightId));
		expect(ev).toMatchObject({ kind: 'added', amountL: 20, note: 'top-up at the stop', createdBy: U.pilot.id });
		expect(await post(U.pilot, 'removeEvent', { id: ev.id })).toEqual({ action: 'removeEvent', saved: true });
		expect((await storedSummary()).onBoardAtShutdownL).toBeCloseTo(before.onBoardAtShutdownL!, 9);
		const again = (await post(U.pilot, 'removeEvent', { id: ev.id })) as { status: number };
		expect(again.status).toBe(404);
	});

	it('refuses an event far outside the flight, saying which times are allowed', async () => {
		const result = (await post(U.pilot, 'addEvent', { kind: 'toFull', amount: '', unit: 'l', at: '2025-05-20T12:00:00' })) as { status: number; data: { errors: Record<string, string> } };
		expect(result.status).toBe(400);
		expect(result.data.errors.at).toMatch(/Choose a time between 2025-05-14/);
		expect(await db.select().from(fuelEvents).where(eq(fuelEvents.flightId, flightId))).toHaveLength(0);
	});
});

describe('notes', () => {
	it('lets the instructor pin a debrief note to a moment, and the author remove it', async () => {
		const at = new Date(samples.t[700] * 1000).toISOString().slice(0, 19);
		expect(await post(U.instructor, 'addNote', { body: 'Leaned late in the climb.', at })).toEqual({ action: 'addNote', saved: true });
		const data = (await loadAs(U.pilot)) as { notes: { id: string; body: string; author: string | null; t: Date | null }[] };
		expect(data.notes).toEqual([expect.objectContaining({ body: 'Leaned late in the climb.', author: U.instructor.name, t: new Date(samples.t[700] * 1000) })]);
		// The pilot may annotate their own flight but not remove the instructor's note.
		expect(((await post(U.pilot, 'removeNote', { id: data.notes[0].id })) as { status: number }).status).toBe(404);
		expect(await post(U.instructor, 'removeNote', { id: data.notes[0].id })).toEqual({ action: 'removeNote', saved: true });
		expect(await db.select().from(flightNotes).where(eq(flightNotes.flightId, flightId))).toHaveLength(0);
	});

	it('refuses an empty note', async () => {
		const result = (await post(U.instructor, 'addNote', { body: '   ' })) as { status: number; data: { errors: Record<string, string> } };
		expect(result.status).toBe(400);
		expect(result.data.errors.body).toBe('Write the note.');
	});
});

describe('flights list', () => {
	const extra: string[] = [];
	beforeAll(async () => {
		const [org] = await db.select().from(organisations).where(eq(organisations.slug, orgSlug));
		// 27 short flights of the other pilot over 27 days, so there is a second page.
		for (let d = 0; d < 27; d++) {
			const s = generateFlight({ cruiseS: 60 + d * 10, start: Date.UTC(2025, 5, 1 + d, 8, 0, 0) / 1000 });
			const id = await insertFlight(pool, { orgId: org.id, aircraftId, pilotId: U.otherPilot.id, title: `day ${d + 1}` }, s);
			await recomputeSummary(id);
			extra.push(id);
		}
	});

	const listAs = (user: TestUser, query = '') =>
		listLoad(event(user, '/o/[org]/flights', { org: orgSlug }, { url: `http://127.0.0.1:4173/o/${orgSlug}/flights${query}` }) as never) as Promise<{
			list: { total: number; pages: number; page: number; flights: { id: string; pilot: string | null; summary: FlightSummary | null }[] };
			options: { pilots: { id: string }[] };
		}>;

	it('shows a pilot only their own flights, and everyone else all of them', async () => {
		const own = await listAs(U.pilot);
		expect(own.list.total).toBe(1);
		expect(own.list.flights[0].id).toBe(flightId);
		expect(own.options.pilots).toEqual([]);
		const all = await listAs(U.viewer);
		expect(all.list.total).toBe(28);
		expect(all.list.flights).toHaveLength(25);
		expect(all.list.pages).toBe(2);
		const second = await listAs(U.viewer, '?page=2');
		expect(second.list.flights).toHaveLength(3);
		const ids = new Set([...all.list.flights, ...second.list.flights].map((f) => f.id));
		expect(ids.size).toBe(28);
	});

	it('filters by pilot and date range, and sorts by fuel used', async () => {
		const june = await listAs(U.admin, `?pilot=${U.otherPilot.id}&from=2025-06-10&to=2025-06-12`);
		expect(june.list.total).toBe(3);
		const byUse = await listAs(U.admin, '?sort=used&dir=asc');
		const used = byUse.list.flights.map((f) => f.summary!.fuelUsedL);
		expect(used).toEqual([...used].sort((a, b) => a - b));
		const desc = await listAs(U.admin, '?sort=used');
		// The long fixture flight used the most fuel.
		expect(desc.list.flights[0].id).toBe(flightId);
		// A broken query falls back to the defaults instead of failing the page.
		const odd = await listAs(U.admin, '?sort=nonsense&page=-4&from=yesterday');
		expect(odd.list.page).toBe(1);
		expect(odd.list.total).toBe(28);
	});

	it('filters by aircraft', async () => {
		const none = await listAs(U.admin, '?aircraft=00000000-0000-4000-8000-000000000000');
		expect(none.list.total).toBe(0);
		const mine = await listAs(U.admin, `?aircraft=${aircraftId}`);
		expect(mine.list.total).toBe(28);
	});
});

describe('viewers of a flight hear about corrections', () => {
	it('announces a saved declaration and fuel event on the live channel, once each', async () => {
		const listener = await pool.connect();
		const heard: { f: string; m?: number }[] = [];
		listener.on('notification', (n) => {
			if (n.channel === 'burndown_live' && n.payload) heard.push(JSON.parse(n.payload));
		});
		try {
			await listener.query('LISTEN burndown_live');
			await post(U.pilot, 'declaration', { kind: 'full', amount: '', unit: 'l', previous: '' });
			const [f] = await db.select({ startedAt: flights.startedAt }).from(flights).where(eq(flights.id, flightId));
			const at = new Date(f.startedAt.getTime() + 600_000).toISOString().slice(0, 19).replace('T', ' ');
			expect(await post(U.pilot, 'addEvent', { kind: 'added', amount: '5', unit: 'l', at, note: 'top-up' })).toMatchObject({ action: 'addEvent' });
			// Refused edits say nothing.
			await post(U.pilot, 'declaration', { kind: 'onBoard', amount: '', unit: 'l', previous: '' });
			await new Promise((r) => setTimeout(r, 200));
			expect(heard.filter((h) => h.f === flightId && h.m === 1)).toHaveLength(2);
		} finally {
			await listener.query('UNLISTEN burndown_live');
			listener.release();
		}
	});
});
