// The reserve verdict as stored and listed: each flight's summary says whether it landed with the
// reserve (14 CFR 91.151(a)(1): 30 min at normal cruise), the flights list filters and sorts by
// it, and an aircraft without a set normal-cruise flow takes its recent flights' median cruise.
import { beforeAll, describe, expect, it } from 'vitest';
import { db, pool } from '$lib/server/db';
import { aircraft, memberships, organisations, users } from '$lib/server/db/schema';
import type { FlightSummary } from '$lib/fuel';
import { listFlights } from '$lib/server/flights/list';
import { loadFlight } from '$lib/server/flights/load';
import { median, recentCruiseFlowLph } from '$lib/server/flights/recent-cruise';
import { recomputeSummary } from '$lib/server/flights/summary';
import { flightListQuerySchema } from '$lib/schemas/flight';
import { generateFlight, insertFlight } from './replay-fixture';

const stamp = Date.now().toString(36);
const admin = { id: `rv-admin-${stamp}`, email: `rv-admin-${stamp}@kestrel-test.example`, name: 'Verdict Admin' };
let orgId = '';
let aircraftId = '';
const ids: Record<'low' | 'full' | 'later', string> = { low: '', full: '', later: '' };
const summaries: Record<string, FlightSummary> = {};

beforeAll(async () => {
	await db.insert(users).values({ ...admin, passwordHash: 'not-a-real-hash' });
	const [org] = await db.insert(organisations).values({ name: 'Verdict Club', slug: `verdict-${stamp}` }).returning();
	orgId = org.id;
	await db.insert(memberships).values({ orgId, userId: admin.id, role: 'admin' });
	// No normal-cruise flow set: the reserve rests on each flight's measured cruise.
	const [a] = await db
		.insert(aircraft)
		.values({ orgId, registration: 'RV-ONE', type: 'Four-seat trainer', fuelType: 'avgas', densityKgPerL: 0.719, capacityL: 150, lowerLevelL: 100, displayUnit: 'l', reserveRule: 'faa-91.151-vfr-day', baselineCruiseLph: null })
		.returning();
	aircraftId = a.id;
	// The fixture flight uses about 43 L (cruise at 30.5 L/h); 50 L declared lands below the
	// 15.25 L reserve, 120 L lands well above it.
	const day = (d: number) => Date.UTC(2025, 4, d, 9, 0, 0) / 1000;
	ids.low = await insertFlight(pool, { orgId, aircraftId, pilotId: admin.id, declaration: { kind: 'onBoard', amountL: 50 } }, generateFlight({ start: day(10) }));
	ids.full = await insertFlight(pool, { orgId, aircraftId, pilotId: admin.id, declaration: { kind: 'onBoard', amountL: 120 } }, generateFlight({ start: day(11) }));
	ids.later = await insertFlight(pool, { orgId, aircraftId, pilotId: admin.id, declaration: { kind: 'onBoard', amountL: 120 } }, generateFlight({ start: day(12), cruiseS: 120 }));
	for (const id of Object.values(ids)) summaries[id] = (await recomputeSummary(id))!;
});

describe('stored verdict', () => {
	it('says whether each flight landed with the reserve', () => {
		const low = summaries[ids.low].verdict!;
		const full = summaries[ids.full].verdict!;
		expect(low.state).toBe('notKept');
		expect(full.state).toBe('kept');
		// The margin is the landed fuel less the reserve amount (30 min at the measured cruise).
		const reserve = summaries[ids.low].reserve!;
		expect(reserve.basis).toBe('measured');
		expect(reserve.amountL).toBeCloseTo(15.25, 1);
		expect(low.marginL).toBeCloseTo(low.landedL - reserve.amountL!, 9);
		expect(low.marginMin).toBeCloseTo((low.marginL! / reserve.flowLph!) * 60, 9);
	});

	it('lists only the flights of a verdict, and sorts by the landed margin', async () => {
		const viewer = { orgId, userId: admin.id, role: 'admin' as const };
		const below = await listFlights(viewer, flightListQuerySchema.parse({ verdict: 'notKept' }));
		expect(below.flights.map((f) => f.id)).toEqual([ids.low]);
		const kept = await listFlights(viewer, flightListQuerySchema.parse({ verdict: 'kept' }));
		expect(kept.flights.map((f) => f.id).sort()).toEqual([ids.full, ids.later].sort());
		const byMargin = await listFlights(viewer, flightListQuerySchema.parse({ sort: 'margin', dir: 'asc' }));
		expect(byMargin.flights[0].id).toBe(ids.low);
		// An unknown verdict in the address is ignored, not an error.
		expect(flightListQuerySchema.parse({ verdict: 'maybe' }).verdict).toBeUndefined();
	});
});

describe('recent median cruise', () => {
	it('is the median of the earlier flights’ measured cruise flows', async () => {
		const later = await loadFlight(ids.later);
		const expected = median([summaries[ids.low].cruiseFlowLph!, summaries[ids.full].cruiseFlowLph!]);
		expect(expected).not.toBeNull();
		expect(later!.setup.recentCruiseLph).toBeCloseTo(expected!, 12);
		expect(await recentCruiseFlowLph(aircraftId, { id: ids.low, startedAt: new Date(Date.UTC(2025, 4, 10, 9)) })).toBeNull();
	});

	it('gives a flight with too little cruise of its own a reserve on that basis', () => {
		// Two minutes of cruise: under the five minutes a measured cruise needs.
		const s = summaries[ids.later];
		expect(s.reserve!.basis).toBe('recent');
		expect(s.verdict!.state).toBe('kept');
	});

	it('takes the middle value', () => {
		expect(median([30, 10, 20])).toBe(20);
		expect(median([10, 20, 30, 40])).toBe(25);
		expect(median([])).toBeNull();
	});
});

describe('alarm e-mail', () => {
	it('says "left on arrival" for the fuel at the waypoint, and compares it with the reserve amount', async () => {
		const { alarmMail } = await import('$lib/server/live/alarms');
		const mail = alarmMail(
			{ kind: 'arrivalBelowReserve', t: Date.UTC(2025, 4, 10, 9, 30) / 1000, threshold: 0, onBoardL: 30, flowLph: 30, enduranceH: 1, arrivalL: 11.6, reserveL: 15, cruiseFlowLph: 30, arrivalMarginMin: -6.8, waypoint: 'TALLY' },
			{ registration: 'RV-ONE', displayUnit: 'l', densityKgPerL: 0.719, url: 'http://example.invalid/live' }
		);
		expect(mail.subject).toBe('Burndown alarm: arrives below the reserve at the next waypoint on RV-ONE');
		expect(mail.text).toMatch(/\(below the reserve of 15\.0 L\)/);
		expect(mail.text).toMatch(/Left on arrival: +11\.6 L \(next waypoint TALLY\)/);
		// −3.4 L, −6.8 min at cruise: rounded down, so never more margin than exists.
		expect(mail.text).toMatch(/Against the reserve: +−3\.4 L, −7 min at normal cruise/);
		expect(mail.text).not.toMatch(/Reserve at waypoint/);
	});
});
