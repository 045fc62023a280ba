// Legal fuel reserve rules as data, each with its citation and a paraphrase of its text, and the
// one definition of the reserve amount: the rule's minutes × the aircraft's normal-cruise flow —
// its set baseline; else this flight's measured cruise; else the aircraft's recent median cruise.
// Rules differ by country and change: show the one used, and the basis of the flow.

/** The one list of reserve rule ids (stored on aircraft and plans; zod and the forms take it). */
export const RESERVE_RULE_IDS = [
	'faa-91.151-vfr-day',
	'faa-91.151-vfr-night',
	'faa-91.167-ifr',
	'easa-nco.op.125-vfr-day',
	'easa-nco.op.125-vfr-night',
	'easa-nco.op.125-ifr',
	'custom'
] as const;
export type ReserveRuleId = (typeof RESERVE_RULE_IDS)[number];

export interface ReserveRule {
	id: ReserveRuleId;
	label: string;
	/** Minutes of flight at normal cruise after reaching the destination; null for custom. */
	minutes: number | null;
	authority: 'FAA' | 'EASA' | null;
	citation: string;
	/** Our paraphrase of the rule, not the legal text; check the current text with the authority. */
	sourceText: string;
}

/*
 * Minutes per 14 CFR 91.151(a) and 91.167(a) (US) and EASA Part-NCO NCO.OP.125 (aeroplanes).
 * "Normal cruise" means the usual cruise setting, not an economy setting (AOPA legal briefings
 * on 91.151).
 */
export const reserveRules: readonly ReserveRule[] = [
	{
		id: 'faa-91.151-vfr-day',
		label: 'FAA VFR day (30 min)',
		minutes: 30,
		authority: 'FAA',
		citation: '14 CFR 91.151(a)(1)',
		sourceText:
			'VFR in an airplane by day: enough fuel, considering wind and forecast weather, to fly to the first point of intended landing and then for at least 30 minutes at normal cruising speed.'
	},
	{
		id: 'faa-91.151-vfr-night',
		label: 'FAA VFR night (45 min)',
		minutes: 45,
		authority: 'FAA',
		citation: '14 CFR 91.151(a)(2)',
		sourceText:
			'VFR in an airplane at night: enough fuel to fly to the first point of intended landing and then for at least 45 minutes at normal cruising speed.'
	},
	{
		id: 'faa-91.167-ifr',
		label: 'FAA IFR (45 min)',
		minutes: 45,
		authority: 'FAA',
		citation: '14 CFR 91.167(a)',
		sourceText:
			'IFR: enough fuel to fly to the first airport of intended landing, then to the alternate when one is required, and then for 45 minutes at normal cruising speed.'
	},
	{
		id: 'easa-nco.op.125-vfr-day',
		label: 'EASA VFR day (30 min)',
		minutes: 30,
		authority: 'EASA',
		citation: 'EASA Part-NCO, NCO.OP.125',
		sourceText:
			'VFR by day in an aeroplane: enough fuel to fly to the aerodrome of intended landing and then for at least 30 minutes at normal cruising altitude.'
	},
	{
		id: 'easa-nco.op.125-vfr-night',
		label: 'EASA VFR night (45 min)',
		minutes: 45,
		authority: 'EASA',
		citation: 'EASA Part-NCO, NCO.OP.125',
		sourceText:
			'VFR by night in an aeroplane: enough fuel to fly to the aerodrome of intended landing and then for at least 45 minutes.'
	},
	{
		id: 'easa-nco.op.125-ifr',
		label: 'EASA IFR (45 min)',
		minutes: 45,
		authority: 'EASA',
		citation: 'EASA Part-NCO, NCO.OP.125',
		sourceText:
			'IFR in an aeroplane: enough fuel to fly to the aerodrome of intended landing, to the alternate when one is required, and then for at least 45 minutes.'
	},
	{
		id: 'custom',
		label: 'Custom',
		minutes: null,
		authority: null,
		citation: 'Set by the operator or pilot',
		sourceText: 'A reserve of the stated number of minutes at normal cruise.'
	}
];

export const RESERVE_CAUTION =
	'Reserve rules differ by country and change. Burndown shows the rule selected here; follow your own authority’s current rules, the flight manual and the pilot in command’s judgement.';

export function reserveRule(id: ReserveRuleId): ReserveRule {
	const rule = reserveRules.find((r) => r.id === id);
	if (!rule) throw new RangeError(`Unknown reserve rule "${String(id)}"`);
	return rule;
}

export interface ReserveSetting {
	ruleId: ReserveRuleId;
	/** Minutes for the custom rule. */
	customMinutes?: number;
}

