// The units the replay and live pages show figures in, switchable on the page and remembered in
// the browser. The engine works in litres, L/h, knots and NM; conversion happens only here.
import { fixed, signedDown, type RoundMode } from '$lib/rounding';
import {
	distanceUnitLabels,
	distanceUnits,
	flowUnitLabels,
	fromKnots,
	fromLitres,
	fromLitresPerHour,
	fromNauticalMiles,
	fromNmPerLitre,
	fuelUnitLabels,
	fuelUnits,
	speedUnitLabels,
	speedUnits,
	specificRangeLabel,
	type DistanceUnit,
	type FlowUnit,
	type FuelUnit,
	type SpeedUnit
} from '$lib/units';

const KEY = 'burndown-replay-units';

const FLOW_OF: Record<FuelUnit, FlowUnit> = { usgal: 'usgal/h', l: 'l/h', impgal: 'impgal/h', lb: 'lb/h', kg: 'kg/h' };

/** Decimals that read well for each fuel unit (a litre is small, a US gallon is not). */
const FUEL_DIGITS: Record<FuelUnit, number> = { usgal: 1, l: 0, impgal: 1, lb: 0, kg: 0 };

export class DisplayUnits {
	fuel = $state<FuelUnit>('l');
	distance = $state<DistanceUnit>('nm');
	speed = $state<SpeedUnit>('kt');
	densityKgPerL: number;

	constructor(defaultFuel: FuelUnit, densityKgPerL: number) {
		this.fuel = defaultFuel;
		this.densityKgPerL = densityKgPerL;
	}

	/** Reads the units chosen last time in this browser (call from onMount). */
	restore(): void {
		try {
			const saved = JSON.parse(localStorage.getItem(KEY) ?? 'null') as Partial<Record<'fuel' | 'distance' | 'speed', string>> | null;
			if (saved?.fuel && (fuelUnits as readonly string[]).includes(saved.fuel)) this.fuel = saved.fuel as FuelUnit;
			if (saved?.distance && (distanceUnits as readonly string[]).includes(saved.distance)) this.distance = saved.distance as DistanceUnit;
			if (saved?.speed && (speedUnits as readonly string[]).includes(saved.speed)) this.speed = saved.speed as SpeedUnit;
		} catch {
			/* nothing saved, or storage blocked: keep the defaults */
		}
	}

	save(): void {
		try {
			localStorage.setItem(KEY, JSON.stringify({ fuel: this.fuel, distance: this.distance, speed: this.speed }));
		} catch {
			/* private mode: the choice lasts for this page */
		}
	}

	get flow(): FlowUnit {
		return FLOW_OF[this.fuel];
	}
	get fuelLabel(): string {
		return fuelUnitLabels[this.fuel];
	}
	get flowLabel(): string {
		return flowUnitLabels[this.flow];
	}
	get distanceLabel(): string {
		return distanceUnitLabels[this.distance];
	}
	get speedLabel(): string {
		return speedUnitLabels[this.speed];
	}
	get rangeLabel(): string {
		return specificRangeLabel(this.distance, this.fuel);
	}
	get fuelDigits(): number {
		return FUEL_DIGITS[this.fuel];
	}

	toFuel(litres: number): number {
		return fromLitres(litres, this.fuel, this.densityKgPerL);
	}
	toFlow(lph: number): number {
		return fromLitresPerHour(lph, this.flow, this.densityKgPerL);
	}
	toDistance(nm: number): number {
		return fromNauticalMiles(nm, this.distance);
	}
	toSpeed(kt: number): number {
		return fromKnots(kt, this.speed);
	}
	toRange(nmPerL: number): number {
		return fromNmPerLitre(nmPerL, this.distance, this.fuel, this.densityKgPerL);
	}

	/** "12.3 US gal": for the engine's warning messages (an arrow, so it can be handed over). */
	fuelWithUnit = (litres: number): string => `${this.fuelText(litres)} ${this.fuelLabel}`;

	/** "12.3" in the fuel unit, or "—" for a missing value; rounded down for margins. */
	fuelText(litres: number | null | undefined, extraDigits = 0, mode: RoundMode = 'nearest'): string {
		return litres === null || litres === undefined || !Number.isFinite(litres) ? '—' : fixed(this.toFuel(litres), this.fuelDigits + extraDigits, mode);
	}
	/** A margin in the fuel unit with its sign, rounded down: never more than exists. */
	marginText(litres: number | null | undefined, extraDigits = 0): string {
		return litres === null || litres === undefined || !Number.isFinite(litres) ? '—' : signedDown(this.toFuel(litres), this.fuelDigits + extraDigits);
	}
	flowText(lph: number | null | undefined): string {
		return lph === null || lph === undefined || !Number.isFinite(lph) ? '—' : fixed(this.toFlow(lph), this.fuelDigits + 1);
	}
}
