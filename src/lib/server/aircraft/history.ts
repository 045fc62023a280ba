// An aircraft's fuel history for its owner: every closed flight with its stored per-flight and
// per-phase figures (never samples), filtered, sorted and paged in SQL; the baseline learned from
// its recent flights (or set by hand); and each flight on the page judged by the high-burn finder.
import { and, asc, count, desc, eq, gte, inArray, lt, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import {
	BASELINE_PHASES,
	DEFAULT_BASELINE_FLIGHTS,
	DEFAULT_HIGH_BURN_PERCENT,
	findHighBurn,
	learnBaseline,
	type Baseline,
	type FlightVerdict,
	type BaselineFlight,
	type BaselinePhase,
	type PhaseFigures
} from '$lib/fuel';
import { can } from '$lib/permissions';
import { HISTORY_PER_PAGE, type BurnSettingsInput, type HistoryQuery, type HistorySort, type UnusualInput } from '$lib/schemas/history';
import type { BurnSettingsView, HistoryPage, HistoryPhase, HistoryRow, TrendPoint } from '$lib/wire/history';
import { db } from '../db';
import { aircraft, aircraftBurnSettings, flightFigures, flightPhaseFigures, flights, flightUnusualMarks, users } from '../db/schema';
import { visibleFlights, type ListViewer } from '../flights/list';
import { reconciliationOf } from '../calibration/receipts';

/** Flights read to learn the baseline: the newest usual ones plus room for those marked unusual. */
const BASELINE_READ = DEFAULT_BASELINE_FLIGHTS * 5;

const sortPhase = alias(flightPhaseFigures, 'sort_phase');
const SORT_COLUMNS: Record<HistorySort, SQL | typeof flights.startedAt> = {
	date: flights.startedAt,
	pilot: sql`${users.name}`,
	engine: sql`${flightFigures.engineTimeS}`,
	used: sql`${flightFigures.fuelUsedL}`,
	perHour: sql`${flightFigures.fuelPerEngineHourLph}`,
	range: sql`${flightFigures.cruiseSpecificRangeNmPerL}`,
	taxi: sql`${sortPhase.averageFlowLph}`,
	climb: sql`${sortPhase.averageFlowLph}`,
	cruise: sql`${sortPhase.averageFlowLph}`,
	descent: sql`${sortPhase.averageFlowLph}`
};
const isPhaseSort = (s: HistorySort): s is BaselinePhase => (BASELINE_PHASES as readonly string[]).includes(s);

export async function phasesOf(ids: string[]): Promise<Map<string, PhaseFigures[]>> {
	const out = new Map<string, PhaseFigures[]>();
	if (ids.length === 0) return out;
	const rows = await db.select().from(flightPhaseFigures).where(inArray(flightPhaseFigures.flightId, ids));
	for (const r of rows) {
		const list = out.get(r.flightId) ?? [];
		list.push({ phase: r.phase, timeS: r.timeS, fuelL: r.fuelL, averageFlowLph: r.averageFlowLph });
		out.set(r.flightId, list);
	}
	return out;
}

export async function burnSettingsOf(aircraftId: string): Promise<BurnSettingsView> {
	const [s] = await db.select().from(aircraftBurnSettings).where(eq(aircraftBurnSettings.aircraftId, aircraftId));
	return {
		thresholdPercent: s?.thresholdPercent ?? DEFAULT_HIGH_BURN_PERCENT,
		thresholdIsDefault: s?.thresholdPercent === null || s?.thresholdPercent === undefined,
		manual: {
			taxi: s?.manualTaxiLph ?? null,
			climb: s?.manualClimbLph ?? null,
			cruise: s?.manualCruiseLph ?? null,
			descent: s?.manualDescentLph ?? null
		}
	};
}

/**
 * The aircraft's baseline from its newest closed flights (every flight of the aircraft, whoever
 * flew it: the baseline is a property of the aircraft, and only medians of it are shown).
 */
export async function aircraftBaseline(aircraftId: string, settings?: BurnSettingsView): Promise<Baseline> {
	const s = settings ?? (await burnSettingsOf(aircraftId));
	const [a] = await db.select({ cruise: aircraft.baselineCruiseLph }).from(aircraft).where(eq(aircraft.id, aircraftId));
	const recent = await db
		.select({ id: flights.id, perHour: flightFigures.fuelPerEngineHourLph, unusual: flightUnusualMarks.flightId })
		.from(flights)
		.innerJoin(flightFigures, eq(flightFigures.flightId, flights.id))
		.leftJoin(flightUnusualMarks, eq(flightUnusualMarks.flightId, flights.id))
		.where(eq(flights.aircraftId, aircraftId))
		.orderBy(desc(flights.startedAt), asc(flights.id))
		.limit(BASELINE_READ);
	const phases = await phasesOf(recent.map((r) => r.id));
	const input: BaselineFlight[] = recent.map((r) => ({ id: r.id, phases: phases.get(r.id) ?? [], fuelPerEngineHourLph: r.perHour, unusual: r.unusual !== null }));
	return learnBaseline(input, { manual: s.manual, fallback: { cruise: a?.cruise ?? null } });
}

function filtersOf(v: ListViewer, aircraftId: string, q: HistoryQuery): SQL {
	const filters: SQL[] = [visibleFlights(v), eq(flights.aircraftId, aircraftId)];
	if (q.pilot) filters.push(eq(flights.pilotId, q.pilot));
	if (q.from) filters.push(gte(flights.startedAt, new Date(`${q.from}T00:00:00Z`)));
	if (q.to) filters.push(lt(flights.startedAt, new Date(Date.parse(`${q.to}T00:00:00Z`) + 86_400_000)));
	return and(...filters)!;
}

export async function aircraftHistory(v: ListViewer, aircraftId: string, q: HistoryQuery): Promise<HistoryPage> {
	const where = filtersOf(v, aircraftId, q);
	const dir = q.dir ?? (q.sort === 'pilot' ? 'asc' : 'desc');
	const key = SORT_COLUMNS[q.sort];
	const order = dir === 'asc' ? sql`${key} asc nulls last` : sql`${key} desc nulls last`;
	const phaseJoin = isPhaseSort(q.sort) ? and(eq(sortPhase.flightId, flights.id), eq(sortPhase.phase, q.sort)) : sql`false`;

	const settings = await burnSettingsOf(aircraftId);
	const [[{ total }], rows, trendRows, baseline, pilots, pumped] = await Promise.all([
		db.select({ total: count() }).from(flights).innerJoin(flightFigures, eq(flightFigures.flightId, flights.id)).where(where),
		db
			.select({
				id: flights.id,
				startedAt: flights.startedAt,
				title: flights.title,
				pilotId: flights.pilotId,
				pilot: users.name,
				f: flightFigures,
				unusualReason: flightUnusualMarks.reason,
				unusual: flightUnusualMarks.flightId,
				// The flight's one reserve verdict, as stored in its summary (replay and flights list read it too).
				verdict: sql<FlightVerdict | null>`${flights.summary}->'verdict'`
			})
			.from(flights)
			.innerJoin(flightFigures, eq(flightFigures.flightId, flights.id))
			.leftJoin(users, eq(users.id, flights.pilotId))
			.leftJoin(flightUnusualMarks, eq(flightUnusualMarks.flightId, flights.id))
			.leftJoin(sortPhase, phaseJoin)
			.where(where)
			// The id breaks ties so pages never repeat or skip a flight.
			.orderBy(order, desc(flights.startedAt), asc(flights.id))
			.limit(HISTORY_PER_PAGE)
			.offset((q.page - 1) * HISTORY_PER_PAGE),
		db
			.select({
				t: sql<number>`extract(epoch from ${flights.startedAt})::float8`,
				perHour: flightFigures.fuelPerEngineHourLph,
				cruise: flightPhaseFigures.averageFlowLph
			})
			.from(flights)
			.innerJoin(flightFigures, eq(flightFigures.flightId, flights.id))
			.leftJoin(flightPhaseFigures, and(eq(flightPhaseFigures.flightId, flights.id), eq(flightPhaseFigures.phase, 'cruise')))
			.where(where)
			.orderBy(asc(flights.startedAt), asc(flights.id)),
		aircraftBaseline(aircraftId, settings),
		can(v.role, 'viewAllFlights')
			? db
					.selectDistinct({ id: users.id, name: users.name })
					.from(flights)
					.innerJoin(users, eq(users.id, flights.pilotId))
					.where(eq(flights.aircraftId, aircraftId))
					.orderBy(asc(users.name))
			: Promise.resolve([]),
		// Computed fuel against fuel pumped over the newest fill-up windows: a cause for every flight
		// while it persists (the sensor or a leak concerns the aircraft, not one flight).
		db
			.select()
			.from(aircraft)
			.where(eq(aircraft.id, aircraftId))
			.then(([a]) => (a ? reconciliationOf(a) : null))
	]);

	const phases = await phasesOf(rows.map((r) => r.id));
	const out: HistoryRow[] = rows.map((r) => {
		const ph = phases.get(r.id) ?? [];
		const byPhase: Partial<Record<BaselinePhase, HistoryPhase>> = {};
		for (const p of ph) if ((BASELINE_PHASES as readonly string[]).includes(p.phase)) byPhase[p.phase as BaselinePhase] = { timeS: p.timeS, fuelL: p.fuelL, averageFlowLph: p.averageFlowLph };
		return {
			id: r.id,
			startedAt: r.startedAt,
			title: r.title,
			pilotId: r.pilotId,
			pilot: r.pilot,
			engineTimeS: r.f.engineTimeS,
			fuelUsedL: r.f.fuelUsedL,
			fuelPerEngineHourLph: r.f.fuelPerEngineHourLph,
			cruiseSpecificRangeNmPerL: r.f.cruiseSpecificRangeNmPerL,
			meterFactor: r.f.meterFactor,
			gapCount: r.f.gapCount,
			leaningMoments: r.f.leaningMoments,
			phases: byPhase,
			unusual: r.unusual !== null ? { reason: r.unusualReason ?? '' } : null,
			highBurn: findHighBurn(ph, baseline, { thresholdPercent: settings.thresholdPercent, leaningMoments: r.f.leaningMoments, pumpedOverComputed: pumped?.belowPumpedRatio ?? null }),
			reserveVerdict: r.verdict ?? null
		};
	});
	const trend: TrendPoint[] = trendRows.map((r) => ({ t: r.t, cruiseFlowLph: r.cruise, fuelPerEngineHourLph: r.perHour }));
	return {
		total,
		pages: Math.max(1, Math.ceil(total / HISTORY_PER_PAGE)),
		page: q.page,
		sort: q.sort,
		dir,
		rows: out,
		trend,
		baseline,
		settings,
		pilots,
		pumpedOverComputed: pumped?.belowPumpedRatio ?? null
	};
}

/** The owner's high-burn settings; blank fields go back to our default / the learned baseline. */
export async function saveBurnSettings(aircraftId: string, userId: string, s: BurnSettingsInput): Promise<void> {
	const values = {
		thresholdPercent: s.thresholdPercent,
		manualTaxiLph: s.manual.taxi,
		manualClimbLph: s.manual.climb,
		manualCruiseLph: s.manual.cruise,
		manualDescentLph: s.manual.descent,
		updatedBy: userId,
		updatedAt: new Date()
	};
	await db.insert(aircraftBurnSettings).values({ aircraftId, ...values }).onConflictDoUpdate({ target: aircraftBurnSettings.aircraftId, set: values });
}

/** Marks or unmarks a flight of this aircraft as unusual; false when the flight is not the aircraft's. */
export async function setUnusual(aircraftId: string, userId: string, input: UnusualInput): Promise<boolean> {
	const [f] = await db.select({ id: flights.id }).from(flights).where(and(eq(flights.id, input.flightId), eq(flights.aircraftId, aircraftId)));
	if (!f) return false;
	if (input.on)
		await db
			.insert(flightUnusualMarks)
			.values({ flightId: f.id, reason: input.reason, markedBy: userId })
			.onConflictDoUpdate({ target: flightUnusualMarks.flightId, set: { reason: input.reason, markedBy: userId, markedAt: new Date() } });
	else await db.delete(flightUnusualMarks).where(eq(flightUnusualMarks.flightId, f.id));
	return true;
}
