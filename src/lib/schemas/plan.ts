// The fuel-plan form: the plan's allowances and reserve rule, and a table of legs whose fields are
// named legs.<row>.<field> so each error lands beside its cell. Fuel is typed in a chosen unit
// (flows in that unit per hour) and comes out in litres; leg times are minutes or h:mm.
import { z } from 'zod';
import { RESERVE_RULE_IDS, type PlanLeg, type ReserveRuleId } from '$lib/fuel';
import { DEFAULT_TOLERANCE_PERCENT } from '$lib/fuel/plan-actual';
import { fromLitres, toLitres, type FuelUnit } from '$lib/units';
import { amountField, fuelUnitSchema, parseAmount } from './declaration';
import { fieldErrors, type FieldErrors } from './form';
import { parseUtc } from './flight';

export const PLAN_LEG_FIELDS = ['to', 'distance', 'gs', 'time', 'flow', 'fuel', 'refuel'] as const;
export type PlanLegField = (typeof PLAN_LEG_FIELDS)[number];
export type PlanLegValues = Record<PlanLegField, string>;

/** A plan has at least one leg; 60 is more than any light-aircraft cross-country needs. */
export const MAX_PLAN_LEGS = 60;
const MAX_NM = 5000;
const MAX_KT = 500;
const MAX_MIN = 24 * 60;


const number = (what: string, max: number) => amountField('text', { notANumber: `Enter ${what} as a number.`, outOfRange: `Enter ${what} between 0 and ${max}.` }, max);

/** "105", "105.5" (minutes) or "1:45" (h:mm); blank is null. */
export function parseMinutes(raw: string | undefined): number | null {
	const s = (raw ?? '').trim();
	if (s === '') return null;
	const hm = /^(\d{1,2}):([0-5]\d)$/.exec(s);
	if (hm) return +hm[1] * 60 + +hm[2];
	const n = parseAmount(s);
	return n === null ? null : n;
}

const minutes = z
	.string()
	.optional()
	.transform((raw, ctx) => {
		const m = parseMinutes(raw);
		if (m === null) return null;
		if (!Number.isFinite(m) || m <= 0 || m > MAX_MIN) {
			ctx.addIssue({ code: 'custom', message: 'Enter the time in minutes (e.g. 42) or as h:mm (e.g. 1:45).' });
			return z.NEVER;
		}
		return m;
	});

const legSchema = z
	.object({
		to: z
			.string('Enter the waypoint.')
			.trim()
			.min(1, 'Enter the waypoint id, as the recorder reports it.')
			.max(40, 'Use at most 40 characters.'),
		distance: number('the distance in NM', MAX_NM),
		gs: number('the ground speed in kt', MAX_KT),
		time: minutes,
		flow: number('the flow', 10_000),
		fuel: number('the fuel', 10_000),
		refuel: number('the fuel on board after the refuel', 100_000)
	})
	.superRefine((v, ctx) => {
		if (v.distance === null || v.distance <= 0) ctx.addIssue({ code: 'custom', path: ['distance'], message: 'Enter the distance in NM (more than 0).' });
		if (v.time === null && (v.gs === null || v.gs <= 0)) ctx.addIssue({ code: 'custom', path: ['gs'], message: 'Enter the ground speed, or the time for the leg.' });
		if (v.fuel === null && v.flow === null) ctx.addIssue({ code: 'custom', path: ['flow'], message: 'Enter the flow, or the fuel for the leg.' });
	});

const headerSchema = z
	.object({
		unit: fuelUnitSchema('Choose a unit.'),
		start: number('the fuel on board at engine start', 100_000),
		taxi: number('the taxi and run-up allowance', 10_000),
		climb: number('the climb allowance', 10_000),
		reserveRule: z.enum(RESERVE_RULE_IDS, 'Choose a reserve rule.'),
		reserveMin: number('the reserve minutes', 600),
		reserveFlow: number('the cruise flow for the reserve', 10_000),
		tolerance: number('the tolerance in percent', 100)
	})
	.superRefine((v, ctx) => {
		if (v.start === null) ctx.addIssue({ code: 'custom', path: ['start'], message: 'Enter the fuel on board at engine start.' });
		if (v.reserveRule === 'custom' && v.reserveMin === null) ctx.addIssue({ code: 'custom', path: ['reserveMin'], message: 'Enter the reserve minutes for the custom rule.' });
	});

/** What the form saves, canonical units. */
export interface PlanInput {
	startOnBoardL: number;
	taxiL: number;
	climbL: number;
	reserveRule: ReserveRuleId;
	reserveCustomMin: number | null;
	reserveFlowLph: number | null;
	tolerancePercent: number;
	legs: PlanLeg[];
}

/** The legs rows of a form, in row order (the row numbers need not be contiguous). */
export function legRows(values: Record<string, string>): PlanLegValues[] {
	const rows = new Map<number, PlanLegValues>();
	for (const [key, value] of Object.entries(values)) {
		const m = /^legs\.(\d{1,3})\.(\w+)$/.exec(key);
		if (!m || !(PLAN_LEG_FIELDS as readonly string[]).includes(m[2])) continue;
		const n = +m[1];
		const row = rows.get(n) ?? { to: '', distance: '', gs: '', time: '', flow: '', fuel: '', refuel: '' };
		row[m[2] as PlanLegField] = value;
		rows.set(n, row);
	}
	return [...rows.entries()].sort((a, b) => a[0] - b[0]).map(([, r]) => r);
}

