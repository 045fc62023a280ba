// Fuel amounts in a chosen unit from the engine's litres, and the reserve rules' labels.
import { reserveRules, type ReserveRuleId } from '$lib/fuel';
import type { RoundMode } from '$lib/rounding';
import { flowUnitOf, fromLitres, fromLitresPerHour, type FuelUnit } from '$lib/units';
import { flowRate, fuelAmount, fuelMargin } from './numbers';

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

/** "12.3 US gal" — litres in the display unit, at that unit's precision, rounded to nearest (or down). */
export function fuel(litres: number | null | undefined, unit: FuelUnit, densityKgPerL: number, mode: RoundMode = 'nearest'): string {
	if (litres === null || litres === undefined || !Number.isFinite(litres)) return '—';
	return fuelAmount(fromLitres(litres, unit, densityKgPerL), unit, mode);
}

/** The landed margin against the reserve, rounded down (never more than exists): "+3.2 US gal"; "" when missing. */
export function landedMargin(litres: number | null | undefined, unit: FuelUnit, densityKgPerL: number): string {
	return litres === null || litres === undefined || !Number.isFinite(litres) ? '' : fuelMargin(fromLitres(litres, unit, densityKgPerL), unit);
}

/** "8.4 US gal/h" — litres per hour as the flow of the display unit. */
export function fuelFlow(lph: number | null | undefined, unit: FuelUnit, densityKgPerL: number): string {
	if (lph === null || lph === undefined || !Number.isFinite(lph)) return '—';
	return flowRate(fromLitresPerHour(lph, flowUnitOf(unit), densityKgPerL), flowUnitOf(unit));
}
