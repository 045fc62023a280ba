// Legal fuel reserve rules as data, each with its citation and a paraphrase of its text, and the
// reserve amount in litres: minutes × the aircraft's baseline cruise flow, or the flight's own
// measured cruise flow when no baseline is set. Rules differ by country and change: show the one used.

export type ReserveRuleId =
	| 'faa-91.151-vfr-day'
	| 'faa-91.151-vfr-night'
	| 'faa-91.167-ifr'
	| 'easa-nco.op.125-vfr-day'
	| 'easa-nco.op.125-vfr-night'
	| 'easa-nco.op.125-ifr'
	| 'custom';

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

export interface ReserveAmount {
	rule: ReserveRule;
	minutes: number | null;
	/** The cruise flow the amount was computed from, L/h. */
	flowLph: number | null;
	amountL: number | null;
	/** Which flow was used: the aircraft's baseline, the flight's measured cruise, or none was available. */
	basis: 'baseline' | 'measured' | 'none';
	note: string;
}

const usable = (x: number | null | undefined): x is number =>
	typeof x === 'number' && Number.isFinite(x) && x > 0;

/** Reserve in litres for a rule; says which cruise flow it rests on. */
export function reserveAmount(
	setting: ReserveSetting,
	baselineCruiseFlowLph: number | null | undefined,
	measuredCruiseFlowLph: number | null | undefined
): ReserveAmount {
	const rule = reserveRule(setting.ruleId);
	let minutes = rule.minutes;
	if (rule.id === 'custom') {
		const m = setting.customMinutes;
		minutes = typeof m === 'number' && Number.isFinite(m) && m >= 0 ? m : null;
	}
	if (minutes === null)
		return {
			rule,
			minutes: null,
			flowLph: null,
			amountL: null,
			basis: 'none',
			note: 'No reserve minutes set for the custom rule.'
		};
	if (usable(baselineCruiseFlowLph))
		return {
			rule,
			minutes,
			flowLph: baselineCruiseFlowLph,
			amountL: (minutes / 60) * baselineCruiseFlowLph,
			basis: 'baseline',
			note: `${minutes} min at the aircraft's baseline cruise flow.`
		};
	if (usable(measuredCruiseFlowLph))
		return {
			rule,
			minutes,
			flowLph: measuredCruiseFlowLph,
			amountL: (minutes / 60) * measuredCruiseFlowLph,
			basis: 'measured',
			note: `${minutes} min at this flight's measured cruise flow (no baseline set for the aircraft).`
		};
	return {
		rule,
		minutes,
		flowLph: null,
		amountL: null,
		basis: 'none',
		note: 'No baseline cruise flow for the aircraft and no cruise in this flight to measure one from.'
	};
}
