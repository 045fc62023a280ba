// Refused uploads against the real database: each kind of bad file answered with its line
// numbers and nothing stored (rows in every table counted before and after), the size limit
// enforced while streaming, bad declarations, and who may upload at all.
import { beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { aircraft } from '$lib/server/db/schema';
import { MAX_UPLOAD_BYTES } from '$lib/csv';
import { POST } from '../../src/routes/api/v1/flights/+server';
import { apiEvent, makeClub, makeUser, sample, steadyFile, tableCounts, upload, type Club } from './upload-fixture';

let club: Club;
beforeAll(async () => {
	club = await makeClub('Errors Club');
});

const HEADER = 'time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm';
const t = (s: number) => new Date(Date.UTC(2026, 4, 20, 9, 0, s)).toISOString();
const good = (s: number) => `${t(s)},8.5,100,40`;

/** Uploads and checks that not a single row was added anywhere. */
async function refused(body: string | Uint8Array, o: { declaration?: string; amount?: string; aircraftId?: string; fields?: Record<string, string> } = {}) {
	const before = await tableCounts();
	const res = await upload(club.pilot, { aircraftId: o.aircraftId ?? club.trainer.id, file: body, declaration: o.declaration, amount: o.amount, fields: o.fields });
	expect(await tableCounts()).toEqual(before);
	return res;
}

describe('bad files: the problems by line, and nothing stored', () => {
	it('the deliberately broken demo file', async () => {
		const res = await refused(sample('kestrel-broken.csv'));
		expect(res.status).toBe(400);
		expect(res.body.outcome).toBe('rejected');
		expect(res.body.problemCount).toBe(7);
		expect(res.body.problems.map((p: { line: number; column: string }) => [p.line, p.column])).toEqual([
			[15, ''],
			[61, 'time_utc'],
			[96, 'fuel_flow_usgph'],
			[131, 'ground_speed_kt'],
			[171, 'time_utc'],
			[201, 'distance_to_go_nm'],
			[241, '']
		]);
		expect(res.body.problems[2]).toMatchObject({ value: '-3.20', message: 'Negative fuel flow: -3.20 US gal/h.' });
		expect(res.body.detail).toMatch(/not stored: 7 problems/);
	});

	it('each kind of problem on its own', async () => {
		const cases: [string, string[], number, string, RegExp][] = [
			['malformed number', [good(0), `${t(1)},8.x,100,40`], 3, 'fuel_flow_usgph', /Malformed fuel flow/],
			['time backwards', [good(0), good(5), good(2)], 4, 'time_utc', /goes backwards/],
			['time repeated', [good(0), good(0)], 3, 'time_utc', /repeats/],
			['negative flow', [good(0), `${t(1)},-1,100,40`], 3, 'fuel_flow_usgph', /Negative/],
			// 140 US gal/h is 530 L/h, above the 500 L/h limit for a piston single.
			['absurd flow', [good(0), `${t(1)},140,100,40`], 3, 'fuel_flow_usgph', /limit is 500 L\/h/],
			['absurd speed', [good(0), `${t(1)},8,401,40`], 3, 'ground_speed_kt', /limit is 400 kt/],
			['time without zone', [good(0), `2026-05-20T09:00:01,8,100,40`], 3, 'time_utc', /no zone/],
			['missing field', [good(0), `${t(1)},8,100`], 3, '', /3 fields; the header has 4/]
		];
		for (const [what, rows, line, column, message] of cases) {
			const res = await refused([HEADER, ...rows].join('\n') + '\n');
			expect(res.status, what).toBe(400);
			expect(res.body.problems[0], what).toMatchObject({ line, column });
			expect(res.body.problems[0].message, what).toMatch(message);
		}
	});

	it('counts every problem but lists the first 50', async () => {
		const rows = [good(0)];
		for (let i = 1; i <= 300; i++) rows.push(`${t(i)},-1,100,40`);
		const res = await refused([HEADER, ...rows].join('\n'));
		expect(res.body.problemCount).toBe(300);
		expect(res.body.problems).toHaveLength(50);
		expect(res.body.problems[49].line).toBe(52);
	});

	it('columns that are neither our format nor a saved profile', async () => {
		const res = await refused(sample('kestrel-diesel-panel-log.csv'), { aircraftId: club.diesel.id });
		expect(res.status).toBe(400);
		expect(res.body.problems[0].line).toBe(2);
		expect(res.body.problems[0].message).toMatch(/Not a Burndown recorder CSV header.*No import profile/);
	});

	it('bytes that are not text', async () => {
		const res = await refused(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0xff, 0xfe, 0x00, 0x81, 0x0a]));
		expect(res.status).toBe(400);
		expect(res.body.problems[0].message).toMatch(/not UTF-8/);
	});

	it('an empty file, and a file with the header only', async () => {
		expect((await refused('')).body.problems[0].message).toMatch(/empty/);
		expect((await refused(HEADER + '\n')).body.problems[0].message).toMatch(/no samples/);
	});
});

