// The column mapper's results against the real database: another recorder's layout stored
// through an explicit mapping, saved as an import profile of the organisation, and applied
// automatically when the next file's header matches (and never for another organisation).
import { beforeAll, describe, expect, it } from 'vitest';
import { asc, eq } from 'drizzle-orm';
import type { RequestEvent } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { aircraft, flights, importProfiles, samples, uploads } from '$lib/server/db/schema';
import { columnMappingSchema, headerSignature } from '$lib/csv';
import { actions, load } from '../../src/routes/o/[org]/flights/upload/+page.server';
import { makeClub, sample, tableCounts, upload, type Club } from './upload-fixture';

let club: Club;
beforeAll(async () => {
	club = await makeClub('Mapper Club');
});

const FILE = 'kestrel-diesel-panel-log.csv';
const HEADERS = ['Clock', 'Fuel flow (l/h)', 'Speed over ground (km/h)', 'Distance remaining (km)', 'Altitude (m)', 'Next WP'];
const MAPPING = columnMappingSchema.parse({
	delimiter: ';',
	decimal: ',',
	time: { column: 'Clock', format: 'clock', date: '2026-08-14' },
	flow: { column: 'Fuel flow (l/h)', unit: 'l/h' },
	gs: { column: 'Speed over ground (km/h)', unit: 'km/h' },
	dtg: { column: 'Distance remaining (km)', unit: 'km' },
	alt: { column: 'Altitude (m)', unit: 'm' },
	wpt: { column: 'Next WP' }
});

function pageEvent(slug: string, user: Club['pilot'], form?: Record<string, string>): RequestEvent {
	const body = new FormData();
	for (const [k, v] of Object.entries(form ?? {})) body.set(k, v);
	const url = new URL(`http://127.0.0.1:4173/o/${slug}/flights/upload`);
	return {
		request: new Request(url, { method: 'POST', body }),
		url,
		params: { org: slug },
		locals: { user, session: null, authVia: 'session' },
		route: { id: '/o/[org]/flights/upload' }
	} as unknown as RequestEvent;
}

const saveProfile = (slug: string, user: Club['pilot'], form: Record<string, string>) => actions.saveProfile(pageEvent(slug, user, form) as never) as Promise<any>;

describe('another recorder’s layout', () => {
	it('is stored through an explicit mapping, with semicolons, decimal commas, km/h, metres and clock times past midnight', async () => {
		const res = await upload(club.pilot, { aircraftId: club.diesel.id, file: sample(FILE), fileName: FILE, fields: { mapping: JSON.stringify(MAPPING) } });
		expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(201);
		const f = (await db.select().from(flights).where(eq(flights.id, res.body.flightId)))[0];
		expect(f.startedAt.toISOString()).toBe('2026-08-14T23:05:00.000Z');
		// The clock passed 00:00, so the last sample is on the next day.
		expect(f.endedAt!.toISOString().slice(0, 10)).toBe('2026-08-15');
		expect(f.sampleCount).toBe(sample(FILE).toString('utf8').trim().split('\r\n').length - 2);

		// A cruise line of the file, converted: km/h and km by 1 NM = 1852 m (BIPM), metres by 1 ft = 0.3048 m.
		const lines = sample(FILE).toString('utf8').split('\r\n');
		const cells = lines[2 + 2000].split(';').map((c) => c.replace(',', '.'));
		const row = (await db.select().from(samples).where(eq(samples.flightId, f.id)).orderBy(asc(samples.seq)).offset(2000).limit(1))[0];
		expect(row.t.toISOString().slice(11, 19)).toBe(cells[0]);
		expect(row.flow).toBe(Number(cells[1]));
		expect(row.gs).toBeCloseTo(Number(cells[2]) / 1.852, 9);
		expect(row.dtg).toBeCloseTo(Number(cells[3]) / 1.852, 9);
		expect(row.alt).toBeCloseTo(Number(cells[4]) / 0.3048, 9);
		expect(row.wpt).toBe(cells[5]);
		const u = (await db.select().from(uploads).where(eq(uploads.id, res.body.uploadId)))[0];
		expect(u.report).toMatchObject({ origin: { kind: 'given' }, headerLine: 2, rows: f.sampleCount });
	});
});

