// What the aircraft's fuel history page receives: one page of flights with their stored figures
// and the high-burn finder's verdict on each, the trend points, and the baseline they were judged
// against. Shared by the server module that builds it and the page that draws it.
import type { Baseline, BaselinePhase, FlightVerdict, HighBurnResult } from '$lib/fuel';
import type { HistorySort } from '$lib/schemas/history';

export interface HistoryPhase {
	timeS: number;
	fuelL: number;
	/** L/h; null when the phase took no time. */
	averageFlowLph: number | null;
}

export interface HistoryRow {
	id: string;
	startedAt: Date;
	title: string;
	pilotId: string | null;
	pilot: string | null;
	engineTimeS: number;
	fuelUsedL: number;
	fuelPerEngineHourLph: number | null;
	cruiseSpecificRangeNmPerL: number | null;
	/** The meter factor the flight's figures were computed with. */
	meterFactor: number;
	gapCount: number;
	leaningMoments: number;
	phases: Partial<Record<BaselinePhase, HistoryPhase>>;
	/** The owner's mark: left out of the learned baseline. */
	unusual: { reason: string } | null;
	highBurn: HighBurnResult;
	/** The flight's stored reserve verdict (summary.verdict); null for a flight without samples. */
	reserveVerdict: FlightVerdict | null;
}

export interface TrendPoint {
	/** Engine start, epoch s. */
	t: number;
	cruiseFlowLph: number | null;
	fuelPerEngineHourLph: number | null;
}

export interface BurnSettingsView {
	thresholdPercent: number;
	/** True when the aircraft uses our default threshold. */
	thresholdIsDefault: boolean;
	manual: Record<BaselinePhase, number | null>;
}

export interface HistoryPage {
	total: number;
	pages: number;
	page: number;
	sort: HistorySort;
	dir: 'asc' | 'desc';
	rows: HistoryRow[];
	trend: TrendPoint[];
	baseline: Baseline;
	settings: BurnSettingsView;
	pilots: { id: string; name: string }[];
	/** Fuel pumped ÷ fuel computed that persists over the newest fill-up windows; null without one. */
	pumpedOverComputed: number | null;
}
