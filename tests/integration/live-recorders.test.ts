// Recorder tokens as the admin page manages them: registered with a token shown once and stored
// as a hash, rotated (the old token refused from then on, the flights stay the recorder's),
// revoked, and the last contact recorded. The page's own role checks are in the e2e role matrix.
import { beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights, recorders } from '$lib/server/db/schema';
import { hashToken } from '$lib/server/tokens';
import { listRecorders, registerRecorder, revokeRecorder, rotateRecorder } from '$lib/server/live/recorders';
import { call, liveWorld, samples, type LiveWorld } from './live-fixtures';

let w: LiveWorld;
beforeAll(async () => {
	w = await liveWorld();
});

describe('recorders', () => {
	it('registers a recorder whose token is stored only as a hash and works at once', async () => {
		const made = await registerRecorder(w.orgId, w.aircraftA, 'Tablet in the door pocket');
		if ('error' in made) throw new Error(made.error);
		expect(made.token).toMatch(/^bdr_[A-Za-z0-9_-]{32}$/);
		const [row] = await db.select().from(recorders).where(eq(recorders.id, made.id));
		expect(row.tokenHash).toBe(hashToken(made.token));
		expect(JSON.stringify(row)).not.toContain(made.token);
		expect(made.token.startsWith(row.tokenHint)).toBe(true);
		expect(row.tokenHint.length).toBeLessThan(12);
		expect(row.lastContactAt).toBeNull();

		const r = await call('samples', made.token, { samples: samples(0, 3) });
		expect(r.status).toBe(200);
		const listed = (await listRecorders(w.orgId)).find((x) => x.id === made.id);
		expect(listed?.lastContactAt).toBeInstanceOf(Date);
		expect(listed?.registration).toBe('BD-LVA');
		await call('close', made.token, {});
	});

	it('refuses an aircraft of another organisation', async () => {
		const other = await liveWorld();
		const made = await registerRecorder(w.orgId, other.aircraftA, 'stray');
		expect(made).toMatchObject({ field: 'aircraftId' });
	});

	it('rotates: the old token is refused, the new one writes to the same recorder', async () => {
		const made = await registerRecorder(w.orgId, w.aircraftB, 'Panel recorder (spare)');
		if ('error' in made) throw new Error(made.error);
		const before = await call('samples', made.token, { samples: samples(0, 3) });
		const fresh = await rotateRecorder(w.orgId, made.id);
		expect(fresh).not.toBeNull();
		expect(fresh).not.toBe(made.token);
		expect((await call('samples', made.token, { flightId: before.body.flightId, samples: samples(3, 3) })).status).toBe(401);
		const after = await call('samples', fresh!, { flightId: before.body.flightId, samples: samples(3, 3) });
		expect(after.status).toBe(200);
		expect(after.body.ack).toBe(5);
		const [f] = await db.select().from(flights).where(eq(flights.id, before.body.flightId));
		expect(f.recorderId).toBe(made.id);
		// Another organisation cannot rotate or revoke it.
		expect(await rotateRecorder((await liveWorld()).orgId, made.id)).toBeNull();
		await call('close', fresh!, {});
	});

	it('revokes: the token is refused and a revoked recorder cannot be rotated back', async () => {
		const made = await registerRecorder(w.orgId, w.aircraftA, 'Old tablet');
		if ('error' in made) throw new Error(made.error);
		expect(await revokeRecorder(w.orgId, made.id)).toBe(true);
		expect(await revokeRecorder(w.orgId, made.id)).toBe(false);
		expect((await call('samples', made.token, { samples: samples(0, 2) })).status).toBe(401);
		expect(await rotateRecorder(w.orgId, made.id)).toBeNull();
		const listed = (await listRecorders(w.orgId)).find((x) => x.id === made.id);
		expect(listed?.revokedAt).toBeInstanceOf(Date);
	});
});
