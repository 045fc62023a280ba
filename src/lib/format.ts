// Display helpers shared by pages: fuel amounts in a chosen unit, reserve-rule labels. Rounding
// itself lives in $lib/rounding.
import { reserveRules, type ReserveRuleId } from '$lib/fuel';
import { fixed, signedDown, type RoundMode } from '$lib/rounding';
import { fromLitres, fuelUnitLabels, type FuelUnit } from '$lib/units';

/** A stored rule that is not one Burndown knows reads as null (src/lib/schemas/reserve.ts). */
export const UNKNOWN_RESERVE_RULE = 'Unknown (the stored rule is not one Burndown knows: no reserve in these figures; choose the rule on the aircraft’s page)';

export function reserveRuleLabel(id: ReserveRuleId | null, customMin: number | null): string {
	if (id === null) return UNKNOWN_RESERVE_RULE;
	if (id === 'custom') return customMin === null ? 'Custom' : `Custom (${customMin} min)`;
	return reserveRules.find((r) => r.id === id)?.label ?? id;
}

export function reserveRuleCitation(id: ReserveRuleId | null): string {
	return reserveRules.find((r) => r.id === id)?.citation ?? '';
}

/** "12.3 US gal" — litres in the display unit, rounded to nearest (or down, for margins). */
export function fuel(litres: number | null | undefined, unit: FuelUnit, densityKgPerL: number, digits = 1, mode: RoundMode = 'nearest'): string {
	if (litres === null || litres === undefined || !Number.isFinite(litres)) return '—';
	return `${fixed(fromLitres(litres, unit, densityKgPerL), digits, mode)} ${fuelUnitLabels[unit]}`;
}

/** The landed margin against the reserve, rounded down (never more than exists): "+3.2 US gal". */
export function landedMargin(litres: number | null | undefined, unit: FuelUnit, densityKgPerL: number): string {
	return litres === null || litres === undefined || !Number.isFinite(litres) ? '' : `${signedDown(fromLitres(litres, unit, densityKgPerL), 1)} ${fuelUnitLabels[unit]}`;
}
