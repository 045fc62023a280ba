// Every route × every role: allow (2xx, or 400 for a deliberately empty form), 403 for a member
// without the permission, 404 for anyone outside the organisation, sign-in or 401 when anonymous.
// Two more tests fail when a route, or a form action of a page, is added without a row here. The
// server's authorization guard turns any answer no helper decided into a 500, which a row shows.
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import ts from 'typescript';
import { expect, test, type APIRequestContext } from '@playwright/test';
import { apiAs, DEMO_AIRCRAFT, DEMO_ORG, OTHER_ORG, type DemoRole } from './support';
import { PUBLIC_ROUTES } from '../../src/lib/server/public-routes';

const ROLES: (DemoRole | 'anonymous')[] = ['admin', 'instructor', 'pilot', 'student', 'viewer', 'other', 'anonymous'];
type Expect = Record<DemoRole | 'anonymous', number>;

// Shorthands: who may, and what the rest get.
const members = (ok: number, anon = 303): Expect => ({ admin: ok, instructor: ok, pilot: ok, student: ok, viewer: ok, other: 404, anonymous: anon });
const only = (allowed: DemoRole[], ok: number, anon = 303): Expect => {
	const e = members(403, anon);
	for (const r of allowed) e[r] = ok;
	return e;
};
const anyone = (ok: number, anon = 303): Expect => ({ ...members(ok, anon), other: ok });

interface Row {
	route: string; // the SvelteKit route id, to check coverage
	method: 'GET' | 'POST';
	path: (ids: Ids) => string;
	expect: Expect;
	form?: Record<string, string> | ((ids: Ids) => Record<string, string>);
	/** Where a member's 303 must lead (the anonymous one always leads to sign-in). */
	location?: RegExp;
	/** A raw body instead of a form, e.g. an empty CSV upload. */
	body?: { data: string; type: string };
}
interface Ids {
	pilotFlight: string;
	/** A second flight of the demo pilot, for comparing two flights. */
	pilotFlight2: string;
}

const O = `/o/${DEMO_ORG}`;
const FLIGHT_VIEWERS: DemoRole[] = ['admin', 'instructor', 'viewer', 'pilot'];
const FLIGHT_EDITORS: DemoRole[] = ['admin', 'instructor', 'pilot'];
const F = (i: Ids) => `${O}/flights/${i.pilotFlight}`;

