// Property tests (fast-check) through the real route handlers and form actions against the
// database: whatever arrives, the answer is never a server error or a throw, and a refused
// request leaves every table as it was.
import { beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isHttpError, isRedirect, type RequestEvent } from '@sveltejs/kit';
import { sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { actions as orgsActions } from '../../src/routes/orgs/+page.server';
import { actions as accountActions } from '../../src/routes/account/+page.server';
import { actions as newAircraftActions } from '../../src/routes/o/[org]/aircraft/new/+page.server';
import { actions as aircraftActions } from '../../src/routes/o/[org]/aircraft/[id]/+page.server';
import { actions as reconciliationActions } from '../../src/routes/o/[org]/aircraft/[id]/reconciliation/+page.server';
import { actions as recorderActions } from '../../src/routes/o/[org]/recorders/+page.server';
import { actions as flightActions } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { actions as liveActions } from '../../src/routes/o/[org]/flights/[id]/live/+page.server';
import { actions as uploadActions } from '../../src/routes/o/[org]/flights/upload/+page.server';
import { formOf, hostileText } from '../helpers/hostile';
import { call, liveWorld, samples, type LiveWorld } from './live-fixtures';

let w: LiveWorld;
let liveFlight = '';
let closedFlight = '';
beforeAll(async () => {
	w = await liveWorld();
	const open = await call('open', w.tokenB, { declaration: { kind: 'onBoard', amount: 30 } });
	closedFlight = open.body.flightId;
	expect((await call('samples', w.tokenB, { flightId: closedFlight, samples: samples(0, 30) })).status).toBe(200);
	expect((await call('close', w.tokenB, {})).status).toBe(200);
	const live = await call('open', w.tokenB, { declaration: { kind: 'full' } });
	liveFlight = live.body.flightId;
	expect((await call('samples', w.tokenB, { flightId: liveFlight, samples: samples(0, 10) })).status).toBe(200);
});

/** Every table a request could write to, and the last change of each mutable row kind. */
async function fingerprint(): Promise<string> {
	const r = await db.execute(sql`select
		(select count(*) from organisations) o, (select count(*) from memberships) m, (select count(*) from aircraft) a,
		(select max(updated_at) from aircraft) au, (select count(*) from recorders) r, (select string_agg(token_hash || coalesce(revoked_at::text, ''), ',' order by id) from recorders) rt,
		(select count(*) from flights) f, (select max(updated_at) from flights) fu, (select count(*) from samples) s,
		(select count(*) from fuel_events) e, (select count(*) from flight_notes) n, (select count(*) from calibrations) c, (select count(*) from pump_receipts) pr,
		(select count(*) from api_tokens) t, (select count(*) from api_tokens where revoked_at is not null) tr,
		(select count(*) from import_profiles) p, (select count(*) from watches) wa, (select count(*) from alarm_acks) aa,
		(select string_agg(coalesce(pref_fuel_unit::text, '-'), ',' order by id) from users) u`);
	return JSON.stringify(r.rows[0]);
}

/** What a form action answered: its status, or the thrown redirect's / error's. Anything else fails the test. */
async function outcome(run: () => unknown): Promise<number> {
	try {
		const r = (await run()) as { status?: number } | undefined;
		return typeof r?.status === 'number' ? r.status : 200;
	} catch (e) {
		if (isRedirect(e)) return e.status;
		if (isHttpError(e)) return e.status;
		throw e;
	}
}

function formEvent(route: string, path: string, params: Record<string, string>, form: FormData): RequestEvent {
	const url = new URL(`http://127.0.0.1:4173${path}`);
	const user = { id: w.admin.id, email: w.admin.email, name: w.admin.name, prefFuelUnit: null, timeZone: null };
	return { request: new Request(url, { method: 'POST', body: form }), url, params, locals: { user, session: null, authVia: 'session' }, route: { id: route } } as unknown as RequestEvent;
}

/** Runs `numRuns` hostile forms through an action; refusals must leave the database as it was. */
async function fuzzAction(name: string, action: (e: never) => unknown, route: string, path: () => string, params: () => Record<string, string>, fields: string[], numRuns = 60) {
	await fc.assert(
		fc.asyncProperty(formOf(fields), async (form) => {
			const before = await fingerprint();
			const status = await outcome(() => action(formEvent(route, path(), params(), form) as never));
			expect(status, `${name} answered ${status}`).toBeLessThan(500);
			if (status >= 400) expect(await fingerprint(), `${name} refused with ${status} but changed something`).toBe(before);
		}),
		{ numRuns }
	);
}

describe('every form action under hostile input', () => {
	const org = () => ({ org: w.slug });
	const ac = () => ({ org: w.slug, id: w.aircraftA });
	const fl = (id: () => string) => () => ({ org: w.slug, id: id() });
	const aircraftFields = ['registration', 'type', 'engine', 'fuelType', 'densityKgPerL', 'displayUnit', 'capacity', 'lowerLevel', 'unusable', 'meterFactor', 'kFactor', 'lowFuel', 'lowEnduranceMin', 'reserveRule', 'reserveCustomMin', 'baselineCruise'];
	const cases: [string, (e: never) => unknown, string, () => string, () => Record<string, string>, string[]][] = [
		['orgs create', orgsActions.create, '/orgs', () => '/orgs?/create', () => ({}), ['name']],
		['account preferences', accountActions.preferences, '/account', () => '/account?/preferences', () => ({}), ['prefFuelUnit']],
		['account createToken', accountActions.createToken, '/account', () => '/account?/createToken', () => ({}), ['name']],
		['account revokeToken', accountActions.revokeToken, '/account', () => '/account?/revokeToken', () => ({}), ['id']],
		['aircraft new', newAircraftActions.default, '/o/[org]/aircraft/new', () => `/o/${w.slug}/aircraft/new`, org, aircraftFields],
		['aircraft save', aircraftActions.save, '/o/[org]/aircraft/[id]', () => `/o/${w.slug}/aircraft/${w.aircraftA}?/save`, ac, aircraftFields],
		['reconciliation receipt', reconciliationActions.receipt, '/o/[org]/aircraft/[id]/reconciliation', () => `/o/${w.slug}/aircraft/${w.aircraftA}/reconciliation?/receipt`, ac, ['at', 'airfield', 'amount', 'unit', 'full', 'note']],
		['reconciliation deleteReceipt', reconciliationActions.deleteReceipt, '/o/[org]/aircraft/[id]/reconciliation', () => `/o/${w.slug}/aircraft/${w.aircraftA}/reconciliation?/deleteReceipt`, ac, ['receiptId']],
		['reconciliation apply', reconciliationActions.apply, '/o/[org]/aircraft/[id]/reconciliation', () => `/o/${w.slug}/aircraft/${w.aircraftA}/reconciliation?/apply`, ac, ['from', 'to', 'as', 'inForceFrom', 'step', 'note']],
		['reconciliation factors', reconciliationActions.factors, '/o/[org]/aircraft/[id]/reconciliation', () => `/o/${w.slug}/aircraft/${w.aircraftA}/reconciliation?/factors`, ac, ['meterFactor', 'kFactor', 'inForceFrom', 'note']],
		['aircraft watch', aircraftActions.watch, '/o/[org]/aircraft/[id]', () => `/o/${w.slug}/aircraft/${w.aircraftA}?/watch`, ac, ['on']],
		['recorders register', recorderActions.register, '/o/[org]/recorders', () => `/o/${w.slug}/recorders?/register`, org, ['name', 'aircraftId']],
		['recorders rotate', recorderActions.rotate, '/o/[org]/recorders', () => `/o/${w.slug}/recorders?/rotate`, org, ['id']],
		['recorders revoke', recorderActions.revoke, '/o/[org]/recorders', () => `/o/${w.slug}/recorders?/revoke`, org, ['id']],
		['flight declaration', flightActions.declaration, '/o/[org]/flights/[id]', () => `/o/${w.slug}/flights/${closedFlight}?/declaration`, fl(() => closedFlight), ['kind', 'amount', 'unit', 'previous']],
		['flight addEvent', flightActions.addEvent, '/o/[org]/flights/[id]', () => `/o/${w.slug}/flights/${closedFlight}?/addEvent`, fl(() => closedFlight), ['kind', 'amount', 'unit', 'at', 'note']],
		['flight removeEvent', flightActions.removeEvent, '/o/[org]/flights/[id]', () => `/o/${w.slug}/flights/${closedFlight}?/removeEvent`, fl(() => closedFlight), ['id']],
		['flight addNote', flightActions.addNote, '/o/[org]/flights/[id]', () => `/o/${w.slug}/flights/${closedFlight}?/addNote`, fl(() => closedFlight), ['body', 'at']],
		['flight removeNote', flightActions.removeNote, '/o/[org]/flights/[id]', () => `/o/${w.slug}/flights/${closedFlight}?/removeNote`, fl(() => closedFlight), ['id']],
		['live declaration', liveActions.declaration, '/o/[org]/flights/[id]/live', () => `/o/${w.slug}/flights/${liveFlight}/live?/declaration`, fl(() => liveFlight), ['kind', 'amount', 'unit', 'previous']],
		['live ack', liveActions.ack, '/o/[org]/flights/[id]/live', () => `/o/${w.slug}/flights/${liveFlight}/live?/ack`, fl(() => liveFlight), ['alarmId']],
		['live watch', liveActions.watch, '/o/[org]/flights/[id]/live', () => `/o/${w.slug}/flights/${liveFlight}/live?/watch`, fl(() => liveFlight), ['on']],
		['upload saveProfile', uploadActions.saveProfile, '/o/[org]/flights/upload', () => `/o/${w.slug}/flights/upload?/saveProfile`, org, ['name', 'headers', 'mapping', 'replace']]
	];
	for (const [name, action, route, path, params, fields] of cases) it(name, () => fuzzAction(name, action, route, path, params, fields));

	it('a saved profile whose column names hold an escaped NUL byte is refused, not a server error', async () => {
		const form = new FormData();
		form.set('name', 'Nul columns');
		form.set('headers', JSON.stringify(['time', 'fl\u0000ow']));
		form.set('mapping', JSON.stringify({ time: { column: 'time', format: 'iso' }, flow: { column: 'fl\u0000ow', unit: 'l/h' } }));
		const before = await fingerprint();
		const status = await outcome(() => uploadActions.saveProfile(formEvent('/o/[org]/flights/upload', `/o/${w.slug}/flights/upload?/saveProfile`, { org: w.slug }, form) as never));
		expect(status).toBe(400);
		expect(await fingerprint()).toBe(before);
	});
});

describe('the recorder API under hostile input', () => {
	const T0 = Date.UTC(2026, 4, 2, 9);
	const num = fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: -1e6, max: 1e6 }));
	const nearSample = (i: number) =>
		fc.record(
			{
				seq: fc.oneof(fc.constant(i), num, hostileText),
				t: fc.oneof(fc.constant(new Date(T0 + i * 1000).toISOString()), num, hostileText),
				flow: fc.oneof(fc.constant(30), num, fc.constant(null), hostileText),
				gs: fc.oneof(fc.constant(100), num),
				dtg: fc.oneof(fc.constant(40), num),
				wpt: fc.oneof(fc.constant('WPT-B'), hostileText, fc.constant(null))
			},
			{ requiredKeys: ['seq', 't'] }
		);
	const nearBatch = fc.integer({ min: 1, max: 5 }).chain((n) => fc.record({ samples: fc.tuple(...Array.from({ length: n }, (_, i) => nearSample(i))), firstSeq: num }, { requiredKeys: ['samples'] }));
	const body = fc.oneof(
		nearBatch.map((b) => JSON.stringify(b)),
		fc.jsonValue().map((v) => JSON.stringify(v)),
		hostileText,
		fc.uint8Array({ maxLength: 200 })
	);

	const fuzzRoute = (route: 'samples' | 'open' | 'close', csv = false, numRuns = 150) =>
		fc.assert(
			fc.asyncProperty(body, async (b) => {
				const before = await fingerprint();
				let r: { status: number; body: Record<string, unknown> };
				try {
					r = await call(route, w.tokenA, b, { csv });
				} catch (e) {
					throw new Error(`${route} threw: ${(e as Error).message}`);
				}
				expect(r.status, JSON.stringify(r.body)).toBeLessThan(500);
				if (r.status >= 400) expect(await fingerprint()).toBe(before);
				if (r.status < 400 && route !== 'close') await call('close', w.tokenA, {});
			}),
			{ numRuns }
		);

	it('samples, JSON', () => fuzzRoute('samples'));
	it('samples, CSV', () => fuzzRoute('samples', true));
	it('open', () => fuzzRoute('open', false, 100));
	it('close', () => fuzzRoute('close', false, 50));
});
