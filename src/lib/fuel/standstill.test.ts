import { describe, expect, it } from 'vitest';
import { DEFAULT_OPTIONS } from './engine';
import { engineStoppedOnGround, STANDING_GS_KT, STOPPED_FLOW_LPH } from './standstill';

describe('engine stopped on the ground', () => {
	it('takes its thresholds from the engine, the one place they are set', () => {
		expect(STOPPED_FLOW_LPH).toBe(DEFAULT_OPTIONS.minFlowLph);
		expect(STANDING_GS_KT).toBe(DEFAULT_OPTIONS.minGsKt);
	});
	it('needs both flow and ground speed about zero', () => {
		expect(engineStoppedOnGround(0, 0)).toBe(true);
		expect(engineStoppedOnGround(STOPPED_FLOW_LPH * 0.9, STANDING_GS_KT * 0.9)).toBe(true);
		// Idling at the holding point: engine running.
		expect(engineStoppedOnGround(STOPPED_FLOW_LPH, 0)).toBe(false);
		expect(engineStoppedOnGround(12, 0)).toBe(false);
		// Towed, or a flow sensor reading nothing while moving.
		expect(engineStoppedOnGround(0, STANDING_GS_KT)).toBe(false);
	});
	it('says nothing when either value is missing or nonsense', () => {
		expect(engineStoppedOnGround(null, 0)).toBe(false);
		expect(engineStoppedOnGround(0, undefined)).toBe(false);
		expect(engineStoppedOnGround(NaN, 0)).toBe(false);
		expect(engineStoppedOnGround(-1, 0)).toBe(false);
	});
});