describe('import profiles', () => {
	it('saves a named profile for the organisation, without one file’s date', async () => {
		const res = await saveProfile(club.slug, club.pilot, { name: 'Diesel panel log', headers: JSON.stringify(HEADERS), mapping: JSON.stringify(MAPPING) });
		expect(res.saved).toMatchObject({ name: 'Diesel panel log', headerSignature: headerSignature(HEADERS) });
		const stored = (await db.select().from(importProfiles).where(eq(importProfiles.orgId, club.orgId)))[0];
		expect(stored.mapping).toMatchObject({ time: { column: 'Clock', format: 'clock' } });
		expect((stored.mapping as { time: { date?: string } }).time.date).toBeUndefined();
		expect(stored.createdBy).toBe(club.pilot.id);
	});

	it('refuses a second profile of the same name unless asked to replace it', async () => {
		const again = await saveProfile(club.slug, club.pilot, { name: 'Diesel panel log', headers: JSON.stringify(HEADERS), mapping: JSON.stringify(MAPPING) });
		expect(again.status).toBe(400);
		expect(again.data.errors.name).toMatch(/exists already/);
		const replaced = await saveProfile(club.slug, club.pilot, { name: 'Diesel panel log', headers: JSON.stringify(HEADERS), mapping: JSON.stringify({ ...MAPPING, alt: null }), replace: '1' });
		expect(replaced.saved.mapping.alt).toBeNull();
		expect((await db.select().from(importProfiles).where(eq(importProfiles.orgId, club.orgId))).length).toBe(1);
		await saveProfile(club.slug, club.pilot, { name: 'Diesel panel log', headers: JSON.stringify(HEADERS), mapping: JSON.stringify(MAPPING), replace: '1' });
	});

	it('refuses a profile naming columns the file does not have', async () => {
		const res = await saveProfile(club.slug, club.pilot, { name: 'Broken', headers: JSON.stringify(['Clock', 'Flow']), mapping: JSON.stringify(MAPPING) });
		expect(res.status).toBe(400);
		expect(res.data.errors.mapping).toMatch(/"Fuel flow \(l\/h\)" is not in the header/);
	});

	it('is applied automatically to a file whose header matches', async () => {
		const [second] = await db.insert(aircraft).values({ ...club.diesel, id: undefined, registration: 'BD-TT2', createdAt: undefined, updatedAt: undefined }).returning();
		const res = await upload(club.pilot, { aircraftId: second.id, file: sample(FILE), fileName: FILE, fields: { timeDate: '2026-08-14' } });
		expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(201);
		expect(res.body.report.origin).toMatchObject({ kind: 'profile', profileName: 'Diesel panel log' });
		expect(res.body.report.mapping.time.date).toBe('2026-08-14');
	});

	it('asks for the date when the profile reads clock times', async () => {
		const [third] = await db.insert(aircraft).values({ ...club.diesel, id: undefined, registration: 'BD-TT3', createdAt: undefined, updatedAt: undefined }).returning();
		const before = await tableCounts();
		const res = await upload(club.pilot, { aircraftId: third.id, file: sample(FILE) });
		expect(res.status).toBe(400);
		expect(res.body.problems[0].message).toMatch(/Import profile "Diesel panel log": Clock times need the date/);
		expect(await tableCounts()).toEqual(before);
	});

	it('belongs to its organisation: not listed, not applied, not chosen by id elsewhere', async () => {
		const other = await makeClub('Elsewhere Club');
		const page = (await load(pageEvent(other.slug, other.pilot) as never)) as { profiles: unknown[] };
		expect(page.profiles).toEqual([]);
		const ours = (await load(pageEvent(club.slug, club.pilot) as never)) as { profiles: { name: string }[] };
		expect(ours.profiles.map((p) => p.name)).toEqual(['Diesel panel log']);

		const res = await upload(other.pilot, { aircraftId: other.diesel.id, file: sample(FILE), fields: { timeDate: '2026-08-14' } });
		expect(res.status).toBe(400);
		expect(res.body.problems[0].message).toMatch(/No import profile/);
		const profileId = (await db.select().from(importProfiles).where(eq(importProfiles.orgId, club.orgId)))[0].id;
		const byId = await upload(other.pilot, { aircraftId: other.diesel.id, file: sample(FILE), fields: { timeDate: '2026-08-14', profileId } });
		expect(byId.body.problems[0].message).toMatch(/does not exist in this organisation/);
	});

	it('a viewer may not save profiles', async () => {
		await expect(saveProfile(club.slug, club.viewer, { name: 'Viewer’s', headers: JSON.stringify(HEADERS), mapping: JSON.stringify(MAPPING) })).rejects.toMatchObject({ status: 403 });
	});
});
