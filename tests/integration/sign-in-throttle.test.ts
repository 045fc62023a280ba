// The sign-in throttle under parallel load: the failure count is taken before the password is
// checked, so a burst of guesses cannot all be verified (OWASP ASVS 5.0 V6.3.1: anti-automation
// against credential stuffing and brute force). 22 of 30 parallel guesses once got through.
import { describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { signInAttempts, users } from '$lib/server/db/schema';
import { hashPassword } from '$lib/server/auth';
import { signInWithPassword } from '$lib/server/services/accounts';
import { THROTTLE } from '$lib/server/throttle';

async function makeUser(password: string) {
	const id = `thr${Date.now().toString(36)}${Math.floor(Math.random() * 1e6)}`;
	const email = `${id}@example.org`;
	await db.insert(users).values({ id, email, name: 'Throttle Target', passwordHash: await hashPassword(password) });
	return { id, email };
}

describe('sign-in throttle under parallel requests', () => {
	it('verifies at most the per-account limit of 30 parallel wrong passwords', async () => {
		const u = await makeUser('the real passphrase');
		const results = await Promise.all(
			Array.from({ length: 30 }, (_, i) => signInWithPassword(u.email, `wrong guess ${i}`, `192.0.2.${i % 5}`))
		);
		const verified = results.filter((r) => !r.ok && r.reason === 'mismatch').length;
		const refused = results.filter((r) => !r.ok && r.reason === 'throttled').length;
		expect(verified).toBeLessThanOrEqual(THROTTLE.perAccount);
		expect(verified + refused).toBe(30);
		// The right password is refused too while the account is throttled.
		expect(await signInWithPassword(u.email, 'the real passphrase', '192.0.2.200')).toMatchObject({ ok: false, reason: 'throttled', scope: 'account' });
	});

	it('verifies at most the per-address limit across many accounts at once', async () => {
		const address = '203.0.113.77';
		const results = await Promise.all(
			Array.from({ length: THROTTLE.perAddress + 20 }, (_, i) => signInWithPassword(`spray-${i}-${Date.now()}@example.org`, 'wrong', address))
		);
		expect(results.filter((r) => !r.ok && r.reason === 'mismatch').length).toBeLessThanOrEqual(THROTTLE.perAddress);
		const [{ n }] = await db.select({ n: count() }).from(signInAttempts).where(eq(signInAttempts.address, address));
		expect(n).toBeLessThanOrEqual(THROTTLE.perAddress);
	});

	it('a right password signs in and does not count as a failure', async () => {
		const u = await makeUser('another real passphrase');
		for (let i = 0; i < THROTTLE.perAccount - 1; i++) expect((await signInWithPassword(u.email, 'nope', '192.0.2.9')).ok).toBe(false);
		expect(await signInWithPassword(u.email, 'another real passphrase', '192.0.2.9')).toEqual({ ok: true, userId: u.id });
		expect(await signInWithPassword(u.email, 'nope', '192.0.2.9')).toEqual({ ok: false, reason: 'mismatch' });
	});
});
