// The aircraft's reserve rule as stored: a write of an id that is not one of ours is refused and
// stores nothing; a stored one that is not ours anyway (an older row, a hand edit) reads as null,
// "unknown rule", and the replay page, the samples API and the stored summary carry on without a
// reserve instead of failing.
import { beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, memberships, organisations, users } from '$lib/server/db/schema';
import type { ReserveRuleId } from '$lib/fuel';
import type { JsonPayload } from '$lib/wire/replay';
import { loadFlight } from '$lib/server/flights/load';
import { recomputeSummary } from '$lib/server/flights/summary';
import { GET as samplesGet } from '../../src/routes/api/v1/flights/[id]/samples/+server';
import { load as flightLoad } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { routeEvent } from './route-event';
import { generateFlight, insertFlight } from './replay-fixture';

const stamp = Date.now().toString(36);
const admin = { id: `rr-admin-${stamp}`, email: `rr-admin-${stamp}@kestrel-test.example`, name: 'Rule Admin' };
const user = { ...admin, prefFuelUnit: null, timeZone: null };
let orgId = '';
let slug = '';
let aircraftId = '';
let flightId = '';
const plane = (registration: string, reserveRule: ReserveRuleId) => ({
	orgId,
	registration,
	type: 'Four-seat trainer',
	fuelType: 'avgas' as const,
	densityKgPerL: 0.719,
	capacityL: 150,
	displayUnit: 'l' as const,
	reserveRule,
	baselineCruiseLph: 30
});

beforeAll(async () => {
	await db.insert(users).values({ ...admin, passwordHash: 'not-a-real-hash' });
	slug = `rule-${stamp}`;
	const [org] = await db.insert(organisations).values({ name: 'Rule Club', slug }).returning();
	orgId = org.id;
	await db.insert(memberships).values({ orgId, userId: admin.id, role: 'admin' });
	const [a] = await db.insert(aircraft).values(plane('RR-ONE', 'faa-91.151-vfr-day')).returning();
	aircraftId = a.id;
	flightId = await insertFlight(pool, { orgId, aircraftId, pilotId: admin.id, declaration: { kind: 'onBoard', amountL: 120 } }, generateFlight({ start: Date.UTC(2025, 5, 1, 9) / 1000 }));
	await recomputeSummary(flightId);
});

const countOf = async () => (await db.select({ id: aircraft.id }).from(aircraft).where(eq(aircraft.orgId, orgId))).length;

describe('refused at write', () => {
	it('an insert with an unknown rule fails and stores nothing', async () => {
		const before = await countOf();
		await expect(db.insert(aircraft).values(plane('RR-BAD', 'faa-night' as ReserveRuleId))).rejects.toThrow();
		expect(await countOf()).toBe(before);
	});

	it('an update to an unknown rule fails and keeps the stored one', async () => {
		await expect(db.update(aircraft).set({ reserveRule: 'faa-night' as ReserveRuleId }).where(eq(aircraft.id, aircraftId))).rejects.toThrow();
		const [a] = await db.select({ reserveRule: aircraft.reserveRule }).from(aircraft).where(eq(aircraft.id, aircraftId));
		expect(a.reserveRule).toBe('faa-91.151-vfr-day');
	});
});

describe('read with a clear fallback', () => {
	beforeAll(async () => {
		// As an older row or a hand edit could leave it: past the application, straight in SQL.
		await db.execute(sql`update aircraft set reserve_rule = 'faa-night' where id = ${aircraftId}`);
	});

	it('reads as null, the unknown rule', async () => {
		const loaded = await loadFlight(flightId);
		expect(loaded?.aircraft.reserveRule).toBeNull();
	});

	it('the summary is recomputed without a reserve, not an error', async () => {
		const summary = await recomputeSummary(flightId);
		expect(summary).not.toBeNull();
		expect(summary!.reserve).toBeNull();
		expect(summary!.fuelUsedL).toBeGreaterThan(0);
	});

	it('the replay page loads and the samples API answers, with the rule as null', async () => {
		const data = (await flightLoad(routeEvent(user, '/o/[org]/flights/[id]', { org: slug, id: flightId }) as never)) as { setup: { reserveRule: unknown } };
		expect(data.setup.reserveRule).toBeNull();
		const res = (await samplesGet(routeEvent(user, '/api/v1/flights/[id]/samples', { id: flightId }) as never)) as Response;
		expect(res.status).toBe(200);
		const body = (await res.json()) as JsonPayload;
		expect(body.setup.reserveRule).toBeNull();
	});
});