const MATRIX: Row[] = [
	{ route: '/orgs', method: 'GET', path: () => '/orgs', expect: anyone(200) },
	{ route: '/orgs', method: 'POST', path: () => '/orgs?/create', form: { name: '' }, expect: anyone(400, 303) },
	{ route: '/account', method: 'GET', path: () => '/account', expect: anyone(200) },
	// Demo mode only (the end-to-end app runs in it): each user's own mail.
	{ route: '/dev/mailbox', method: 'GET', path: () => '/dev/mailbox', expect: anyone(200) },
	{ route: '/o/[org]', method: 'GET', path: () => O, expect: members(200) },
	{ route: '/o/[org]/aircraft', method: 'GET', path: () => `${O}/aircraft`, expect: members(200) },
	{ route: '/o/[org]/aircraft/new', method: 'GET', path: () => `${O}/aircraft/new`, expect: only(['admin'], 200) },
	{ route: '/o/[org]/aircraft/new', method: 'POST', path: () => `${O}/aircraft/new`, form: { registration: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/aircraft/[id]', method: 'GET', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}`, expect: members(200) },
	{ route: '/o/[org]/aircraft/[id]', method: 'GET', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.otherOrg}`, expect: { ...members(404), anonymous: 303 } },
	{ route: '/o/[org]/aircraft/[id]', method: 'GET', path: () => `/o/${OTHER_ORG}/aircraft/${DEMO_AIRCRAFT.otherOrg}`, expect: { admin: 404, instructor: 404, pilot: 404, student: 404, viewer: 404, other: 200, anonymous: 303 } },
	{ route: '/o/[org]/aircraft/[id]', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}?/save`, form: { registration: '' }, expect: only(['admin'], 400) },
	// Archive toggles: twice, so the trainer ends as it started for the tests after this one.
	{ route: '/o/[org]/aircraft/[id]', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}?/archive`, form: {}, expect: only(['admin'], 200) },
	{ route: '/o/[org]/aircraft/[id]', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}?/archive`, form: {}, expect: only(['admin'], 200) },
	{ route: '/o/[org]/aircraft/[id]/history', method: 'GET', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/history`, expect: members(200) },
	{ route: '/o/[org]/aircraft/[id]/history', method: 'GET', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.otherOrg}/history`, expect: { ...members(404), anonymous: 303 } },
	{ route: '/o/[org]/aircraft/[id]/history', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/history?/settings`, form: { threshold: 'lots' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/aircraft/[id]/history', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/history?/unusual`, form: { flightId: '' }, expect: only(['admin'], 400) },
	// Fuel pumped and calibration: the maintenance viewer (and the instructor) read; only the admin writes.
	{ route: '/o/[org]/aircraft/[id]/reconciliation', method: 'GET', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation`, expect: only(['admin', 'instructor', 'viewer'], 200) },
	{ route: '/o/[org]/aircraft/[id]/reconciliation', method: 'GET', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.otherOrg}/reconciliation`, expect: { ...members(404), anonymous: 303 } },
	{ route: '/o/[org]/aircraft/[id]/reconciliation', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation?/receipt`, form: { amount: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/aircraft/[id]/reconciliation', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation?/deleteReceipt`, form: { receiptId: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/aircraft/[id]/reconciliation', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation?/apply`, form: { from: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/aircraft/[id]/reconciliation', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation?/factors`, form: { meterFactor: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/members', method: 'GET', path: () => `${O}/members`, expect: only(['admin'], 200) },
	{ route: '/o/[org]/members', method: 'POST', path: () => `${O}/members?/invite`, form: { email: 'not-an-address', role: 'pilot' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/members', method: 'POST', path: () => `${O}/members?/role`, form: { userId: '', role: 'admin' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/members', method: 'POST', path: () => `${O}/members?/remove`, form: { userId: '' }, expect: only(['admin'], 400) },
	// An invitation id that matches none: nothing changes.
	{ route: '/o/[org]/members', method: 'POST', path: () => `${O}/members?/revoke`, form: { id: '00000000-0000-4000-8000-000000000000' }, expect: only(['admin'], 200) },
	{ route: '/o/[org]/recorders', method: 'GET', path: () => `${O}/recorders`, expect: only(['admin'], 200) },
	{ route: '/o/[org]/flights', method: 'GET', path: () => `${O}/flights`, expect: members(200) },
	{ route: '/o/[org]/flights/upload', method: 'GET', path: () => `${O}/flights/upload`, expect: only(['admin', 'instructor', 'pilot', 'student'], 200) },
	{ route: '/o/[org]/flights/[id]', method: 'GET', path: (i) => `${O}/flights/${i.pilotFlight}`, expect: only(FLIGHT_VIEWERS, 200) },
	{ route: '/o/[org]/flights/compare', method: 'GET', path: (i) => `${O}/flights/compare?id=${i.pilotFlight}&id=${i.pilotFlight2}`, expect: only(FLIGHT_VIEWERS, 200) },
	{ route: '/o/[org]/flights/compare', method: 'GET', path: (i) => `${O}/flights/compare?id=${i.pilotFlight}`, expect: members(400) },
	{ route: '/o/[org]/flights/[id]/live', method: 'GET', path: (i) => `${O}/flights/${i.pilotFlight}/live`, expect: only(FLIGHT_VIEWERS, 200) },
	{ route: '/api/v1/flights/[id]/samples', method: 'GET', path: (i) => `/api/v1/flights/${i.pilotFlight}/samples`, expect: only(FLIGHT_VIEWERS, 200, 401) },
	// A closed flight's stream ends once it has sent every sample, so a GET returns.
	{ route: '/api/v1/flights/[id]/stream', method: 'GET', path: (i) => `/api/v1/flights/${i.pilotFlight}/stream`, expect: only(FLIGHT_VIEWERS, 200, 401) },
	// The API's lists: any member of the organisation asked for; the rest are told it is not there.
	{ route: '/api/v1/aircraft', method: 'GET', path: () => `/api/v1/aircraft?org=${DEMO_ORG}`, expect: members(200, 401) },
	{ route: '/api/v1/flights', method: 'GET', path: () => `/api/v1/flights?org=${DEMO_ORG}`, expect: members(200, 401) },
	{ route: '/api/v1/flights/[id]/export', method: 'GET', path: (i) => `/api/v1/flights/${i.pilotFlight}/export`, expect: only(FLIGHT_VIEWERS, 200, 401) },
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${F(i)}?/declaration`, form: {}, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${F(i)}?/addEvent`, form: {}, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${F(i)}?/removeEvent`, form: { id: '' }, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${F(i)}?/addNote`, form: { body: '' }, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${F(i)}?/removeNote`, form: { id: '' }, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${F(i)}?/editNote`, form: { id: '' }, expect: only(FLIGHT_EDITORS, 400) },
	// Details: the flight's pilot, instructors and admins; a title too long is refused with its field.
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${F(i)}?/details`, form: { title: 'x'.repeat(201), route: '' }, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]/plan', method: 'GET', path: (i) => `${F(i)}/plan`, expect: only(FLIGHT_VIEWERS, 200) },
	{ route: '/o/[org]/flights/[id]/plan', method: 'POST', path: (i) => `${F(i)}/plan?/save`, form: {}, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]/plan', method: 'POST', path: (i) => `${F(i)}/plan?/import`, form: {}, expect: only(FLIGHT_EDITORS, 400) },
	// The fixture flight has no plan: whoever may remove one is told so (404 with the reason).
	{ route: '/o/[org]/flights/[id]/plan', method: 'POST', path: (i) => `${F(i)}/plan?/remove`, form: {}, expect: only(FLIGHT_EDITORS, 404) },
	// Every member who may view the flight opens the debrief page (a draft shows as "not published yet").
	{ route: '/o/[org]/flights/[id]/debrief', method: 'GET', path: (i) => `${F(i)}/debrief`, expect: only(FLIGHT_VIEWERS, 200) },
	// Writing a debrief is the instructor's: the flight's own pilot may view but not write it.
	{ route: '/o/[org]/flights/[id]/debrief', method: 'POST', path: (i) => `${F(i)}/debrief?/saveText`, form: { summary: 'x'.repeat(5001) }, expect: only(['admin', 'instructor'], 400) },
	{ route: '/o/[org]/flights/[id]/debrief', method: 'POST', path: (i) => `${F(i)}/debrief?/share`, form: { days: '0' }, expect: only(['admin', 'instructor'], 400) },
	{ route: '/o/[org]/flights/[id]/debrief', method: 'POST', path: (i) => `${F(i)}/debrief?/revokeShare`, form: { id: '' }, expect: only(['admin', 'instructor'], 400) },
	{ route: '/o/[org]/flights/[id]/debrief', method: 'POST', path: (i) => `${F(i)}/debrief?/signOff`, form: {}, expect: only(['admin', 'instructor'], 200) },
	// After the sign-off above (the admin's run comes first), publishing succeeds and the print
	// layout opens for every viewer of the flight.
	{ route: '/o/[org]/flights/[id]/debrief', method: 'POST', path: (i) => `${F(i)}/debrief?/publish`, form: {}, expect: only(['admin', 'instructor'], 200) },
	{ route: '/o/[org]/flights/[id]/debrief/print', method: 'GET', path: (i) => `${F(i)}/debrief/print`, expect: only(FLIGHT_VIEWERS, 200) },
	{ route: '/o/[org]/students', method: 'GET', path: () => `${O}/students`, expect: only(['admin', 'instructor'], 200) },
	// An id that is no waiting plan: whoever may remove one is told so (404 with the reason).
	{ route: '/o/[org]/students', method: 'POST', path: () => `${O}/students?/removeWaiting`, form: { id: '00000000-0000-4000-8000-000000000000' }, expect: only(['admin', 'instructor'], 404) },
	// A plan made before the flight is the instructor's: a blank form answers each field's error.
	{ route: '/o/[org]/plans/new', method: 'GET', path: () => `${O}/plans/new`, expect: only(['admin', 'instructor'], 200) },
	{ route: '/o/[org]/plans/new', method: 'POST', path: () => `${O}/plans/new?/save`, form: {}, expect: only(['admin', 'instructor'], 400) },
	{ route: '/o/[org]/plans/new', method: 'POST', path: () => `${O}/plans/new?/import`, form: {}, expect: only(['admin', 'instructor'], 400) },
	// A shared link is its own authorization: an unknown token is 404 for everyone, signed in or not.
	{ route: '/share/[token]', method: 'GET', path: () => '/share/bds_not-a-real-token-000000000', expect: { ...anyone(404), anonymous: 404 } },
	{ route: '/o/[org]/flights/[id]/live', method: 'POST', path: (i) => `${F(i)}/live?/declaration`, form: {}, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]/live', method: 'POST', path: (i) => `${F(i)}/live?/ack`, form: { alarmId: '' }, expect: only(FLIGHT_EDITORS, 400) },
	{ route: '/o/[org]/flights/[id]/live', method: 'POST', path: (i) => `${F(i)}/live?/watch`, form: { on: 'maybe' }, expect: only(FLIGHT_VIEWERS, 400) },
	// The fixture flight has its pilot: whoever sees it is told so (409); the student does not see it.
	{ route: '/o/[org]/flights/[id]/live', method: 'POST', path: (i) => `${F(i)}/live?/claim`, form: {}, expect: only(FLIGHT_VIEWERS, 409) },
	{ route: '/o/[org]/flights/[id]/live', method: 'POST', path: (i) => `${F(i)}/live?/setPilot`, form: { pilotId: 'not-a-member' }, expect: only(['admin', 'instructor'], 400) },
	{ route: '/o/[org]/aircraft/[id]', method: 'POST', path: () => `${O}/aircraft/${DEMO_AIRCRAFT.trainer}?/watch`, form: { on: '0' }, expect: members(200) },
	{ route: '/o/[org]/recorders', method: 'POST', path: () => `${O}/recorders?/register`, form: { name: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/recorders', method: 'POST', path: () => `${O}/recorders?/rotate`, form: { id: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/recorders', method: 'POST', path: () => `${O}/recorders?/revoke`, form: { id: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/recorders', method: 'POST', path: () => `${O}/recorders?/flyingToday`, form: { id: '' }, expect: only(['admin'], 400) },
	{ route: '/o/[org]/flights/upload', method: 'POST', path: () => `${O}/flights/upload?/saveProfile`, form: { name: '' }, expect: only(['admin', 'instructor', 'pilot', 'student'], 400) },
	{ route: '/account', method: 'POST', path: () => '/account?/createToken', form: { name: '' }, expect: anyone(400) },
	{ route: '/account', method: 'POST', path: () => '/account?/preferences', form: { prefFuelUnit: 'furlongs' }, expect: anyone(400) },
	{ route: '/account', method: 'POST', path: () => '/account?/revokeToken', form: { id: '' }, expect: anyone(400) },
	{ route: '/account', method: 'POST', path: () => '/account?/changePassword', form: { current: '' }, expect: anyone(400) },
	{ route: '/account', method: 'POST', path: () => '/account?/signOutOthers', form: {}, expect: anyone(200) },
	// An empty CSV for the trainer: members who may upload get the file's error, the rest are refused first.
	{ route: '/api/v1/flights', method: 'POST', path: () => `/api/v1/flights?aircraftId=${DEMO_AIRCRAFT.trainer}&declaration=full`, body: { data: '', type: 'text/csv' }, expect: only(FLIGHT_EDITORS.concat('student'), 400, 401) },
	// The trash: the second fixture flight goes in and comes back out for each editor in turn.
	{ route: '/o/[org]/trash', method: 'GET', path: () => `${O}/trash`, expect: members(200) },
	{ route: '/o/[org]/flights/[id]', method: 'POST', path: (i) => `${O}/flights/${i.pilotFlight2}?/trash`, form: {}, location: /\/trash\?moved=/, expect: only(FLIGHT_EDITORS, 303) },
	{ route: '/o/[org]/trash', method: 'POST', path: () => `${O}/trash?/restore`, form: (i) => ({ id: i.pilotFlight2 }), expect: { ...only(FLIGHT_EDITORS, 200), viewer: 404, student: 404 } },
	{ route: '/o/[org]/trash', method: 'POST', path: () => `${O}/trash?/empty`, form: {}, expect: only(['admin'], 200) },
	// Last: it ends the role's own session, so every row after it would see a signed-out user.
	{ route: '/account', method: 'POST', path: () => '/account?/signOutEverywhere', form: {}, expect: anyone(303) }
];

/** Routes that need no membership: public by design (the one list), or checked elsewhere. */
const OUTSIDE_MATRIX = new Set([
	...PUBLIC_ROUTES.keys(),
	// Recorder-token routes: tested with valid, revoked and foreign tokens in tests/integration/live*.
	'/api/v1/live/samples', '/api/v1/live/open', '/api/v1/live/close'
]);

let ids: Ids;

test.beforeAll(async () => {
	// A flight that belongs to the demo pilot, so "own" and "someone else's" can both be checked.
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		const { rows } = await client.query(
			`insert into flights (org_id, aircraft_id, pilot_id, title, source, status, started_at, ended_at, declaration)
			 select org_id, id, 'demo-pilot', 'matrix fixture', 'upload', 'closed', now() - interval '2 hours', now() - interval '1 hour', '{"kind":"full"}'
			 from aircraft where id = $1 returning id`,
			[DEMO_AIRCRAFT.trainer]
		);
		const second = await client.query(
			`insert into flights (org_id, aircraft_id, pilot_id, title, source, status, started_at, ended_at, declaration)
			 select org_id, id, 'demo-pilot', 'matrix fixture 2', 'upload', 'closed', now() - interval '4 hours', now() - interval '3 hours', '{"kind":"full"}'
			 from aircraft where id = $1 returning id`,
			[DEMO_AIRCRAFT.trainer]
		);
		ids = { pilotFlight: rows[0].id, pilotFlight2: second.rows[0].id };
		for (const [id, start] of [[ids.pilotFlight, '2 hours'], [ids.pilotFlight2, '4 hours']])
			await client.query(
				`insert into samples (flight_id, seq, t, flow, gs, dtg) select $1, s, now() - interval '${start}' + s * interval '1 second', 30, 100, 20 from generate_series(0, 9) s`,
				[id]
			);
	} finally {
		await client.end();
	}
});

const contexts = new Map<string, APIRequestContext>();
test.afterAll(async () => {
	for (const c of contexts.values()) await c.dispose();
});

for (const role of ROLES) {
	test(`routes as ${role}`, async () => {
		const ctx = contexts.get(role) ?? (await apiAs(role));
		contexts.set(role, ctx);
		const failures: string[] = [];
		for (const row of MATRIX) {
			const url = row.path(ids);
			const res =
				row.method === 'GET'
					? await ctx.get(url, { maxRedirects: 0, headers: { accept: 'text/html' } })
					: row.body
						? await ctx.post(url, { data: row.body.data, maxRedirects: 0, headers: { 'content-type': row.body.type } })
						: await ctx.post(url, { form: (typeof row.form === 'function' ? row.form(ids) : row.form) ?? {}, maxRedirects: 0, headers: { accept: 'text/html' } });
			const want = row.expect[role];
			if (res.status() !== want) failures.push(`${row.method} ${url}: got ${res.status()}, want ${want}`);
			if (want === 303 && res.status() === 303) {
				const location = res.headers()['location'] ?? '';
				if (row.location && role !== 'anonymous') {
					if (!row.location.test(location)) failures.push(`${row.method} ${url}: redirected to ${location}, want ${row.location}`);
				} else if (!location.startsWith('/sign-in')) failures.push(`${row.method} ${url}: redirected to ${location}, want /sign-in`);
			}
		}
		expect(failures, failures.join('\n')).toEqual([]);
	});
}

test('every route under src/routes is in the matrix or listed as outside it', () => {
	const root = path.resolve('src/routes');
	const found: string[] = [];
	const walk = (dir: string) => {
		for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
			if (entry.isDirectory()) walk(path.join(dir, entry.name));
			else if (/^\+(page|server)(\.server)?\.(ts|svelte)$/.test(entry.name)) {
				const id = '/' + path.relative(root, dir).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s)).join('/');
				found.push(id === '/' ? '/' : id.replace(/\/$/, ''));
			}
		}
	};
	walk(root);
	const covered = new Set(MATRIX.map((r) => r.route));
	const missing = [...new Set(found)].filter((r) => !covered.has(r) && !OUTSIDE_MATRIX.has(r));
	expect(missing, `routes with no row in the role matrix: ${missing.join(', ')}`).toEqual([]);
});

