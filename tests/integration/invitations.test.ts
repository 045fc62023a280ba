// Invitations are bound to the invited address: only the account with that (proven) address can
// accept, whoever else holds the link. Inviting a member or an address already invited sends no
// second mail, and the mail carries the inviter's words as bounded plain text.
import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { memberships, users } from '$lib/server/db/schema';
import { hashPassword } from '$lib/server/auth';
import { createOrganisation, inviteMember } from '$lib/server/services/organisations';
import { actions as inviteActions } from '../../src/routes/invite/[token]/+page.server';
import { actions as memberActions } from '../../src/routes/o/[org]/members/+page.server';
import { linksIn, mailTo } from '../helpers/mailbox';
import { fakeEvent, run } from './route-events';

let n = 0;
async function makeUser(name = 'Test User') {
	const id = `iv${Date.now().toString(36)}${n++}`;
	const email = `${id}@example.org`;
	await db.insert(users).values({ id, email, name, passwordHash: await hashPassword('a good passphrase') });
	return { id, email, name, prefFuelUnit: null, timeZone: null };
}

async function setUp() {
	const admin = await makeUser('Dana Admin');
	const org = await createOrganisation(`Club ${admin.id}`, admin.id);
	return { admin, org };
}

const invite = (org: { slug: string }, admin: Awaited<ReturnType<typeof makeUser>>, email: string, role = 'instructor') =>
	run(() => memberActions.invite(fakeEvent({ path: `/o/${org.slug}/members?/invite`, params: { org: org.slug }, user: admin, form: { email, role }, routeId: '/o/[org]/members' }) as never));

const accept = (token: string, user: Awaited<ReturnType<typeof makeUser>>) =>
	run(() => inviteActions.accept(fakeEvent({ path: `/invite/${token}?/accept`, params: { token }, user, form: {}, routeId: '/invite/[token]' }) as never));

const tokenIn = async (email: string) => linksIn((await mailTo(email)).at(-1)!)[0].split('/invite/')[1];

describe('invitation acceptance', () => {
	it('refuses an account whose address is not the invited one, and lets the invited one join', async () => {
		const { admin, org } = await setUp();
		const invitee = await makeUser('Ira Invitee');
		const holder = await makeUser('Link Holder');
		await invite(org, admin, invitee.email);
		const token = await tokenIn(invitee.email);

		const refused = await accept(token, holder);
		expect(refused.status).toBe(403);
		expect(await db.select().from(memberships).where(and(eq(memberships.orgId, org.id), eq(memberships.userId, holder.id)))).toEqual([]);

		expect((await accept(token, invitee)).redirect).toBe(`/o/${org.slug}`);
		const m = await db.select().from(memberships).where(and(eq(memberships.orgId, org.id), eq(memberships.userId, invitee.id)));
		expect(m.map((r) => r.role)).toEqual(['instructor']);
	});
});

describe('inviting', () => {
	it('sends no second mail to a pending address, and says so', async () => {
		const { admin, org } = await setUp();
		const email = `pending-${admin.id}@example.org`;
		expect((await invite(org, admin, email)).value).toMatchObject({ invited: email });
		const again = await invite(org, admin, email);
		expect(again.value).toMatchObject({ action: 'invite', already: 'pending' });
		expect(await mailTo(email)).toHaveLength(1);
	});

	it('sends no mail to an existing member, and says so', async () => {
		const { admin, org } = await setUp();
		const again = await invite(org, admin, admin.email.toUpperCase());
		expect(again.value).toMatchObject({ action: 'invite', already: 'member' });
		expect(await mailTo(admin.email)).toEqual([]);
	});

	it('sends only one mail for parallel invitations of one address', async () => {
		const { admin, org } = await setUp();
		const email = `twice-${admin.id}@example.org`;
		await Promise.all([invite(org, admin, email), invite(org, admin, email), invite(org, admin, email)]);
		expect(await mailTo(email)).toHaveLength(1);
	});

	it('mails plain text only, with the inviter-chosen words bounded and on one line', async () => {
		const admin = await makeUser(`Eve ${'x'.repeat(300)}\nClick https://elsewhere.example now`);
		const org = await createOrganisation('Plain Text Flyers', admin.id);
		const email = `plain-${admin.id}@example.org`;
		await inviteMember({ orgId: org.id, orgName: org.name, email, role: 'pilot', invitedBy: admin, origin: 'http://127.0.0.1:4173' });
		const [mail] = await mailTo(email);
		expect(mail.html).toBeNull();
		const firstLine = mail.text.split('\n')[0];
		expect(firstLine.length).toBeLessThanOrEqual(200);
		expect(mail.text).not.toContain('x'.repeat(61));
		expect(mail.text).not.toMatch(/^Click https/m);
	});
});