/** Where the normal-cruise flow behind the reserve amount comes from. */
export type CruiseBasis = 'baseline' | 'measured' | 'recent' | 'none';
/** Basis codes for the engine's per-sample byte array (FlightComputation.reserveBasis). */
export const cruiseBasisCodes: readonly CruiseBasis[] = ['none', 'baseline', 'measured', 'recent'];
export const BASIS_NONE = 0;
export const BASIS_BASELINE = 1;
export const BASIS_MEASURED = 2;
export const BASIS_RECENT = 3;

/**
 * A flight's own cruise counts as "measured" only after this much cruise (our choice): the first
 * minutes after levelling off still carry the climb's mixture and power settings, and a figure
 * from a few samples would swing the reserve amount around.
 */
export const MIN_MEASURED_CRUISE_S = 300;

/** Reserve minutes of a setting; null for a custom rule without usable minutes. */
export function reserveMinutesOf(setting: ReserveSetting | null | undefined): number | null {
	if (!setting) return null;
	const rule = reserveRule(setting.ruleId);
	if (rule.id !== 'custom') return rule.minutes;
	const m = setting.customMinutes;
	return typeof m === 'number' && Number.isFinite(m) && m >= 0 ? m : null;
}

/**
 * The normal-cruise flow and its basis. The engine runs the same precedence inline per sample
 * (stages/burn.ts, without allocating); tests check that the two agree.
 */
export function normalCruiseFlow(
	baselineCruiseFlowLph: number | null | undefined,
	measured: { timeS: number; fuelL: number } | null | undefined,
	recentCruiseFlowLph: number | null | undefined
): { basis: CruiseBasis; flowLph: number | null } {
	if (usable(baselineCruiseFlowLph)) return { basis: 'baseline', flowLph: baselineCruiseFlowLph };
	if (measured && measured.timeS >= MIN_MEASURED_CRUISE_S && measured.fuelL > 0)
		return { basis: 'measured', flowLph: (measured.fuelL / measured.timeS) * 3600 };
	if (usable(recentCruiseFlowLph)) return { basis: 'recent', flowLph: recentCruiseFlowLph };
	return { basis: 'none', flowLph: null };
}

export interface ReserveAmount {
	rule: ReserveRule;
	minutes: number | null;
	/** The cruise flow the amount was computed from, L/h. */
	flowLph: number | null;
	amountL: number | null;
	/** Which flow was used: the aircraft's baseline, the flight's measured cruise, or none was available. */
	basis: CruiseBasis;
	note: string;
}

function usable(x: number | null | undefined): x is number {
	return typeof x === 'number' && Number.isFinite(x) && x > 0;
}

const BASIS_NOTES: Record<Exclude<CruiseBasis, 'none'>, string> = {
	baseline: "the aircraft's set normal-cruise flow",
	measured: "this flight's measured cruise flow (no normal-cruise flow set for the aircraft)",
	recent: "the aircraft's recent median cruise flow (none set, none measured in this flight yet)"
};

/**
 * Reserve in litres for a rule: minutes × normal-cruise flow, saying which flow it rests on.
 * `measured` is this flight's cruise time and fuel (a bare flow in L/h is taken as measured over
 * enough cruise, for callers that already hold the flight's cruise flow).
 */
export function reserveAmount(
	setting: ReserveSetting,
	baselineCruiseFlowLph: number | null | undefined,
	measured: number | { timeS: number; fuelL: number } | null | undefined,
	recentCruiseFlowLph?: number | null
): ReserveAmount {
	const rule = reserveRule(setting.ruleId);
	const minutes = reserveMinutesOf(setting);
	if (minutes === null)
		return { rule, minutes: null, flowLph: null, amountL: null, basis: 'none', note: 'No reserve minutes set for the custom rule.' };
	const m =
		typeof measured === 'number'
			? usable(measured)
				? { timeS: 3600, fuelL: measured }
				: null
			: measured;
	const cruise = normalCruiseFlow(baselineCruiseFlowLph, m, recentCruiseFlowLph);
	if (cruise.basis === 'none' || cruise.flowLph === null)
		return {
			rule,
			minutes,
			flowLph: null,
			amountL: null,
			basis: 'none',
			note: 'No normal-cruise flow: none set for the aircraft, no cruise measured in this flight, no recent flights to take one from.'
		};
	return {
		rule,
		minutes,
		flowLph: cruise.flowLph,
		amountL: (minutes / 60) * cruise.flowLph,
		basis: cruise.basis,
		note: `${minutes} min at ${BASIS_NOTES[cruise.basis]}.`
	};
}
