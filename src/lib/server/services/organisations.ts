// Organisations, memberships and invitations: the multi-step writes run in one transaction each.
import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Role } from '$lib/permissions';
import { db } from '../db';
import { invitations, memberships, organisations, users, type Invitation } from '../db/schema';
import { link, sendMail } from '../mail';
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

/** Stores an invitation and e-mails its link. The token itself is only in the e-mail. */
export async function inviteMember(opts: { orgId: string; orgName: string; email: string; role: Role; invitedBy: { id: string; name: string }; origin: string }) {
	const token = newToken('inv_');
	const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600 * 1000);
	const [invitation] = await db
		.insert(invitations)
		.values({ orgId: opts.orgId, email: opts.email, role: opts.role, tokenHash: hashToken(token), invitedBy: opts.invitedBy.id, expiresAt })
		.returning();
	const url = link(`/invite/${token}`, opts.origin);
	await sendMail({
		to: opts.email,
		subject: `Join ${opts.orgName} on Burndown`,
		text: `${opts.invitedBy.name} invites you to ${opts.orgName} on Burndown as ${opts.role}.\n\nOpen this link to accept (valid ${INVITATION_DAYS} days):\n${url}\n\nIf you did not expect this, ignore this message.`,
		html: `<p>${escapeHtml(opts.invitedBy.name)} invites you to <strong>${escapeHtml(opts.orgName)}</strong> on Burndown as ${opts.role}.</p><p><a href="${url}">Accept the invitation</a> (valid ${INVITATION_DAYS} days).</p><p>If you did not expect this, ignore this message.</p>`
	});
	return invitation;
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

/**
 * Accepts: marks the invitation used and adds (or upgrades nothing of) the membership in one
 * transaction; a second acceptance of the same link finds it used and changes nothing.
 */
export async function acceptInvitation(token: string, userId: string): Promise<{ orgSlug: string } | null> {
	return db.transaction(async (tx) => {
		const [inv] = await tx
			.update(invitations)
			.set({ acceptedAt: new Date(), acceptedBy: userId })
			.where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
			.returning();
		if (!inv) return null;
		await tx.insert(memberships).values({ orgId: inv.orgId, userId, role: inv.role }).onConflictDoNothing();
		const org = await tx.query.organisations.findFirst({ where: eq(organisations.id, inv.orgId), columns: { slug: true } });
		return { orgSlug: org!.slug };
	});
}

export function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
