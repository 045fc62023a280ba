// Password reset and sign-up at the route boundary: throttled, the same answer whether or not an
// account exists, every link single-use and the others void once one is used, and a reset ends
// every other session and revokes the personal API tokens (OWASP Forgot Password Cheat Sheet;
// ASVS 5.0 V6.4: reset and account recovery).
import { describe, expect, it } from 'vitest';
import { and, eq, isNull } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { apiTokens, sessions, users } from '$lib/server/db/schema';
import { hashPassword, lucia, verifyPassword } from '$lib/server/auth';
import { backgroundSettled } from '$lib/server/mail';
import { hashToken } from '$lib/server/tokens';
import { RATE_LIMITS } from '$lib/server/throttle';
import { actions as resetRequestActions } from '../../src/routes/reset-password/+page.server';
import { actions as resetActions } from '../../src/routes/reset-password/[token]/+page.server';
import { actions as signUpActions } from '../../src/routes/sign-up/+page.server';
import { linksIn, mailTo } from '../helpers/mailbox';
import { CookieJar, fakeEvent, run } from './route-events';

let n = 0;
async function makeUser() {
	const id = `pr${Date.now().toString(36)}${n++}`;
	const email = `${id}@example.org`;
	await db.insert(users).values({ id, email, name: 'Reset Tester', passwordHash: await hashPassword('a good passphrase') });
	return { id, email };
}

async function askReset(email: string, address = '192.0.2.50') {
	const result = await run(() => resetRequestActions.default(fakeEvent({ path: '/reset-password', form: { email }, address }) as never));
	await backgroundSettled();
	return result;
}

const resetLinks = async (email: string) =>
	(await mailTo(email)).filter((m) => m.subject.includes('Reset')).flatMap(linksIn).filter((l) => l.includes('/reset-password/'));

async function useReset(link: string, password: string, cookies = new CookieJar()) {
	const token = new URL(link).pathname.split('/').at(-1)!;
	return run(() => resetActions.default(fakeEvent({ path: `/reset-password/${token}`, params: { token }, form: { password, confirm: password }, cookies }) as never));
}

describe('password reset requests', () => {
	it('answer the same for an account and for no account, and mail only the account', async () => {
		const u = await makeUser();
		const known = await askReset(u.email);
		const unknown = await askReset(`nobody-${u.id}@example.org`);
		expect(known).toEqual({ value: { sent: true, values: { email: u.email } }, status: 200 });
		expect(unknown).toEqual({ value: { sent: true, values: { email: `nobody-${u.id}@example.org` } }, status: 200 });
		expect(await resetLinks(u.email)).toHaveLength(1);
		expect(await mailTo(`nobody-${u.id}@example.org`)).toEqual([]);
	});

	it('are rate-limited per account, with the same answer when refused', async () => {
		const u = await makeUser();
		const answers = [];
		for (let i = 0; i < RATE_LIMITS['reset:account'].max + 3; i++) answers.push(await askReset(u.email, `198.51.100.${i}`));
		expect(new Set(answers.map((a) => JSON.stringify(a))).size).toBe(1);
		expect(await resetLinks(u.email)).toHaveLength(RATE_LIMITS['reset:account'].max);
	});

	it('are rate-limited per address across accounts', async () => {
		const address = '203.0.113.9';
		const emails = [];
		for (let i = 0; i < RATE_LIMITS['reset:address'].max + 2; i++) emails.push((await makeUser()).email);
		for (const e of emails) await askReset(e, address);
		const sent = (await Promise.all(emails.map(resetLinks))).filter((l) => l.length > 0).length;
		expect(sent).toBe(RATE_LIMITS['reset:address'].max);
	});
});

describe('using a reset link', () => {
	it('voids every other link, ends every other session and revokes the API tokens', async () => {
		const u = await makeUser();
		const other = await lucia.createSession(u.id, { createdAt: new Date() });
		await db.insert(apiTokens).values({ userId: u.id, name: 'upload script', tokenHash: hashToken(`bdk_${u.id}`) });
		await askReset(u.email, '192.0.2.61');
		await askReset(u.email, '192.0.2.62');
		const [older, newer] = await resetLinks(u.email);
		expect(older).not.toBe(newer);

		const mail = (await mailTo(u.email)).at(-1)!;
		expect(mail.text).toMatch(/signs you out everywhere/i);
		expect(mail.text).toMatch(/API tokens/);

		const cookies = new CookieJar();
		expect((await useReset(newer, 'brand new passphrase', cookies)).redirect).toBe('/');
		// The newer link cannot be used again, and the older one no longer works either.
		expect((await useReset(newer, 'another passphrase')).status).toBe(400);
		expect((await useReset(older, 'third passphrase')).status).toBe(400);

		const row = await db.query.users.findFirst({ where: eq(users.id, u.id) });
		expect(await verifyPassword(row!.passwordHash, 'brand new passphrase')).toBe(true);
		const left = await db.select().from(sessions).where(eq(sessions.userId, u.id));
		expect(left.map((s) => s.id)).not.toContain(other.id);
		expect(left).toHaveLength(1); // the one just started on this device
		expect(await db.select().from(apiTokens).where(and(eq(apiTokens.userId, u.id), isNull(apiTokens.revokedAt)))).toEqual([]);
	});
});

