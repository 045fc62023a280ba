import { and, count, eq } from 'drizzle-orm';
import { requireMember } from '$lib/server/access';
import { db } from '$lib/server/db';
import { invitations, memberships } from '$lib/server/db/schema';
import { inviteMember, listMembers, listPendingInvitations } from '$lib/server/services/organisations';
import { failForm, parseForm } from '$lib/schemas/form';
import { invitationSchema, memberRemoveSchema, memberRoleSchema } from '$lib/schemas/organisation';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { org } = await requireMember(event, event.params.org, 'manageMembers');
	const [members, pending] = await Promise.all([listMembers(org.id), listPendingInvitations(org.id)]);
	return { members, pending: pending.map((i) => ({ id: i.id, email: i.email, role: i.role, expiresAt: i.expiresAt })) };
}) satisfies PageServerLoad;

/** An organisation always keeps at least one admin. */
async function wouldLeaveNoAdmin(orgId: string, userId: string): Promise<boolean> {
	const [{ n }] = await db
		.select({ n: count() })
		.from(memberships)
		.where(and(eq(memberships.orgId, orgId), eq(memberships.role, 'admin')));
	const target = await db.query.memberships.findFirst({ where: and(eq(memberships.orgId, orgId), eq(memberships.userId, userId)) });
	return target?.role === 'admin' && n <= 1;
}

export const actions = {
	invite: async (event) => {
		const { org, user } = await requireMember(event, event.params.org, 'manageMembers');
		const form = parseForm(invitationSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'invite');
		const result = await inviteMember({ orgId: org.id, orgName: org.name, email: form.data.email, role: form.data.role, invitedBy: user, origin: event.url.origin });
		if (!result.sent) return { action: 'invite', already: result.already, email: form.data.email };
		return { action: 'invite', invited: form.data.email };
	},
	role: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageMembers');
		const form = parseForm(memberRoleSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'role');
		if (form.data.role !== 'admin' && (await wouldLeaveNoAdmin(org.id, form.data.userId)))
			return failForm(400, { role: 'The organisation needs at least one admin.' }, form.values, 'role');
		await db.update(memberships).set({ role: form.data.role }).where(and(eq(memberships.orgId, org.id), eq(memberships.userId, form.data.userId)));
		return { action: 'role' };
	},
	remove: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageMembers');
		const form = parseForm(memberRemoveSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'remove');
		if (await wouldLeaveNoAdmin(org.id, form.data.userId))
			return failForm(400, { userId: 'The organisation needs at least one admin.' }, form.values, 'remove');
		await db.delete(memberships).where(and(eq(memberships.orgId, org.id), eq(memberships.userId, form.data.userId)));
		return { action: 'remove' };
	},
	revoke: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageMembers');
		const id = String((await event.request.formData()).get('id') ?? '');
		await db.update(invitations).set({ revokedAt: new Date() }).where(and(eq(invitations.orgId, org.id), eq(invitations.id, id)));
		return { action: 'revoke' };
	}
} satisfies Actions;
