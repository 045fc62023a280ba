import { describe, expect, it } from 'vitest';
import { liveState, NO_DATA_AFTER_S, type LiveFacts } from './live-state';

const base: LiveFacts = { linkDown: false, everOpen: true, open: true, ageS: 2, stoppedOnGround: false };

describe('the live page state', () => {
	it('is live while samples keep coming with the engine running', () => {
		expect(liveState(base)).toBe('live');
		expect(liveState({ ...base, ageS: NO_DATA_AFTER_S })).toBe('live');
	});
	it('says no data from the aircraft once nothing was stored for longer than the limit', () => {
		expect(liveState({ ...base, ageS: NO_DATA_AFTER_S + 1 })).toBe('no-data');
	});
	it('says the engine is stopped on the ground rather than that data is missing', () => {
		expect(liveState({ ...base, stoppedOnGround: true })).toBe('engine-stopped');
		expect(liveState({ ...base, stoppedOnGround: true, ageS: 3600 })).toBe('engine-stopped');
	});
	it("puts the viewer's own lost link before anything about the aircraft", () => {
		expect(liveState({ ...base, linkDown: true, ageS: 3600, stoppedOnGround: true })).toBe('link-lost');
		expect(liveState({ ...base, linkDown: true, everOpen: false })).toBe('link-lost');
		expect(liveState({ ...base, everOpen: false })).toBe('connecting');
	});
	it('a closed flight is ended, whatever its last samples showed', () => {
		expect(liveState({ ...base, open: false, stoppedOnGround: true, ageS: 9999 })).toBe('ended');
		expect(liveState({ ...base, denied: true })).toBe('denied');
	});
});

describe('what the alarm banner says about e-mail', () => {
	it('says e-mails were sent only when they were, and to how many', async () => {
		const { alarmMailWords, liveStateLabels } = await import('./labels');
		expect(alarmMailWords({ emailed: true, mailedTo: 2 })).toBe('e-mailed to 2 watchers');
		expect(alarmMailWords({ emailed: true, mailedTo: 1 })).toBe('e-mailed to 1 watcher');
		expect(alarmMailWords({ emailed: true, mailedTo: 0 })).toBe('no watcher was e-mailed');
		// Not yet known (still sending), or an alarm from before the count was kept: nothing said.
		expect(alarmMailWords({ emailed: false, mailedTo: 0 })).toBe('');
		expect(alarmMailWords({ emailed: true, mailedTo: null })).toBe('');
		// Every state has its words, and no two states share them.
		expect(new Set(Object.values(liveStateLabels)).size).toBe(Object.keys(liveStateLabels).length);
	});
});
