// The aircraft's fuel history: its query string (read leniently, like the flights list), and the
// owner's two forms on it — the high-burn settings and marking a flight as unusual.
import { z } from 'zod';
import { BASELINE_PHASES, type BaselinePhase } from '$lib/fuel';
import { toLitresPerHour, type FlowUnit } from '$lib/units';
import { amountField } from './declaration';
import { day } from './flight';

export const HISTORY_SORTS = ['date', 'pilot', 'engine', 'used', 'perHour', ...BASELINE_PHASES, 'range'] as const;
export type HistorySort = (typeof HISTORY_SORTS)[number];
export const HISTORY_PER_PAGE = 25;

export const historyQuerySchema = z.object({
	pilot: z.string().trim().min(1).max(100).optional().catch(undefined),
	from: day.catch(null),
	to: day.catch(null),
	sort: z.enum(HISTORY_SORTS).default('date').catch('date'),
	dir: z.enum(['asc', 'desc']).optional().catch(undefined),
	page: z.coerce.number().int().min(1).max(100_000).default(1).catch(1)
});
export type HistoryQuery = z.output<typeof historyQuerySchema>;

/** A threshold above 100 % would mark nothing a sensor could tell apart from a fault. */
export const MAX_THRESHOLD_PERCENT = 100;
const MAX_FLOW = 1000;

/** Threshold in percent and hand-set usual flows in `flowUnit`; blank = our default / learned. */
export const burnSettingsFormSchema = (flowUnit: FlowUnit, densityKgPerL: number) => {
	const flow = (phase: string) =>
		amountField('text', { notANumber: `Enter the usual ${phase} flow as a number, or leave it blank.`, outOfRange: `Enter the usual ${phase} flow between 0 and ${MAX_FLOW}.` }, MAX_FLOW).transform((v) =>
			v === null || v === 0 ? null : toLitresPerHour(v, flowUnit, densityKgPerL)
		);
	return z
		.object({
			threshold: amountField('text', { notANumber: 'Enter the threshold as a number of percent, or leave it blank.', outOfRange: `Enter the threshold between 1 and ${MAX_THRESHOLD_PERCENT} %.` }, MAX_THRESHOLD_PERCENT).refine(
				(v) => v === null || v >= 1,
				`Enter the threshold between 1 and ${MAX_THRESHOLD_PERCENT} %.`
			),
			taxi: flow('taxi'),
			climb: flow('climb'),
			cruise: flow('cruise'),
			descent: flow('descent')
		})
		.transform((f) => ({ thresholdPercent: f.threshold, manual: { taxi: f.taxi, climb: f.climb, cruise: f.cruise, descent: f.descent } satisfies Record<BaselinePhase, number | null> }));
};
export type BurnSettingsInput = z.output<ReturnType<typeof burnSettingsFormSchema>>;

export const unusualFormSchema = z.object({
	flightId: z.uuid('Choose a flight.'),
	on: z.enum(['1', '0'], 'Say whether to mark or unmark the flight.').transform((v) => v === '1'),
	reason: z.string().trim().max(200, 'Keep the reason under 200 characters.').default('')
});
export type UnusualInput = z.output<typeof unusualFormSchema>;

/** Flights compared at once (our choice: more lines than this no longer read at a glance). */
export const MAX_COMPARED = 6;
/** ?id=…&id=… on the compare page: two to MAX_COMPARED distinct flight ids. */
export const compareQuerySchema = z
	.array(z.uuid('Each id must be a flight id.'))
	.transform((ids) => [...new Set(ids)])
	.pipe(z.array(z.string()).min(2, 'Pick at least two flights to compare.').max(MAX_COMPARED, `Pick at most ${MAX_COMPARED} flights to compare.`));