describe('sign-up', () => {
	const form = (email: string) => ({ name: 'Sam Newcomer', email, password: 'a fresh passphrase' });
	const signUp = async (email: string, address = '192.0.2.70') => {
		const result = await run(() => signUpActions.default(fakeEvent({ path: '/sign-up', form: form(email), address }) as never));
		await backgroundSettled();
		return result;
	};

	it('answers an existing address exactly like a new one, and e-mails the owner instead', async () => {
		const u = await makeUser();
		const fresh = `fresh-${u.id}@example.org`;
		const forNew = await signUp(fresh);
		const forExisting = await signUp(u.email);
		expect(forExisting.status).toBe(forNew.status);
		expect(JSON.stringify(forExisting.value).replace(u.email, 'X')).toBe(JSON.stringify(forNew.value).replace(fresh, 'X'));
		const owner = await mailTo(u.email);
		expect(owner).toHaveLength(1);
		expect(owner[0].text).toMatch(/already has a Burndown account/);
		// The existing account is untouched.
		const row = await db.query.users.findFirst({ where: eq(users.id, u.id) });
		expect(await verifyPassword(row!.passwordHash, 'a good passphrase')).toBe(true);
	});

	it('creates the account only from the e-mailed link', async () => {
		const email = `confirm-${Date.now().toString(36)}@example.org`;
		await signUp(email);
		expect(await db.query.users.findFirst({ where: eq(users.email, email) })).toBeUndefined();
		const link = linksIn((await mailTo(email)).at(-1)!).find((l) => l.includes('/sign-up/'))!;
		const token = new URL(link).pathname.split('/').at(-1)!;
		const { actions: confirmActions } = await import('../../src/routes/sign-up/[token]/+page.server');
		const cookies = new CookieJar();
		const done = await run(() => confirmActions.default(fakeEvent({ path: `/sign-up/${token}`, params: { token }, form: {}, cookies }) as never));
		expect(done.redirect).toBe('/orgs');
		expect(await db.query.users.findFirst({ where: eq(users.email, email) })).toMatchObject({ name: 'Sam Newcomer' });
		expect(cookies.get(lucia.sessionCookieName)).toBeTruthy();
		// Once only.
		expect((await run(() => confirmActions.default(fakeEvent({ path: `/sign-up/${token}`, params: { token }, form: {} }) as never))).status).toBe(400);
	});

	it('bounds sign-ups per client address', async () => {
		const address = '198.51.100.200';
		const statuses = [];
		for (let i = 0; i < RATE_LIMITS['sign-up:address'].max + 2; i++) statuses.push((await signUp(`bulk-${i}-${Date.now().toString(36)}@example.org`, address)).status);
		expect(statuses.filter((s) => s === 429)).toHaveLength(2);
	});
});

describe('common passwords', () => {
	// OWASP ASVS 5.0 V6.2.4 (from memory): new passwords are checked against at least the 3,000
	// most common; these two top every published list.
	it.each(['password', '12345678', 'P@ssw0rd', 'qwertyuiop'])('refuses %j at sign-up and at reset', async (weak) => {
		const email = `weak-${Date.now().toString(36)}${n++}@example.org`;
		const signUp = await run(() => signUpActions.default(fakeEvent({ path: '/sign-up', form: { name: 'Weak', email, password: weak }, address: '192.0.2.240' }) as never));
		expect(signUp.status).toBe(400);
		expect(signUp.value.errors.password).toMatch(/common/);
		await backgroundSettled();
		expect(await mailTo(email)).toEqual([]);

		const u = await makeUser();
		await askReset(u.email, '192.0.2.241');
		const [link] = await resetLinks(u.email);
		const reset = await useReset(link, weak);
		expect(reset.status).toBe(400);
		expect(reset.value.errors.password).toMatch(/common/);
		// The link is still good for a better password.
		expect((await useReset(link, 'a much better passphrase')).redirect).toBe('/');
	});
});
