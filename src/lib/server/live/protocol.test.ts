// The NOTIFY payloads between app instances: many flights' notices packed under PostgreSQL's
// payload limit, and every one read back.
import { describe, expect, it } from 'vitest';
import { MAX_NOTIFY_BYTES, noticePayloads, noticesOf } from './protocol';

describe('NOTIFY payloads', () => {
	it('pack many notices under the size PostgreSQL allows, and read back every one', () => {
		const notices = Array.from({ length: 400 }, (_, i) => ({ f: `00000000-0000-4000-8000-${String(i).padStart(12, '0')}`, s: i * 7, at: 1_796_000_000_000 + i, ...(i % 9 === 0 ? { m: 1 as const } : {}) }));
		const payloads = noticePayloads(notices);
		expect(payloads.length).toBeGreaterThan(1);
		for (const p of payloads) expect(Buffer.byteLength(p)).toBeLessThan(MAX_NOTIFY_BYTES + 1);
		expect(payloads.flatMap((p) => noticesOf(JSON.parse(p)))).toEqual(notices);
		// One notice stays in the form the database's own senders and older instances use.
		expect(noticesOf(JSON.parse(noticePayloads([notices[0]])[0]))).toEqual([notices[0]]);
		expect(noticesOf({ u: 'someone' })).toEqual([]);
	});
});