describe('the size limit', () => {
	it('refuses at once a request that says it is too large', async () => {
		const before = await tableCounts();
		const req = new Request('http://127.0.0.1:4173/api/v1/flights?aircraftId=' + club.trainer.id + '&declaration=full', {
			method: 'POST',
			body: 'x',
			headers: { 'content-type': 'text/csv', 'content-length': String(MAX_UPLOAD_BYTES + 1) }
		});
		const res = await POST(apiEvent(req, club.pilot) as never);
		expect(res.status).toBe(413);
		expect((await res.json()).detail).toMatch(/larger than the 100 MB limit/);
		expect(await tableCounts()).toEqual(before);
	});

	it('counts the bytes while they stream in, when no length was announced', async () => {
		// 100 MB + a little of lines that each fail, so the parser only counts them; no Content-Length.
		const line = new TextEncoder().encode(`${t(1)},-1,100,40\n`.padEnd(1024, ' ').slice(0, 1023) + '\n');
		let sent = 0;
		const body = new ReadableStream<Uint8Array>({
			pull(controller) {
				if (sent === 0) controller.enqueue(new TextEncoder().encode(`${HEADER}\n${good(0)}\n`));
				const block = new Uint8Array(line.length * 256);
				for (let i = 0; i < 256; i++) block.set(line, i * line.length);
				controller.enqueue(block);
				sent += block.length;
				if (sent > MAX_UPLOAD_BYTES + (2 << 20)) controller.close();
			}
		});
		const before = await tableCounts();
		const req = new Request(`http://127.0.0.1:4173/api/v1/flights?aircraftId=${club.trainer.id}&declaration=full`, { method: 'POST', body, headers: { 'content-type': 'text/csv' }, duplex: 'half' } as RequestInit);
		const res = await POST(apiEvent(req, club.pilot) as never);
		expect(res.status).toBe(413);
		const answer = await res.json();
		expect(answer).toMatchObject({ outcome: 'tooLarge', status: 413, field: 'file', limitBytes: MAX_UPLOAD_BYTES });
		expect(await tableCounts()).toEqual(before);
	}, 60_000);

	it('rolls back when the upload is cut off half way', async () => {
		const text = steadyFile({ start: Date.UTC(2026, 4, 21, 9), seconds: 5000, flowUsgph: 8 });
		const body = new ReadableStream<Uint8Array>({
			start(controller) {
				controller.enqueue(new TextEncoder().encode(text.slice(0, 100_000)));
				controller.error(new Error('connection reset'));
			}
		});
		const before = await tableCounts();
		const req = new Request(`http://127.0.0.1:4173/api/v1/flights?aircraftId=${club.trainer.id}&declaration=full`, { method: 'POST', body, headers: { 'content-type': 'text/csv' }, duplex: 'half' } as RequestInit);
		// The client's connection failed: a 400 for whoever is still listening, not a server error.
		const res = await POST(apiEvent(req, club.pilot) as never);
		expect(res.status).toBe(400);
		expect((await res.json()).detail).toMatch(/interrupted before the file ended \(connection reset\)/);
		expect(await tableCounts()).toEqual(before);
		// The pool is not left with a broken connection: the next upload works.
		const ok = await upload(club.pilot, { aircraftId: club.trainer.id, file: text });
		expect(ok.status).toBe(201);
	});
});

