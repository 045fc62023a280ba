// Organisations, memberships and invitations: the multi-step writes run in one transaction each.
import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Role } from '$lib/permissions';
import { db, type Tx } from '../db';
import { invitations, memberships, organisations, users, type Invitation } from '../db/schema';
import { link, plainLine, sendMail } from '../mail';
import { hashToken, newToken } from '../tokens';

export const INVITATION_DAYS = 14;

export function slugify(name: string): string {
	const base = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 40);
	return base || 'org';
}

/** Creates the organisation and makes its creator the admin, atomically. */
export async function createOrganisation(name: string, creatorId: string) {
	return db.transaction(async (tx) => {
		const base = slugify(name);
		let slug = base;
		for (let i = 2; ; i++) {
			const taken = await tx.query.organisations.findFirst({ where: eq(organisations.slug, slug), columns: { id: true } });
			if (!taken) break;
			slug = `${base}-${i}`;
		}
		const [org] = await tx.insert(organisations).values({ name, slug }).returning();
		await tx.insert(memberships).values({ orgId: org.id, userId: creatorId, role: 'admin' });
		return org;
	});
}

export async function listMemberships(userId: string) {
	return db
		.select({ slug: organisations.slug, name: organisations.name, role: memberships.role })
		.from(memberships)
		.innerJoin(organisations, eq(organisations.id, memberships.orgId))
		.where(eq(memberships.userId, userId))
		.orderBy(organisations.name);
}

export async function listMembers(orgId: string) {
	return db
		.select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, since: memberships.createdAt })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(eq(memberships.orgId, orgId))
		.orderBy(users.name);
}

