// Shared set-up for the upload tests: an organisation with members of each role and aircraft like
// the demo fleet, requests to POST /api/v1/flights as the route receives them, and a count of
// the rows in every table so a test can prove a refused upload left nothing behind.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { RequestEvent } from '@sveltejs/kit';
import { db, pool } from '$lib/server/db';
import { aircraft, memberships, organisations, users, type Aircraft, type Role } from '$lib/server/db/schema';
import type { AuthUser } from '$lib/server/auth';
import { POST } from '../../src/routes/api/v1/flights/+server';
import { LITRES_PER_US_GALLON } from '$lib/units';

export const SAMPLES = fileURLToPath(new URL('../../samples', import.meta.url));
export const sample = (name: string) => fs.readFileSync(path.join(SAMPLES, name));

let n = 0;
const uid = () => `${Date.now().toString(36)}${(n++).toString(36)}`;

export async function makeUser(name: string): Promise<AuthUser> {
	const id = `u_${uid()}`;
	const email = `${id}@example.org`;
	await db.insert(users).values({ id, email, name, passwordHash: 'not-used-here' });
	return { id, email, name, prefFuelUnit: null, timeZone: null } as AuthUser;
}

export interface Club {
	orgId: string;
	slug: string;
	pilot: AuthUser;
	viewer: AuthUser;
	trainer: Aircraft;
	tourer: Aircraft;
	diesel: Aircraft;
}

/** A club like the demo one: a pilot, a viewer, a trainer, a tourer and a diesel. */
export async function makeClub(name = 'Test Club'): Promise<Club> {
	const slug = `club-${uid()}`;
	const [org] = await db.insert(organisations).values({ name, slug }).returning();
	const pilot = await makeUser('Pat Pilot');
	const viewer = await makeUser('Val Viewer');
	const member = (u: AuthUser, role: Role) => db.insert(memberships).values({ orgId: org.id, userId: u.id, role });
	await member(pilot, 'pilot');
	await member(viewer, 'viewer');
	const gal = LITRES_PER_US_GALLON;
	const add = async (registration: string, v: Partial<typeof aircraft.$inferInsert>) =>
		(await db.insert(aircraft).values({ orgId: org.id, registration, type: 'test', fuelType: 'avgas', densityKgPerL: 0.719, displayUnit: 'usgal', reserveRule: 'faa-91.151-vfr-day', capacityL: 40 * gal, ...v }).returning())[0];
	return {
		orgId: org.id,
		slug,
		pilot,
		viewer,
		trainer: await add('BD-TST', { capacityL: 40 * gal, lowerLevelL: 28 * gal, baselineCruiseLph: 8.2 * gal }),
		tourer: await add('BD-TTT', { capacityL: 88 * gal, lowerLevelL: 62 * gal, baselineCruiseLph: 13.4 * gal }),
		diesel: await add('BD-TTD', { fuelType: 'jet', densityKgPerL: 0.803, displayUnit: 'l', capacityL: 190, lowerLevelL: 120, baselineCruiseLph: 22, reserveRule: 'easa-nco.op.125-vfr-day' })
	};
}

export function apiEvent(request: Request, user: AuthUser | null): RequestEvent {
	return {
		request,
		url: new URL(request.url),
		locals: { user, session: null, authVia: user ? 'token' : null },
		route: { id: '/api/v1/flights' },
		params: {}
	} as unknown as RequestEvent;
}

export interface UploadOptions {
	aircraftId: string;
	file: Uint8Array | string;
	fileName?: string;
	declaration?: string;
	amount?: string;
	fields?: Record<string, string>;
	accept?: string;
}

/** A multipart upload, fields first, as the page and curl -F send it. */
export function multipartRequest(o: UploadOptions): Request {
	const fd = new FormData();
	fd.set('aircraftId', o.aircraftId);
	fd.set('declaration', o.declaration ?? 'full');
	if (o.amount !== undefined) fd.set('amount', o.amount);
	for (const [k, v] of Object.entries(o.fields ?? {})) fd.set(k, v);
	fd.set('file', new Blob([o.file as BlobPart], { type: 'text/csv' }), o.fileName ?? 'flight.csv');
	return new Request('http://127.0.0.1:4173/api/v1/flights', { method: 'POST', body: fd, headers: o.accept ? { accept: o.accept } : {} });
}

export async function upload(user: AuthUser | null, o: UploadOptions): Promise<{ status: number; body: any }> {
	const res = await POST(apiEvent(multipartRequest(o), user) as never);
	return { status: res.status, body: await res.json() };
}

/** Rows in every table of the schema, by table name. */
export async function tableCounts(): Promise<Record<string, number>> {
	const { rows } = await pool.query<{ table_name: string }>("SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY table_name");
	const out: Record<string, number> = {};
	for (const { table_name } of rows) out[table_name] = (await pool.query<{ n: number }>(`SELECT count(*)::int AS n FROM "${table_name}"`)).rows[0].n;
	return out;
}

/** A recorder file in our format: one sample a second at a constant flow in US gal/h. */
export function steadyFile(o: { start: number; seconds: number; flowUsgph: number; gs?: number }): string {
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm'];
	for (let i = 0; i <= o.seconds; i++) lines.push(`${new Date(o.start + i * 1000).toISOString()},${o.flowUsgph},${o.gs ?? 100},${Math.max(0, 50 - i / 36).toFixed(3)}`);
	return lines.join('\n') + '\n';
}
