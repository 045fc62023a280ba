// Comparing two or more flights the member may view: each flight is loaded, computed and reduced
// to its bucketed flow and fuel used one at a time (so only one flight's samples are in memory),
// and the phase table comes from the same computation's summary.
import { alignSinceEngineStart, compareStepS, phaseDifferences, type PhaseFigures } from '$lib/fuel';
import type { Flight } from '../db/schema';
import type { ComparedFlight, ComparePayload } from '$lib/wire/compare';
import { inArray } from 'drizzle-orm';
import { db } from '../db';
import { users } from '../db/schema';
import { loadFlight } from './load';
import { computeLoaded } from './summary';

const orNull = (a: Float64Array): (number | null)[] => Array.from(a, (x) => (Number.isFinite(x) ? x : null));

/** `flights` already authorized for viewing, in the order to show them (the first is the reference). */
export async function compareFlights(flights: readonly Flight[]): Promise<ComparePayload> {
	const stepS = compareStepS(flights.map((f) => ((f.endedAt ?? f.lastSampleAt ?? f.startedAt).getTime() - f.startedAt.getTime()) / 1000));
	const pilotIds = [...new Set(flights.map((f) => f.pilotId).filter((x): x is string => x !== null))];
	const names = new Map((pilotIds.length ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, pilotIds)) : []).map((u) => [u.id, u.name]));
	const out: ComparedFlight[] = [];
	const phases: PhaseFigures[][] = [];
	for (const f of flights) {
		const loaded = await loadFlight(f.id);
		if (!loaded) continue;
		const { computation, summary } = computeLoaded(loaded);
		const start = Number.isFinite(computation.stats.firstRunT) ? computation.stats.firstRunT : (summary.start ?? 0);
		const aligned = alignSinceEngineStart(loaded.input.columns.t, computation.flow, computation.used, start, stepS);
		out.push({
			id: f.id,
			title: f.title,
			registration: loaded.aircraft.registration,
			displayUnit: loaded.aircraft.displayUnit,
			densityKgPerL: loaded.aircraft.densityKgPerL,
			pilot: f.pilotId ? (names.get(f.pilotId) ?? null) : null,
			startedAt: f.startedAt,
			fuelUsedL: summary.fuelUsedL,
			engineTimeS: summary.engineTimeS,
			meterFactor: loaded.input.profile.meterFactor,
			flowLph: orNull(aligned.flowLph),
			usedL: orNull(aligned.usedL)
		});
		phases.push(summary.phases.map((p) => ({ phase: p.name, timeS: p.timeS, fuelL: p.fuelL, averageFlowLph: p.averageFlowLph })));
	}
	return { stepS, flights: out, phases: phaseDifferences(phases) };
}

