// Whether one sample shows the aircraft standing on the ground with its engine stopped: fuel flow
// and ground speed both about zero, by the engine's own thresholds (DEFAULT_OPTIONS: below which
// flow the engine counts as stopped, below which ground speed the aircraft stands still). The live
// page names this state and the idle sweeper keeps such a flight open across a planned stop.
import { DEFAULT_OPTIONS } from './engine';

/** Flow below this (L/h) is an engine stopped. */
export const STOPPED_FLOW_LPH = DEFAULT_OPTIONS.minFlowLph;
/** Ground speed below this (kt) is standing still. */
export const STANDING_GS_KT = DEFAULT_OPTIONS.minGsKt;

/**
 * True when the sample's flow and ground speed are both recorded and below the thresholds. A
 * sample missing either is not called stopped: the page would then say more than it knows.
 */
export function engineStoppedOnGround(flowLph: number | null | undefined, gsKt: number | null | undefined): boolean {
	return typeof flowLph === 'number' && typeof gsKt === 'number' && flowLph >= 0 && gsKt >= 0 && flowLph < STOPPED_FLOW_LPH && gsKt < STANDING_GS_KT;
}
