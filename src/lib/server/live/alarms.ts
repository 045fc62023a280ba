// Live alarms: the engine's alarm episodes written to flight_alarms (one row per crossing, so a
// retried batch or a second instance never raises one twice), and one e-mail per episode to each
// member watching the aircraft or the flight, with the figures at that moment. The engine decides
// what an episode is (persistence and hysteresis, src/lib/fuel/alarms.ts).
import { and, eq, inArray, isNull, or } from 'drizzle-orm';
import { mayOnFlight } from '../access';
import { db } from '../db';
import { aircraft, flightAlarms, flights, memberships, organisations, users, watches, type Aircraft, type Flight } from '../db/schema';
import { link, sendMail } from '../mail';
import { dateTimeText, formatDuration, fuel, fuelFlow, fuelMargin, signedMinutes } from '$lib/format';
import { alarmLabels, MARGIN_ROUNDING_NOTE } from '$lib/labels';
import type { AlarmKind } from '$lib/fuel';
import { fromLitres } from '$lib/units';
import type { Computed } from './computation';
import type { Queryable } from './samples';

export type { AlarmKind };

/** What the e-mail says about the moment an alarm was raised. */
export interface AlarmFigures {
	kind: AlarmKind;
	t: number;
	threshold: number;
	onBoardL: number;
	flowLph: number;
	enduranceH: number;
	/** Fuel left on arrival at the next waypoint, litres. */
	arrivalL: number;
	/** The reserve amount in force, litres, and the normal-cruise flow it rests on. */
	reserveL: number;
	cruiseFlowLph: number;
	/** Left on arrival − reserve, in minutes at normal-cruise flow. */
	arrivalMarginMin: number;
	waypoint: string | null;
}

export interface NewAlarm {
	id: string;
	figures: AlarmFigures;
}

const keyOf = (kind: string, raisedMs: number) => `${kind}@${raisedMs}`;

/**
 * Brings the flight's alarm rows in line with the computation. New crossings get a row; those
 * raised in the samples just added (or still raised after a recompute) are returned for e-mail.
 * A crossing that a corrected declaration made disappear is marked cleared, never deleted: it
 * was shown and perhaps e-mailed. Returns whether anything changed, for the viewers.
 */
export async function syncAlarms(q: Queryable, flight: Flight, computed: Computed): Promise<{ changed: boolean; toMail: NewAlarm[] }> {
	const r = computed.comp.result();
	const rows = await q.select().from(flightAlarms).where(eq(flightAlarms.flightId, flight.id));
	const byKey = new Map(rows.map((row) => [keyOf(row.kind, row.raisedAt.getTime()), row]));
	const seen = new Set<string>();
	const toMail: NewAlarm[] = [];
	// One e-mail per episode: a recomputed flight (a corrected declaration) can move an episode's
	// raise time; when an e-mailed row of the same kind overlaps the new one, it is the same episode.
	const mailedOverlap = (kind: string, from: number, to: number | null) =>
		rows.some((row) => row.kind === kind && row.emailedAt !== null && row.raisedAt.getTime() <= (to ?? Infinity) && (row.clearedAt?.getTime() ?? Infinity) >= from);
	let changed = false;
	const lastT = r.length > 0 ? r.stats.lastT : null;
	for (const ep of r.alarms) {
		const raisedMs = Math.round(ep.raisedAt * 1000);
		const key = keyOf(ep.kind, raisedMs);
		seen.add(key);
		const clearedAt = ep.clearedAt === null ? null : new Date(Math.round(ep.clearedAt * 1000));
		const row = byKey.get(key);
		if (!row) {
			const [inserted] = await q
				.insert(flightAlarms)
				.values({ flightId: flight.id, kind: ep.kind, raisedAt: new Date(raisedMs), clearedAt, value: ep.value })
				.onConflictDoNothing()
				.returning({ id: flightAlarms.id });
			if (!inserted) continue;
			changed = true;
			const sameEpisode = mailedOverlap(ep.kind, Math.round(ep.belowSince * 1000), ep.clearedAt === null ? null : Math.round(ep.clearedAt * 1000));
			if (!sameEpisode && (ep.clearedAt === null || ep.raisedIndex >= computed.newFrom)) {
				const i = ep.raisedIndex;
				const w = r.length > i ? computed.comp.columns().wpt?.[i] : undefined;
				toMail.push({
					id: inserted.id,
					figures: {
						kind: ep.kind,
						t: ep.raisedAt,
						threshold: ep.threshold,
						onBoardL: r.onBoard[i],
						flowLph: r.flow[i],
						enduranceH: r.endurance[i],
						arrivalL: r.arrivalL[i],
						reserveL: r.reserveL[i],
						cruiseFlowLph: r.cruiseFlow[i],
						arrivalMarginMin: r.arrivalMarginMin[i],
						waypoint: w !== undefined && w >= 0 ? (computed.waypoints[w] ?? null) : null
					}
				});
			}
		} else if ((row.clearedAt?.getTime() ?? null) !== (clearedAt?.getTime() ?? null)) {
			await q.update(flightAlarms).set({ clearedAt }).where(eq(flightAlarms.id, row.id));
			changed = true;
		}
	}
	for (const row of rows) {
		if (seen.has(keyOf(row.kind, row.raisedAt.getTime())) || row.clearedAt !== null) continue;
		await q
			.update(flightAlarms)
			.set({ clearedAt: lastT === null ? new Date() : new Date(Math.round(lastT * 1000)) })
			.where(eq(flightAlarms.id, row.id));
		changed = true;
	}
	return { changed, toMail };
}

