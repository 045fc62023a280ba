// The fleet view's query string: which calendar month (UTC), read leniently like the flights list
// (a bad value falls back to the current month rather than an error page).
import { z } from 'zod';

const MONTH = /^(\d{4})-(0[1-9]|1[0-2])$/;

/** "YYYY-MM" of a moment, in UTC. */
export const monthOf = (d: Date) => d.toISOString().slice(0, 7);

/** The first instant of a "YYYY-MM" month and of the month after it, UTC. */
export function monthRange(month: string): { from: Date; to: Date } {
	const [y, m] = month.split('-').map(Number);
	return { from: new Date(Date.UTC(y, m - 1, 1)), to: new Date(Date.UTC(y, m, 1)) };
}

/** The month `n` months after "YYYY-MM" (negative: before). */
export function shiftMonth(month: string, n: number): string {
	const [y, m] = month.split('-').map(Number);
	return monthOf(new Date(Date.UTC(y, m - 1 + n, 1)));
}

export const fleetQuerySchema = (now = new Date()) =>
	z.object({
		month: z
			.string()
			.regex(MONTH)
			.refine((v) => Number(v.slice(0, 4)) >= 1970 && Number(v.slice(0, 4)) <= 2100)
			.default(monthOf(now))
			.catch(monthOf(now)),
		archived: z.enum(['0', '1']).default('0').catch('0')
	});
export type FleetQuery = z.output<ReturnType<typeof fleetQuerySchema>>;