/** The form's values with the legs renumbered 0, 1, 2 … as the page shows them. */
export function normalisedValues(values: Record<string, string>): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of Object.entries(values)) if (!k.startsWith('legs.')) out[k] = v;
	legRows(values).forEach((row, i) => {
		for (const f of PLAN_LEG_FIELDS) out[`legs.${i}.${f}`] = row[f];
	});
	return out;
}

export type PlanFormResult = { ok: true; data: PlanInput; values: Record<string, string> } | { ok: false; errors: FieldErrors; values: Record<string, string> };

/** The plan form parsed; errors are keyed by field name (legs.<row>.<field> for a cell). */
export function parsePlanForm(raw: Record<string, string>, densityKgPerL: number): PlanFormResult {
	const values = normalisedValues(raw);
	const rows = legRows(values);
	const errors: FieldErrors = {};
	const header = headerSchema.safeParse(values);
	if (!header.success) Object.assign(errors, fieldErrors(header.error));
	if (rows.length === 0) errors.legs = 'Add at least one leg.';
	if (rows.length > MAX_PLAN_LEGS) errors.legs = `A plan has at most ${MAX_PLAN_LEGS} legs.`;
	const legs = rows.map((row, i) => {
		const r = legSchema.safeParse(row);
		if (!r.success) for (const [k, m] of Object.entries(fieldErrors(r.error))) errors[`legs.${i}.${k}`] ??= m;
		return r.success ? r.data : null;
	});
	if (!header.success || Object.keys(errors).length > 0) return { ok: false, errors, values };
	const h = header.data;
	const L = (x: number | null) => (x === null ? null : toLitres(x, h.unit, densityKgPerL));
	return {
		ok: true,
		values,
		data: {
			startOnBoardL: L(h.start)!,
			taxiL: L(h.taxi) ?? 0,
			climbL: L(h.climb) ?? 0,
			reserveRule: h.reserveRule,
			reserveCustomMin: h.reserveRule === 'custom' ? h.reserveMin : null,
			reserveFlowLph: L(h.reserveFlow),
			tolerancePercent: h.tolerance ?? DEFAULT_TOLERANCE_PERCENT,
			legs: legs.map((l) => ({
				to: l!.to,
				distanceNm: l!.distance!,
				gsKt: l!.gs,
				timeMin: l!.time,
				flowLph: L(l!.flow),
				fuelL: L(l!.fuel),
				refuelToL: L(l!.refuel)
			}))
		}
	};
}

const show = (x: number | null, digits = 2) => (x === null || !Number.isFinite(x) ? '' : String(Math.round(x * 10 ** digits) / 10 ** digits));

/** A stored plan as form values in `unit`. */
export function planFormValues(plan: PlanInput, unit: FuelUnit, densityKgPerL: number): Record<string, string> {
	const u = (l: number | null) => (l === null ? null : fromLitres(l, unit, densityKgPerL));
	const values: Record<string, string> = {
		unit,
		start: show(u(plan.startOnBoardL)),
		taxi: show(u(plan.taxiL)),
		climb: show(u(plan.climbL)),
		reserveRule: plan.reserveRule,
		reserveMin: show(plan.reserveCustomMin),
		reserveFlow: show(u(plan.reserveFlowLph)),
		tolerance: show(plan.tolerancePercent)
	};
	plan.legs.forEach((l, i) => {
		Object.assign(values, {
			[`legs.${i}.to`]: l.to,
			[`legs.${i}.distance`]: show(l.distanceNm, 1),
			[`legs.${i}.gs`]: show(l.gsKt, 0),
			[`legs.${i}.time`]: show(l.timeMin, 1),
			[`legs.${i}.flow`]: show(u(l.flowLph)),
			[`legs.${i}.fuel`]: show(u(l.fuelL)),
			[`legs.${i}.refuel`]: show(u(l.refuelToL))
		});
	});
	return values;
}

/**
 * A plan made before the flight: which aircraft, when it is expected to start (UTC) and who is to
 * fly it, beside the plan's own fields (parsePlanForm, in the chosen aircraft's density).
 */
export const waitingPlanFormSchema = z.object({
	aircraft: z.uuid('Choose the aircraft.'),
	departure: z.string('Enter the expected departure.').transform((raw, ctx) => {
		const date = parseUtc(raw);
		if (!date) {
			ctx.addIssue({ code: 'custom', message: 'Enter the expected departure as a UTC date and time, e.g. 2026-06-21 09:00.' });
			return z.NEVER;
		}
		return date;
	}),
	pilot: z
		.string()
		.max(200)
		.optional()
		.transform((v) => (v && v.trim() !== '' ? v.trim() : null))
});
export type WaitingPlanHeader = z.output<typeof waitingPlanFormSchema>;