/** Every form action of every +page.server.ts, as "route ?/name" ("default" for the unnamed one). */
function formActions(): string[] {
	const root = path.resolve('src/routes');
	const found: string[] = [];
	const walk = (dir: string) => {
		for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
			const file = path.join(dir, entry.name);
			if (entry.isDirectory()) walk(file);
			else if (entry.name === '+page.server.ts') {
				const id = '/' + path.relative(root, dir).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s)).join('/');
				const source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true);
				const visit = (node: ts.Node) => {
					if (ts.isVariableDeclaration(node) && node.name.getText() === 'actions' && node.initializer) {
						let init: ts.Expression = node.initializer;
						while (ts.isSatisfiesExpression(init) || ts.isAsExpression(init) || ts.isParenthesizedExpression(init)) init = init.expression;
						if (!ts.isObjectLiteralExpression(init)) throw new Error(`${file}: actions is not an object literal; list its actions here by hand`);
						for (const p of init.properties) found.push(`${id === '/' ? '/' : id.replace(/\/$/, '')} ?/${p.name?.getText() ?? '?'}`);
					}
					ts.forEachChild(node, visit);
				};
				visit(source);
			}
		}
	};
	walk(root);
	return found;
}

test('every form action of every page is in the matrix or on a route outside it', () => {
	const actions = formActions();
	// The walk itself must see actions, or the check below proves nothing.
	expect(actions).toContain('/o/[org]/members ?/remove');
	const covered = new Set(
		MATRIX.filter((r) => r.method === 'POST' && !r.body).map((r) => {
			const name = /^\?\/([\w-]+)/.exec(new URL(r.path({ pilotFlight: 'x', pilotFlight2: 'x' }), 'http://x').search)?.[1] ?? 'default';
			return `${r.route} ?/${name}`;
		})
	);
	const missing = actions.filter((a) => !covered.has(a) && !OUTSIDE_MATRIX.has(a.split(' ')[0]));
	expect(missing, `form actions with no row in the role matrix: ${missing.join(', ')}`).toEqual([]);
});
