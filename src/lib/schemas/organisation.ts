// Organisations, invitations and membership changes.
import { z } from 'zod';
import { ROLES } from '$lib/permissions';
import { email } from './account';

export const organisationSchema = z.object({
	name: z.string().trim().min(2, 'Use at least 2 characters.').max(80, 'Use at most 80 characters.')
});

export const role = z.enum(ROLES, 'Choose a role.');

export const invitationSchema = z.object({ email, role });

export const memberRoleSchema = z.object({ userId: z.string().min(1), role });
export const memberRemoveSchema = z.object({ userId: z.string().min(1) });
