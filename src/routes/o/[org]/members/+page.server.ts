import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/access';
import { changeMembership, inviteMember, listMembers, listPendingInvitations, revokeInvitation } from '$lib/server/services/organisations';
import { failForm, parseForm } from '$lib/schemas/form';
import { invitationSchema, memberRemoveSchema, memberRoleSchema } from '$lib/schemas/organisation';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { org } = await requireMember(event, event.params.org, 'manageMembers');
	const [members, pending] = await Promise.all([listMembers(org.id), listPendingInvitations(org.id)]);
	return { members, pending: pending.map((i) => ({ id: i.id, email: i.email, role: i.role, expiresAt: i.expiresAt })) };
}) satisfies PageServerLoad;

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
		const { org, user } = await requireMember(event, event.params.org, 'manageMembers');
		const form = parseForm(memberRoleSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'role');
		const outcome = await changeMembership(org.id, user.id, form.data.userId, form.data.role);
		if (outcome === 'not-allowed') error(403, 'Your role in this organisation does not allow that.');
		if (outcome === 'last-admin') return failForm(400, { role: 'The organisation needs at least one admin.' }, form.values, 'role');
		return { action: 'role' };
	},
	remove: async (event) => {
		const { org, user } = await requireMember(event, event.params.org, 'manageMembers');
		const form = parseForm(memberRemoveSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'remove');
		const outcome = await changeMembership(org.id, user.id, form.data.userId, null);
		if (outcome === 'not-allowed') error(403, 'Your role in this organisation does not allow that.');
		if (outcome === 'last-admin') return failForm(400, { userId: 'The organisation needs at least one admin.' }, form.values, 'remove');
		return { action: 'remove' };
	},
	revoke: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageMembers');
		const id = String((await event.request.formData()).get('id') ?? '');
		if (!z.uuid().safeParse(id).success) return failForm(400, { id: 'Unknown invitation.' }, {}, 'revoke');
		await revokeInvitation(org.id, id);
		return { action: 'revoke' };
	}
} satisfies Actions;