export async function listPendingInvitations(orgId: string) {
	return db
		.select()
		.from(invitations)
		.where(and(eq(invitations.orgId, orgId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
		.orderBy(invitations.createdAt);
}

/** Revokes a pending invitation of the organisation (an id of another organisation changes nothing). */
export async function revokeInvitation(orgId: string, invitationId: string): Promise<void> {
	await db.update(invitations).set({ revokedAt: new Date() }).where(and(eq(invitations.orgId, orgId), eq(invitations.id, invitationId)));
}

export type InviteResult = { sent: true; invitation: Invitation } | { sent: false; already: 'member' | 'pending' };

/**
 * Stores an invitation and e-mails its link (the token itself is only in the e-mail), unless the
 * address is a member already or has an open invitation: then nothing is stored or sent. The
 * organisation's row is locked meanwhile, so parallel invitations of one address send one mail.
 * The message is plain text, and the inviter-chosen names in it are bounded (plainLine).
 */
export async function inviteMember(opts: { orgId: string; orgName: string; email: string; role: Role; invitedBy: { id: string; name: string }; origin: string }): Promise<InviteResult> {
	const email = opts.email.toLowerCase();
	const token = newToken('inv_');
	const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600 * 1000);
	const result = await db.transaction(async (tx): Promise<InviteResult> => {
		await lockOrganisation(tx, opts.orgId);
		const [member] = await tx
			.select({ userId: memberships.userId })
			.from(memberships)
			.innerJoin(users, eq(users.id, memberships.userId))
			.where(and(eq(memberships.orgId, opts.orgId), eq(users.email, email)))
			.limit(1);
		if (member) return { sent: false, already: 'member' };
		const [open] = await tx
			.select({ id: invitations.id })
			.from(invitations)
			.where(and(eq(invitations.orgId, opts.orgId), eq(invitations.email, email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
			.limit(1);
		if (open) return { sent: false, already: 'pending' };
		const [invitation] = await tx
			.insert(invitations)
			.values({ orgId: opts.orgId, email, role: opts.role, tokenHash: hashToken(token), invitedBy: opts.invitedBy.id, expiresAt })
			.returning();
		return { sent: true, invitation };
	});
	if (!result.sent) return result;
	const url = link(`/invite/${token}`, opts.origin);
	const orgName = plainLine(opts.orgName, 80);
	await sendMail({
		to: email,
		subject: `Join ${orgName} on Burndown`,
		text:
			`${plainLine(opts.invitedBy.name)} invites you to ${orgName} on Burndown as ${opts.role}.\n\n` +
			`Open this link to accept (valid ${INVITATION_DAYS} days). It works only for an account with this e-mail address (${email}):\n${url}\n\n` +
			`If you did not expect this, ignore this message.`
	});
	return result;
}

/**
 * Locks the organisation's row until the transaction ends: every change to its memberships and
 * invitations takes this lock first, so checks like "at least one admin" hold under concurrency.
 */
export async function lockOrganisation(tx: Tx, orgId: string): Promise<void> {
	await tx.select({ id: organisations.id }).from(organisations).where(eq(organisations.id, orgId)).for('update');
}

export async function findOpenInvitation(token: string): Promise<(Invitation & { orgName: string; orgSlug: string }) | null> {
	const [row] = await db
		.select({ invitation: invitations, orgName: organisations.name, orgSlug: organisations.slug })
		.from(invitations)
		.innerJoin(organisations, eq(organisations.id, invitations.orgId))
		.where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
		.limit(1);
	return row ? { ...row.invitation, orgName: row.orgName, orgSlug: row.orgSlug } : null;
}

/** Whether an account may use an invitation: only the invited address (proven at sign-up). */
export function invitationIsFor(invitation: Pick<Invitation, 'email'>, user: { email: string }): boolean {
	return invitation.email.toLowerCase() === user.email.toLowerCase();
}

/**
 * Accepts: marks the invitation used and adds (or upgrades nothing of) the membership in one
 * transaction; a second acceptance of the same link finds it used and changes nothing. Only the
 * account with the invited address may accept ('wrong-address' otherwise, nothing changed).
 */
export async function acceptInvitation(token: string, user: { id: string; email: string }): Promise<{ orgSlug: string } | 'wrong-address' | null> {
	return db.transaction(async (tx) => {
		const open = and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date()));
		const [found] = await tx.select({ orgId: invitations.orgId, email: invitations.email }).from(invitations).where(open).limit(1);
		if (!found) return null;
		if (!invitationIsFor(found, user)) return 'wrong-address';
		await lockOrganisation(tx, found.orgId);
		const [inv] = await tx.update(invitations).set({ acceptedAt: new Date(), acceptedBy: user.id }).where(open).returning();
		if (!inv) return null;
		await tx.insert(memberships).values({ orgId: inv.orgId, userId: user.id, role: inv.role }).onConflictDoNothing();
		const org = await tx.query.organisations.findFirst({ where: eq(organisations.id, inv.orgId), columns: { slug: true } });
		return { orgSlug: org!.slug };
	});
}

export type MemberChange = 'done' | 'last-admin' | 'not-allowed';

/**
 * Changes a member's role, or removes the member (role null), keeping at least one admin. Runs
 * under the organisation's row lock and re-reads the actor's role there: two admins demoting each
 * other at once are serialised, and the second finds either one admin left or itself no admin.
 */
export async function changeMembership(orgId: string, actorId: string, userId: string, role: Role | null): Promise<MemberChange> {
	return db.transaction(async (tx) => {
		await lockOrganisation(tx, orgId);
		const rows = await tx.select({ userId: memberships.userId, role: memberships.role }).from(memberships).where(eq(memberships.orgId, orgId));
		if (rows.find((r) => r.userId === actorId)?.role !== 'admin') return 'not-allowed';
		const target = rows.find((r) => r.userId === userId);
		if (!target) return 'done';
		const adminsAfter = rows.filter((r) => (r.userId === userId ? role === 'admin' : r.role === 'admin')).length;
		if (adminsAfter === 0) return 'last-admin';
		if (role === null) await tx.delete(memberships).where(and(eq(memberships.orgId, orgId), eq(memberships.userId, userId)));
		else await tx.update(memberships).set({ role }).where(and(eq(memberships.orgId, orgId), eq(memberships.userId, userId)));
		return 'done';
	});
}
