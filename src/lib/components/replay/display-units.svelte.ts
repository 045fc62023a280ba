// The units the replay and live pages show figures in, switchable on the page and remembered in
// the browser. The engine works in litres, L/h, knots and NM; conversion happens only here.
import { altitudeFigure, distance, flowFigure, fuelFigure, fuelMarginFigure, speed, speedFigure, specificRange, specificRangeFigure, type RoundMode } from '$lib/format';
import {
	distanceUnitLabels,
	distanceUnits,
	flowUnitLabels,
	flowUnitOf,
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
		return flowUnitOf(this.fuel);
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

	// Figures at the one precision of their quantity and unit ($lib/format's PRECISION).

	/** "12.3" in the fuel unit, or "—" for a missing value; rounded down for what is left. */
	fuelText(litres: number | null | undefined, mode: RoundMode = 'nearest'): string {
		return litres === null || litres === undefined ? '—' : fuelFigure(this.toFuel(litres), this.fuel, mode);
	}
	/** A margin in the fuel unit with its sign, rounded down: never more than exists. */
	marginText(litres: number | null | undefined): string {
		return litres === null || litres === undefined ? '—' : fuelMarginFigure(this.toFuel(litres), this.fuel);
	}
	flowText(lph: number | null | undefined): string {
		return lph === null || lph === undefined ? '—' : flowFigure(this.toFlow(lph), this.flow);
	}
	/** "12.4 NM" */
	distanceText(nm: number | null | undefined): string {
		return nm === null || nm === undefined ? '—' : distance(this.toDistance(nm), this.distance);
	}
	/** "104 kt" */
	speedText(kt: number | null | undefined): string {
		return kt === null || kt === undefined ? '—' : speed(this.toSpeed(kt), this.speed);
	}
	/** "2.41 NM/US gal" */
	rangeText(nmPerL: number | null | undefined): string {
		return nmPerL === null || nmPerL === undefined ? '—' : specificRange(this.toRange(nmPerL), this.rangeLabel);
	}
	// The same without the unit, for tiles that set the unit apart.
	speedFigure(kt: number): string {
		return speedFigure(this.toSpeed(kt));
	}
	rangeFigure(nmPerL: number): string {
		return specificRangeFigure(this.toRange(nmPerL));
	}
	altitudeFigure(ft: number | null | undefined): string {
		return altitudeFigure(ft);
	}
}
