// Organisations, invitations, password resets and sign-in throttling against the real database
// and the test mail sink.
import { describe, expect, it } from 'vitest';
import { and, count, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { invitations, memberships, organisations, passwordResets, sessions, signInAttempts, users } from '$lib/server/db/schema';
import { hashPassword, lucia, verifyPassword, ARGON2_OPTIONS } from '$lib/server/auth';
import { acceptInvitation, createOrganisation, inviteMember, slugify } from '$lib/server/services/organisations';
import { completePasswordReset, requestPasswordReset } from '$lib/server/services/password-reset';
import { beginSignInAttempt, THROTTLE } from '$lib/server/throttle';
import { backgroundSettled } from '$lib/server/mail';
import { linksIn, mailTo } from '../helpers/mailbox';

let n = 0;
async function makeUser(name = 'Test User') {
	const id = `u${Date.now().toString(36)}${n++}`;
	const email = `${id}@example.org`;
	await db.insert(users).values({ id, email, name, passwordHash: await hashPassword('a good passphrase') });
	return { id, email, name };
}

describe('passwords', () => {
	it('hashes with argon2id at no less than the OWASP minimum', async () => {
		const hash = await hashPassword('correct horse battery staple');
		// OWASP Password Storage Cheat Sheet: argon2id, m=19456 KiB, t=2, p=1.
		expect(hash).toMatch(/^\$argon2id\$v=19\$m=(\d+),t=(\d+),p=(\d+)\$/);
		const [, m, t, p] = hash.match(/m=(\d+),t=(\d+),p=(\d+)/)!.map(Number);
		expect(m).toBeGreaterThanOrEqual(19456);
		expect(t).toBeGreaterThanOrEqual(2);
		expect(p).toBe(ARGON2_OPTIONS.parallelism);
		expect(await verifyPassword(hash, 'correct horse battery staple')).toBe(true);
		expect(await verifyPassword(hash, 'Correct horse battery staple')).toBe(false);
		expect(await verifyPassword('not a hash', 'x')).toBe(false);
	});
});

describe('organisations', () => {
	it('creates the organisation and its admin membership together, with a unique slug', async () => {
		const u = await makeUser();
		const a = await createOrganisation('Wrenmoor Gliding & Power', u.id);
		const b = await createOrganisation('Wrenmoor Gliding & Power', u.id);
		expect(a.slug).toBe('wrenmoor-gliding-power');
		expect(b.slug).toBe('wrenmoor-gliding-power-2');
		const m = await db.select().from(memberships).where(eq(memberships.orgId, a.id));
		expect(m).toEqual([expect.objectContaining({ userId: u.id, role: 'admin' })]);
	});

	it('rolls back the organisation when the membership cannot be written', async () => {
		const before = (await db.select({ n: count() }).from(organisations))[0].n;
		await expect(createOrganisation('Ghost Club', 'no-such-user')).rejects.toThrow();
		const after = (await db.select({ n: count() }).from(organisations))[0].n;
		expect(after).toBe(before);
	});

	it('slugifies accents and symbols', () => {
		expect(slugify('  Ærø Flyveklub — Nord ')).toBe('r-flyveklub-nord');
		expect(slugify('Club Aéro d’Été')).toBe('club-aero-d-ete');
		expect(slugify('!!!')).toBe('org');
	});
});

describe('invitations', () => {
	it('e-mails a link that joins the organisation once, with the invited role', async () => {
		const admin = await makeUser('Dana Admin');
		const org = await createOrganisation('Fallowmere Aero Club', admin.id);
		const invitee = await makeUser('Ira Invitee');
		await inviteMember({ orgId: org.id, orgName: org.name, email: invitee.email, role: 'instructor', invitedBy: admin, origin: 'http://127.0.0.1:4173' });

		const [mail] = await mailTo(invitee.email);
		expect(mail.subject).toBe('Join Fallowmere Aero Club on Burndown');
		const token = linksIn(mail)[0].split('/invite/')[1];
		expect(token).toMatch(/^inv_/);
		// Only the hash is stored.
		const stored = await db.select().from(invitations).where(eq(invitations.orgId, org.id));
		expect(stored[0].tokenHash).not.toContain(token);

		expect(await acceptInvitation(token, invitee)).toEqual({ orgSlug: org.slug });
		expect(await acceptInvitation(token, invitee)).toBeNull();
		const m = await db.select().from(memberships).where(and(eq(memberships.orgId, org.id), eq(memberships.userId, invitee.id)));
		expect(m.map((r) => r.role)).toEqual(['instructor']);
	});

	it('leaves the invitation unused when the membership insert fails', async () => {
		const admin = await makeUser();
		const org = await createOrganisation('Copper Hollow Flyers', admin.id);
		await inviteMember({ orgId: org.id, orgName: org.name, email: 'later@example.org', role: 'pilot', invitedBy: admin, origin: 'http://127.0.0.1:4173' });
		const token = linksIn((await mailTo('later@example.org')).at(-1)!)[0].split('/invite/')[1];
		await expect(acceptInvitation(token, { id: 'no-such-user', email: 'later@example.org' })).rejects.toThrow();
		const [inv] = await db.select().from(invitations).where(eq(invitations.orgId, org.id));
		expect(inv.acceptedAt).toBeNull();
	});
});

describe('password reset', () => {
	it('works once, changes the password and ends every session', async () => {
		const u = await makeUser();
		await lucia.createSession(u.id, { createdAt: new Date() });
		await requestPasswordReset(u.email, '192.0.2.40', 'http://127.0.0.1:4173');
		await backgroundSettled();
		const token = linksIn((await mailTo(u.email)).at(-1)!)[0].split('/reset-password/')[1];
		expect(await completePasswordReset(token, 'brand new passphrase')).toBe(u.id);
		expect(await completePasswordReset(token, 'another passphrase')).toBeNull();
		const row = await db.query.users.findFirst({ where: eq(users.id, u.id) });
		expect(await verifyPassword(row!.passwordHash, 'brand new passphrase')).toBe(true);
		expect((await db.select().from(sessions).where(eq(sessions.userId, u.id))).length).toBe(0);
		expect((await db.select().from(passwordResets).where(eq(passwordResets.userId, u.id)))[0].usedAt).not.toBeNull();
	});

	it('sends nothing for an unknown address', async () => {
		await requestPasswordReset('nobody-here@example.org', '192.0.2.40', 'http://127.0.0.1:4173');
		await backgroundSettled();
		expect(await mailTo('nobody-here@example.org')).toEqual([]);
	});
});

describe('sign-in throttle', () => {
	it('refuses an account after the limit of failures in the window, and not other accounts', async () => {
		const email = 'throttled@example.org';
		for (let i = 0; i < THROTTLE.perAccount - 1; i++) expect((await beginSignInAttempt(email, '192.0.2.10')).allowed).toBe(true);
		expect((await beginSignInAttempt(email, '192.0.2.11')).allowed).toBe(true);
		expect(await beginSignInAttempt(email, '192.0.2.99')).toEqual({ allowed: false, retryAfterMin: 15, scope: 'account' });
		expect((await beginSignInAttempt('someone-else@example.org', '192.0.2.99')).allowed).toBe(true);
		// Outside the window the failures no longer count.
		const later = new Date(Date.now() + THROTTLE.windowMs + 1000);
		expect((await beginSignInAttempt(email, '192.0.2.99', later)).allowed).toBe(true);
		// OWASP ASVS 2.2.1: at most 100 failed attempts per hour on one account.
		expect(THROTTLE.perAccount * (3_600_000 / THROTTLE.windowMs)).toBeLessThanOrEqual(100);
	});

	it('refuses an address that fails across many accounts', async () => {
		for (let i = 0; i < THROTTLE.perAddress; i++) await beginSignInAttempt(`spray${i}@example.org`, '198.51.100.7');
		expect(await beginSignInAttempt('fresh@example.org', '198.51.100.7')).toEqual({ allowed: false, retryAfterMin: 15, scope: 'address' });
		// The refused attempt is not recorded.
		expect((await db.select({ n: count() }).from(signInAttempts).where(eq(signInAttempts.address, '198.51.100.7')))[0].n).toBe(THROTTLE.perAddress);
	});
});