describe('declarations that cannot be right', () => {
	const file = (day: number) => steadyFile({ start: Date.UTC(2026, 5, day, 9), seconds: 60, flowUsgph: 8 });

	it('refuses more than the tanks hold, or removing fuel that was not there', async () => {
		await db.update(aircraft).set({ lastOnBoardL: 50 }).where(eq(aircraft.id, club.trainer.id));
		const over = await refused(file(1), { declaration: 'onBoard', amount: '41' });
		expect(over).toMatchObject({ status: 400, body: { outcome: 'invalid', status: 400, field: 'declaration' } });
		expect(over.body.detail).toMatch(/41 US gal is more than the usable capacity \(40 US gal\)/);
		const removed = await refused(file(1), { declaration: 'removed', amount: '20' });
		expect(removed.body.detail).toMatch(/Only 13.2 US gal was on board/);
		const added = await refused(file(1), { declaration: 'added', amount: '30' });
		expect(added.body.detail).toMatch(/more than the usable capacity/);
	});

	it('refuses "unchanged" when nobody knows what was left', async () => {
		const res = await refused(file(2), { declaration: 'unchanged', aircraftId: club.tourer.id });
		expect(res.body).toMatchObject({ outcome: 'invalid', field: 'declaration' });
		expect(res.body.detail).toMatch(/not known; declare the amount on board/);
	});

	it('names the field that is missing or wrong before reading the file', async () => {
		const res = await refused(file(3), { declaration: 'onBoard' });
		expect(res.body).toMatchObject({ outcome: 'invalid', field: 'amount', errors: [{ field: 'amount', detail: 'Enter the amount.' }] });
		const bad = await refused(file(3), { declaration: 'sloshing' });
		expect(bad.body.field).toBe('declaration');
	});

	it('refuses a recording that overlaps another flight of the aircraft', async () => {
		const a = await upload(club.pilot, { aircraftId: club.tourer.id, file: steadyFile({ start: Date.UTC(2026, 5, 10, 9), seconds: 3600, flowUsgph: 12 }) });
		expect(a.status).toBe(201);
		const res = await refused(steadyFile({ start: Date.UTC(2026, 5, 10, 9, 30), seconds: 3600, flowUsgph: 12 }), { aircraftId: club.tourer.id });
		expect(res.status).toBe(409);
		expect(res.body.detail).toMatch(/overlaps another flight of BD-TTT/);
	});
});

describe('who may upload', () => {
	const file = steadyFile({ start: Date.UTC(2026, 6, 1, 9), seconds: 60, flowUsgph: 8 });

	it('a member of another organisation gets 404, as for an aircraft that does not exist', async () => {
		const other = await makeClub('Other Club');
		const before = await tableCounts();
		const res = await upload(other.pilot, { aircraftId: club.trainer.id, file });
		expect(res).toMatchObject({ status: 404, body: { outcome: 'invalid', status: 404, field: 'aircraftId', detail: 'Aircraft not found.' } });
		const none = await upload(club.pilot, { aircraftId: '00000000-0000-4000-8000-000000000000', file });
		expect(none).toMatchObject({ status: 404, body: { detail: 'Aircraft not found.' } });
		expect(await tableCounts()).toEqual(before);
	});

	it('a viewer gets 403, nobody signed in 401, an archived aircraft 409', async () => {
		expect((await upload(club.viewer, { aircraftId: club.trainer.id, file })).status).toBe(403);
		expect((await upload(null, { aircraftId: club.trainer.id, file })).status).toBe(401);
		const stranger = await makeUser('Not A Member');
		expect((await upload(stranger, { aircraftId: club.trainer.id, file })).status).toBe(404);
		await db.update(aircraft).set({ archivedAt: new Date() }).where(eq(aircraft.id, club.diesel.id));
		const res = await upload(club.pilot, { aircraftId: club.diesel.id, file });
		expect(res).toMatchObject({ status: 409, body: { field: 'aircraftId' } });
		await db.update(aircraft).set({ archivedAt: null }).where(eq(aircraft.id, club.diesel.id));
	});
});
