// Sessions: the cookie carries a random token and the table only its SHA-256, so a leaked
// sessions table signs nobody in (OWASP Session Management Cheat Sheet; ASVS 5.0 V7). The account
// page lists one's sessions and signs out the other devices or every device.
import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { sessions, users } from '$lib/server/db/schema';
import { hashPassword, lucia, readSession, startSession, type AuthSession, type AuthUser } from '$lib/server/auth';
import { actions as accountActions, load as accountLoad } from '../../src/routes/account/+page.server';
import { CookieJar, fakeEvent, run } from './route-events';

let n = 0;
async function makeUser() {
	const id = `se${Date.now().toString(36)}${n++}`;
	await db.insert(users).values({ id, email: `${id}@example.org`, name: 'Session Tester', passwordHash: await hashPassword('a good passphrase') });
	return id;
}

async function device(userId: string) {
	const jar = new CookieJar();
	await startSession(userId, jar as never);
	const { user, session } = await readSession(jar as never);
	return { jar, user: user as AuthUser, session: session as AuthSession };
}

describe('session ids', () => {
	it('stores only the SHA-256 of the cookie token', async () => {
		const userId = await makeUser();
		const { jar } = await device(userId);
		const token = jar.get(lucia.sessionCookieName)!;
		expect(token.length).toBeGreaterThanOrEqual(32);
		const rows = await db.select().from(sessions).where(eq(sessions.userId, userId));
		expect(rows).toHaveLength(1);
		expect(rows[0].id).not.toBe(token);
		expect(rows[0].id).toBe(createHash('sha256').update(token).digest('hex'));
	});

	it('signs nobody in with a value read from the table', async () => {
		const userId = await makeUser();
		await device(userId);
		const [row] = await db.select().from(sessions).where(eq(sessions.userId, userId));
		const thief = new CookieJar();
		thief.set(lucia.sessionCookieName, row.id);
		expect((await readSession(thief as never)).user).toBeNull();
	});

	it('reads the session back from the cookie', async () => {
		const userId = await makeUser();
		const { user } = await device(userId);
		expect(user?.id).toBe(userId);
	});
});

describe('the account page', () => {
	const event = (d: Awaited<ReturnType<typeof device>>, action?: string) =>
		fakeEvent({ path: action ? `/account?/${action}` : '/account', form: action ? {} : undefined, user: d.user, session: d.session, cookies: d.jar, routeId: '/account' });

	it("lists one's sessions, newest first, with this device marked", async () => {
		const userId = await makeUser();
		const first = await device(userId);
		const second = await device(userId);
		const page = (await accountLoad(event(second) as never)) as { sessions: { current: boolean; createdAt: Date; lastSeenAt: Date }[] };
		expect(page.sessions).toHaveLength(2);
		expect(page.sessions.map((s) => s.current)).toEqual([true, false]);
		expect(page.sessions[0].createdAt.getTime()).toBeGreaterThanOrEqual(page.sessions[1].createdAt.getTime());
		expect(JSON.stringify(page.sessions)).not.toContain(first.jar.get(lucia.sessionCookieName));
	});

	it('signs out every other device and keeps this one', async () => {
		const userId = await makeUser();
		const other = await device(userId);
		const here = await device(userId);
		expect((await run(() => accountActions.signOutOthers(event(here, 'signOutOthers') as never))).status).toBe(200);
		expect((await readSession(other.jar as never)).user).toBeNull();
		expect((await readSession(here.jar as never)).user?.id).toBe(userId);
	});

	it('signs out everywhere, this device included', async () => {
		const userId = await makeUser();
		const other = await device(userId);
		const here = await device(userId);
		const result = await run(() => accountActions.signOutEverywhere(event(here, 'signOutEverywhere') as never));
		expect(result.redirect).toBe('/sign-in');
		expect(await db.select().from(sessions).where(eq(sessions.userId, userId))).toEqual([]);
		expect((await readSession(other.jar as never)).user).toBeNull();
		expect(here.jar.get(lucia.sessionCookieName)).toBeFalsy();
	});
});

describe('changing the password on the account page', () => {
	const change = (d: Awaited<ReturnType<typeof device>>, form: Record<string, string>, address = '192.0.2.150') =>
		run(() => accountActions.changePassword(fakeEvent({ path: '/account?/changePassword', form, user: d.user, session: d.session, cookies: d.jar, address, routeId: '/account' }) as never));

	it('needs the current password, refuses common ones, and ends the other sessions', async () => {
		const userId = await makeUser();
		const other = await device(userId);
		const here = await device(userId);

		const wrong = await change(here, { current: 'not it', password: 'a newer passphrase', confirm: 'a newer passphrase' });
		expect(wrong.status).toBe(400);
		expect(wrong.value.errors.current).toMatch(/not your current password/);

		// OWASP ASVS 5.0 V6.2.4 (from memory): the common-password check applies to changes too.
		const weak = await change(here, { current: 'a good passphrase', password: 'password', confirm: 'password' });
		expect(weak.status).toBe(400);
		expect(weak.value.errors.password).toMatch(/common/);

		expect((await change(here, { current: 'a good passphrase', password: 'a newer passphrase', confirm: 'a newer passphrase' })).status).toBe(200);
		const row = await db.query.users.findFirst({ where: eq(users.id, userId) });
		const { verifyPassword } = await import('$lib/server/auth');
		expect(await verifyPassword(row!.passwordHash, 'a newer passphrase')).toBe(true);
		expect((await readSession(other.jar as never)).user).toBeNull();
		expect((await readSession(here.jar as never)).user?.id).toBe(userId);
	});

	it('counts wrong current passwords against the sign-in throttle', async () => {
		const userId = await makeUser();
		const here = await device(userId);
		const statuses = [];
		for (let i = 0; i < 12; i++) statuses.push((await change(here, { current: `guess ${i}`, password: 'a newer passphrase', confirm: 'a newer passphrase' }, `198.51.100.${i}`)).status);
		expect(statuses.filter((s) => s === 429).length).toBeGreaterThanOrEqual(2);
	});
});
