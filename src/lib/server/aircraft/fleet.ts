// The fleet view: every aircraft of the organisation side by side for one calendar month (UTC),
// from the stored per-flight and per-phase figures (never samples) — hours, fuel, fuel per engine
// hour against the aircraft's usual band, the flights the high-burn finder marks — and the
// calibration in force with when the sensor was last checked.
import { and, count, eq, gte, inArray, lt, max, notInArray } from 'drizzle-orm';
import { bandPosition, findHighBurn, usualBand } from '$lib/fuel';
import { can } from '$lib/permissions';
import { monthOf, monthRange, type FleetQuery } from '$lib/schemas/fleet';
import type { FleetRow, FleetView } from '$lib/wire/fleet';
import { db } from '../db';
import { calibrations, flightFigures, flights, pumpReceipts } from '../db/schema';
import { visibleFlights, type ListViewer } from '../flights/list';
import { listAircraft } from '../services/aircraft';
import { aircraftBaseline, burnSettingsOf, phasesOf } from './history';

/** Calibration entries that are not a check of the sensor: the factors kept from before dated history, and a range's end. */
const NOT_A_CHECK = ['initial', 'rangeEnd'] as const;

export async function fleetView(v: ListViewer, q: FleetQuery): Promise<FleetView> {
	const planes = await listAircraft(v.orgId, { includeArchived: q.archived === '1' });
	const ids = planes.map((a) => a.id);
	if (ids.length === 0) return { month: q.month, allFlights: can(v.role, 'viewAllFlights'), rows: [], latestFlightMonth: null };
	const { from, to } = monthRange(q.month);

	const [monthFlights, fills, entries, latest] = await Promise.all([
		db
			.select({ id: flights.id, aircraftId: flights.aircraftId, engineTimeS: flightFigures.engineTimeS, fuelUsedL: flightFigures.fuelUsedL })
			.from(flights)
			.innerJoin(flightFigures, eq(flightFigures.flightId, flights.id))
			.where(and(visibleFlights(v), inArray(flights.aircraftId, ids), gte(flights.startedAt, from), lt(flights.startedAt, to))),
		// A reconciliation needs two fills to full; the newer one is when it was made.
		db
			.select({ aircraftId: pumpReceipts.aircraftId, n: count(), at: max(pumpReceipts.at) })
			.from(pumpReceipts)
			.where(and(inArray(pumpReceipts.aircraftId, ids), eq(pumpReceipts.filledToFull, true)))
			.groupBy(pumpReceipts.aircraftId),
		db
			.select({ aircraftId: calibrations.aircraftId, at: max(calibrations.createdAt) })
			.from(calibrations)
			.where(and(inArray(calibrations.aircraftId, ids), notInArray(calibrations.source, [...NOT_A_CHECK])))
			.groupBy(calibrations.aircraftId),
		// So an empty month can point to where the flights are.
		db
			.select({ at: max(flights.startedAt) })
			.from(flights)
			.innerJoin(flightFigures, eq(flightFigures.flightId, flights.id))
			.where(and(visibleFlights(v), inArray(flights.aircraftId, ids)))
	]);
	const latestAt = latest[0]?.at ?? null;
	const phases = await phasesOf(monthFlights.map((f) => f.id));
	const judged = await Promise.all(
		planes.map(async (a) => {
			const settings = await burnSettingsOf(a.id);
			return { settings, baseline: await aircraftBaseline(a.id, settings) };
		})
	);

	const rows: FleetRow[] = planes.map((a, i) => {
		const { settings, baseline } = judged[i];
		const mine = monthFlights.filter((f) => f.aircraftId === a.id);
		const engineTimeS = mine.reduce((s, f) => s + f.engineTimeS, 0);
		const fuelUsedL = mine.reduce((s, f) => s + f.fuelUsedL, 0);
		const perHour = engineTimeS > 0 ? fuelUsedL / (engineTimeS / 3600) : null;
		const highBurnFlights = mine.filter((f) => findHighBurn(phases.get(f.id) ?? [], baseline, { thresholdPercent: settings.thresholdPercent }).marked).length;
		const fph = baseline.fuelPerEngineHour;
		const band = fph ? { ...usualBand(fph.centreLph, fph.spreadLph), flights: fph.flights } : null;
		const fill = fills.find((r) => r.aircraftId === a.id);
		const reconciledAt = fill && fill.n >= 2 ? fill.at : null;
		const calibratedAt = entries.find((r) => r.aircraftId === a.id)?.at ?? null;
		const lastChecked =
			reconciledAt && (!calibratedAt || reconciledAt >= calibratedAt)
				? { at: reconciledAt, by: 'reconciliation' as const }
				: calibratedAt
					? { at: calibratedAt, by: 'calibration' as const }
					: null;
		return {
			id: a.id,
			registration: a.registration,
			type: a.type,
			displayUnit: a.displayUnit,
			densityKgPerL: a.densityKgPerL,
			archived: a.archivedAt !== null,
			month: { flights: mine.length, engineTimeS, fuelUsedL, fuelPerEngineHourLph: perHour, highBurnFlights },
			usual: band,
			position: band && perHour !== null ? bandPosition(perHour, band) : null,
			meterFactor: a.meterFactor,
			kFactor: a.kFactor,
			lastChecked
		};
	});
	return { month: q.month, allFlights: can(v.role, 'viewAllFlights'), rows, latestFlightMonth: latestAt ? monthOf(new Date(latestAt)) : null };
}

