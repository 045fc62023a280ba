// Fuel events on the timeline (fuel taken on or removed at a stop, a reset of "used"):
// checking and ordering them, and working out what each one changes when it is applied.

import { litresText } from './declaration';
import { FUEL_EVENT_KINDS, type EngineWarning, type FuelEvent, type UsableProfile } from './types';

const KINDS = new Set<string>(FUEL_EVENT_KINDS);

/** Valid events in time order (ties keep their given order); invalid ones are dropped with a warning. */
export function normalizeEvents(
	events: readonly FuelEvent[] | undefined,
	profile: UsableProfile
): { events: FuelEvent[]; warnings: EngineWarning[] } {
	const warnings: EngineWarning[] = [];
	const kept: FuelEvent[] = [];
	(events ?? []).forEach((event, position) => {
		const where = `Fuel event ${position + 1}`;
		if (!event || !KINDS.has(event.kind)) {
			warnings.push({
				code: 'eventInvalid',
				message: `${where}: unknown kind ${JSON.stringify(event?.kind)}; ignored.`
			});
			return;
		}
		if (!Number.isFinite(event.t)) {
			warnings.push({ code: 'eventInvalid', message: `${where}: the time is missing; ignored.` });
			return;
		}
		if (event.kind === 'added' || event.kind === 'removed') {
			const a = event.amountL;
			if (typeof a !== 'number' || !Number.isFinite(a) || a < 0) {
				warnings.push({
					code: 'eventInvalid',
					message: `${where} (${event.kind}): the amount must be litres, zero or more (got ${String(a)}); ignored.`,
					t: event.t
				});
				return;
			}
		}
		if (event.kind === 'toLower' && profile.lowerLevelL === null) {
			warnings.push({
				code: 'noLowerLevel',
				message: `${where}: this aircraft has no lower fill level set; ignored.`,
				t: event.t
			});
			return;
		}
		kept.push(event);
	});
	// Array.prototype.sort is stable, so same-time events keep the order they were entered in.
	kept.sort((a, b) => a.t - b.t);
	return { events: kept, warnings };
}

/**
 * Fuel on board after `event` is applied to `onBoardL`, clamped into [0, capacity], and the
 * change. The result is returned as such (not as onBoard + delta) so a fill to full lands on the
 * capacity exactly. resetUsed changes nothing on board.
 */
export function eventDelta(
	event: FuelEvent,
	onBoardL: number,
	profile: UsableProfile,
	fmt: (litres: number) => string = litresText
): { afterL: number; deltaL: number; warning: EngineWarning | null } {
	const cap = profile.capacityL;
	let target: number;
	switch (event.kind) {
		case 'added':
			target = onBoardL + (event.amountL ?? 0);
			break;
		case 'removed':
			target = onBoardL - (event.amountL ?? 0);
			break;
		case 'toFull':
			target = cap === Infinity ? onBoardL : cap;
			break;
		case 'toLower': {
			const lower = profile.lowerLevelL ?? onBoardL;
			if (onBoardL > lower)
				return {
					afterL: onBoardL,
					deltaL: 0,
					warning: {
						code: 'alreadyAboveLevel',
						message: `Fuel on board (${fmt(onBoardL)}) was already above the lower fill level when filling to it; no change.`,
						t: event.t
					}
				};
			target = lower;
			break;
		}
		default:
			return { afterL: onBoardL, deltaL: 0, warning: null };
	}
	if (target > cap) {
		return {
			afterL: cap,
			deltaL: cap - onBoardL,
			warning: {
				code: 'eventAboveCapacity',
				message: `Fuel ${event.kind} would bring the tanks to ${fmt(target)}, above the usable capacity; capped at ${fmt(cap)}.`,
				t: event.t
			}
		};
	}
	if (target < 0) {
		// Removing never adds fuel, even when the computed amount is already below zero.
		const afterL = onBoardL > 0 ? 0 : onBoardL;
		return {
			afterL,
			deltaL: afterL - onBoardL,
			warning: {
				code: 'eventBelowZero',
				message: `Fuel removed would leave ${fmt(target)}; set to ${fmt(0)}.`,
				t: event.t
			}
		};
	}
	return { afterL: target, deltaL: target - onBoardL, warning: null };
}
