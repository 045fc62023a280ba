// Display helpers shared by pages: fuel amounts in a chosen unit, reserve-rule labels.
import { reserveRules } from '$lib/fuel';
import { fromLitres, fuelUnitLabels, type FuelUnit } from '$lib/units';

export function reserveRuleLabel(id: string, customMin: number | null): string {
	if (id === 'custom') return customMin === null ? 'Custom' : `Custom (${customMin} min)`;
	return reserveRules.find((r) => r.id === id)?.label ?? id;
}

export function reserveRuleCitation(id: string): string {
	return reserveRules.find((r) => r.id === id)?.citation ?? '';
}

/** "12.3 US gal" — litres in the display unit, with a sensible number of decimals. */
export function fuel(litres: number | null | undefined, unit: FuelUnit, densityKgPerL: number, digits = 1): string {
	if (litres === null || litres === undefined || !Number.isFinite(litres)) return '—';
	return `${fromLitres(litres, unit, densityKgPerL).toFixed(digits)} ${fuelUnitLabels[unit]}`;
}
