// The stored per-flight and per-phase figures (flight_figures, flight_phase_figures) that the
// aircraft's history, baseline and high-burn finder read. Written only from recomputeSummary, from
// the same summary the flights list caches, so the two can never disagree.
import { eq } from 'drizzle-orm';
import { findLeaningMoments, type FlightComputation, type FlightSummary, type SampleColumns } from '$lib/fuel';
import { db, type Db } from '../db';
import { flightFigures, flightPhaseFigures } from '../db/schema';
/** Any Drizzle handle that writes (the pool, a transaction, the upload's own client). */
type Writer = Pick<Db, 'insert' | 'delete'>;

/** Replaces the flight's stored figures by the summary's; none for a flight without a summary. */
export interface FiguresBeyondSummary {
	/** The meter factor the flight was computed with. */
	meterFactor: number;
	leaningMoments: number;
}

export async function storeFlightFigures(flightId: string, summary: FlightSummary | null, extra: FiguresBeyondSummary, q: Writer = db): Promise<void> {
	await q.delete(flightPhaseFigures).where(eq(flightPhaseFigures.flightId, flightId));
	await q.delete(flightFigures).where(eq(flightFigures.flightId, flightId));
	if (!summary) return;
	await q.insert(flightFigures).values({
		flightId,
		engineTimeS: summary.engineTimeS,
		fuelUsedL: summary.fuelUsedL,
		fuelPerEngineHourLph: summary.averageFlowLph,
		cruiseSpecificRangeNmPerL: summary.cruiseSpecificRangeNmPerL,
		meterFactor: extra.meterFactor,
		leaningMoments: extra.leaningMoments,
		gapCount: summary.gapCount,
		gapTimeS: summary.gapTimeS
	});
	if (summary.phases.length === 0) return;
	await q.insert(flightPhaseFigures).values(
		summary.phases.map((p) => ({
			flightId,
			phase: p.name,
			timeS: p.timeS,
			fuelL: p.fuelL,
			distanceNm: p.distanceNm,
			averageFlowLph: p.averageFlowLph
		}))
	);
}

/**
 * The same from a fresh computation: the leaning moments are counted on its flow and phases.
 * For the write paths that compute a flight themselves (recomputeSummary, the upload).
 */
export async function storeComputedFigures(
	flightId: string,
	computed: { computation: FlightComputation; summary: FlightSummary } | null,
	columns: SampleColumns,
	meterFactor: number,
	q: Writer = db
): Promise<void> {
	const leaningMoments = computed
		? findLeaningMoments({ t: columns.t, flow: computed.computation.flow, gs: columns.gs, alt: columns.alt, phase: computed.computation.phase }).length
		: 0;
	await storeFlightFigures(flightId, computed?.summary ?? null, { meterFactor, leaningMoments }, q);
}
