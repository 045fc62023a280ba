// Turns the pilot's start-of-flight declaration into litres on board, and checks the aircraft's
// fuel profile. Results are clamped into [0, capacity]; every clamp or guess comes back as a
// warning the UI can show next to the declaration.

import type {
	Declaration,
	EngineWarning,
	FuelProfile,
	ResolvedDeclaration,
	UsableProfile
} from './types';

function positiveFinite(x: unknown): x is number {
	return typeof x === 'number' && Number.isFinite(x) && x > 0;
}

/** Checks a fuel profile; bad fields get a neutral stand-in and a warning instead of a crash. */
export function checkProfile(profile: FuelProfile): { profile: UsableProfile; warnings: EngineWarning[] } {
	const warnings: EngineWarning[] = [];
	let capacityL = profile.capacityL;
	if (!positiveFinite(capacityL)) {
		warnings.push({
			code: 'invalidProfile',
			message: `Fuel capacity must be a number of litres above zero (got ${String(capacityL)}); amounts are not capped.`
		});
		capacityL = Infinity;
	}
	let lowerLevelL = profile.lowerLevelL;
	if (lowerLevelL !== null && (!positiveFinite(lowerLevelL) || lowerLevelL > capacityL)) {
		warnings.push({
			code: 'invalidProfile',
			message: `Lower fill level must be above zero and at most the capacity (got ${String(lowerLevelL)}); ignored.`
		});
		lowerLevelL = null;
	}
	let meterFactor = profile.meterFactor;
	if (!positiveFinite(meterFactor)) {
		warnings.push({
			code: 'invalidProfile',
			message: `Meter factor must be above zero (got ${String(meterFactor)}); using 1 (no correction).`
		});
		meterFactor = 1;
	}
	const baseline = profile.baselineCruiseFlowLph;
	let baselineCruiseFlowLph: number | null = null;
	if (baseline !== undefined && baseline !== null) {
		if (positiveFinite(baseline)) baselineCruiseFlowLph = baseline;
		else
			warnings.push({
				code: 'invalidProfile',
				message: `Baseline cruise flow must be above zero (got ${String(baseline)}); ignored.`
			});
	}
	return { profile: { capacityL, lowerLevelL, meterFactor, baselineCruiseFlowLph }, warnings };
}

/** How warnings write fuel unless the caller says otherwise: litres, one decimal. */
export function litresText(litres: number): string {
	return `${Math.round(litres * 10) / 10} L`;
}

/**
 * Litres on board at engine start. added/removed start from previousOnBoardL; without it they
 * start from zero (the conservative guess) and say so.
 */
export function resolveDeclaration(
	declaration: Declaration,
	profile: UsableProfile,
	previousOnBoardL: number | null | undefined,
	fmt: (litres: number) => string = litresText
): ResolvedDeclaration {
	const warnings: EngineWarning[] = [];
	const cap = profile.capacityL;
	const previousKnown =
		typeof previousOnBoardL === 'number' && Number.isFinite(previousOnBoardL);
	const previous = previousKnown ? previousOnBoardL : 0;

	const amount = (value: number): number => {
		if (Number.isFinite(value) && value >= 0) return value;
		warnings.push({
			code: 'declarationInvalidAmount',
			message: `The declared amount must be a number of litres, zero or more (got ${String(value)}); using 0.`
		});
		return 0;
	};
	const needPrevious = (): void => {
		if (!previousKnown)
			warnings.push({
				code: 'noPreviousOnBoard',
				message:
					'Fuel on board after the previous flight is not known; counting from 0 L. Declare the amount on board instead.'
			});
	};

	let raw: number;
	switch (declaration.kind) {
		case 'onBoard':
			raw = amount(declaration.amountL);
			break;
		case 'full':
			if (cap === Infinity) {
				// Nothing to fill to: fall back to what was there, which is never more than reality.
				raw = previous;
				needPrevious();
			} else raw = cap;
			break;
		case 'lower':
			if (profile.lowerLevelL === null) {
				warnings.push({
					code: 'noLowerLevel',
					message:
						'This aircraft has no lower fill level set; counting only the fuel known to be on board before.'
				});
				needPrevious();
				raw = previous;
			} else if (previous > profile.lowerLevelL) {
				// Filling to the tabs never takes fuel out.
				warnings.push({
					code: 'alreadyAboveLevel',
					message: `Fuel on board before (${fmt(previous)}) was already above the lower fill level (${fmt(profile.lowerLevelL)}); keeping it.`
				});
				raw = previous;
			} else raw = profile.lowerLevelL;
			break;
		case 'added':
			needPrevious();
			raw = previous + amount(declaration.amountL);
			break;
		case 'removed':
			needPrevious();
			raw = previous - amount(declaration.amountL);
			break;
		default: {
			const unknown: never = declaration;
			warnings.push({
				code: 'declarationInvalidAmount',
				message: `Unknown declaration ${JSON.stringify(unknown)}; using ${fmt(0)}.`
			});
			raw = 0;
		}
	}

	let onBoardL = raw;
	if (onBoardL > cap) {
		warnings.push({
			code: 'declarationAboveCapacity',
			message: `Declared ${fmt(raw)} is more than the usable capacity (${fmt(cap)}); using the capacity.`
		});
		onBoardL = cap;
	} else if (onBoardL < 0) {
		warnings.push({
			code: 'declarationBelowZero',
			message: `Declared fuel works out at ${fmt(raw)}; using ${fmt(0)}.`
		});
		onBoardL = 0;
	}
	return { declaration, onBoardL, warnings };
}
