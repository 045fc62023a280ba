// Organisations, invitations and membership changes.
import { z } from 'zod';
import { ROLES } from '$lib/permissions';
import { email } from './account';
import { plainText } from './text';

export const organisationSchema = z.object({
	name: plainText(80, { min: 2 })
});

export const role = z.enum(ROLES, 'Choose a role.');

export const invitationSchema = z.object({ email, role });

export const memberRoleSchema = z.object({ userId: z.string().min(1), role });
export const memberRemoveSchema = z.object({ userId: z.string().min(1) });