// The words the replay and live pages use for the same alarms.
const TITLES: Record<AlarmKind, string> = alarmLabels;

/**
 * The e-mail of one alarm. `timeZone` is the recipient's preference: their local time follows the
 * UTC one (an e-mail has no browser to ask).
 */
export function alarmMail(
	a: AlarmFigures,
	ctx: { registration: string; displayUnit: Aircraft['displayUnit']; densityKgPerL: number; url: string; timeZone?: string | null }
): { subject: string; text: string } {
	const f = (l: number) => fuel(l, ctx.displayUnit, ctx.densityKgPerL);
	// Rounded down: the e-mail never shows more fuel, or more margin, than the figure it was raised on.
	const down = (l: number) => fuel(l, ctx.displayUnit, ctx.densityKgPerL, 'down');
	const flowText = (lph: number) => fuelFlow(lph, ctx.displayUnit, ctx.densityKgPerL);
	const marginOf = (l: number) => fuelMargin(fromLitres(l, ctx.displayUnit, ctx.densityKgPerL), ctx.displayUnit);
	const hasReserve = Number.isFinite(a.reserveL);
	const when = dateTimeText(a.t, ctx.timeZone ?? null, true);
	const threshold =
		a.kind === 'lowFuel'
			? `below ${f(a.threshold)}`
			: a.kind === 'lowEndurance'
				? `below ${formatDuration(a.threshold / 60)} (h:mm)`
				: hasReserve
					? `below the reserve of ${f(a.reserveL)}`
					: 'the fuel runs out first';
	const lines = [
		`${TITLES[a.kind]} on ${ctx.registration} at ${when} (${threshold}).`,
		'',
		`Fuel on board:            ${down(a.onBoardL)}`,
		`Fuel flow:                ${flowText(a.flowLph)}`,
		`Endurance at flow:        ${formatDuration(a.enduranceH, { round: 'down' })} (h:mm)`,
		`Left on arrival:          ${Number.isFinite(a.arrivalL) ? down(a.arrivalL) : '—'}${a.waypoint ? ` (next waypoint ${a.waypoint})` : ''}`,
		`Reserve amount:           ${hasReserve ? `${f(a.reserveL)} (at ${flowText(a.cruiseFlowLph)} normal cruise)` : '—'}`,
		`Against the reserve:      ${hasReserve && Number.isFinite(a.arrivalL) ? `${marginOf(a.arrivalL - a.reserveL)}${Number.isFinite(a.arrivalMarginMin) ? `, ${signedMinutes(a.arrivalMarginMin)} at normal cruise` : ''}` : '—'}`,
		MARGIN_ROUNDING_NOTE,
		'',
		`Watch the flight live: ${ctx.url}`,
		'',
		'Burndown is advisory: it does not replace checking the tanks, the flight manual or the pilot in command\'s judgement.',
		'You get this because you watch this aircraft or this flight in Burndown.'
	];
	return { subject: `Burndown alarm: ${TITLES[a.kind].toLowerCase()} on ${ctx.registration}`, text: lines.join('\n') };
}

/** Members who watch the flight or its aircraft and may see the flight. */
export async function watchersOf(flight: Flight): Promise<{ id: string; email: string; name: string; timeZone: string | null }[]> {
	const rows = await db
		.selectDistinct({ id: users.id, email: users.email, name: users.name, prefFuelUnit: users.prefFuelUnit, timeZone: users.timeZone, role: memberships.role })
		.from(watches)
		.innerJoin(users, eq(users.id, watches.userId))
		.innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.orgId, flight.orgId)))
		.where(or(eq(watches.flightId, flight.id), eq(watches.aircraftId, flight.aircraftId)));
	return rows.filter((r) => mayOnFlight({ user: { id: r.id }, role: r.role }, flight, 'view'));
}

/**
 * Sends the e-mails of alarms just committed. Each alarm is claimed first (emailed_at set where it
 * was null), so two instances, or a retry after a crash, never mail one crossing twice.
 */
export async function mailAlarms(flightId: string, alarms: readonly NewAlarm[]): Promise<number> {
	if (alarms.length === 0) return 0;
	const [row] = await db
		.select({ flight: flights, registration: aircraft.registration, displayUnit: aircraft.displayUnit, densityKgPerL: aircraft.densityKgPerL, slug: organisations.slug })
		.from(flights)
		.innerJoin(aircraft, eq(aircraft.id, flights.aircraftId))
		.innerJoin(organisations, eq(organisations.id, flights.orgId))
		.where(eq(flights.id, flightId))
		.limit(1);
	if (!row) return 0;
	const claimed = await db
		.update(flightAlarms)
		.set({ emailedAt: new Date() })
		.where(and(inArray(flightAlarms.id, alarms.map((a) => a.id)), isNull(flightAlarms.emailedAt)))
		.returning({ id: flightAlarms.id });
	const mine = new Set(claimed.map((c) => c.id));
	const recipients = mine.size > 0 ? await watchersOf(row.flight) : [];
	let sent = 0;
	const url = link(`/o/${row.slug}/flights/${flightId}/live`);
	for (const a of alarms) {
		if (!mine.has(a.id)) continue;
		for (const r of recipients) {
			const mail = alarmMail(a.figures, { registration: row.registration, displayUnit: row.displayUnit, densityKgPerL: row.densityKgPerL, url, timeZone: r.timeZone });
			try {
				await sendMail({ to: r.email, ...mail });
				sent++;
			} catch (error) {
				// At most once: the crossing stays marked as mailed; the failure is in the log.
				console.error(`[live] alarm mail to ${r.email} failed:`, (error as Error).message);
			}
		}
	}
	return sent;
}
