import { z } from 'zod';
import { requireMember } from '$lib/server/access';
import { studentsOf } from '$lib/server/debriefs/students';
import { removeWaitingPlan, waitingPlansOf } from '$lib/server/plans';
import { failForm, parseForm } from '$lib/schemas/form';
import type { Actions, PageServerLoad } from './$types';

// The signed-in instructor's students and their flights with this instructor, and the
// organisation's plans made before their flight, still waiting for it.
export const load = (async (event) => {
	const { org, user } = await requireMember(event, event.params.org, 'annotate');
	const [students, waiting] = await Promise.all([studentsOf(org.id, user.id), waitingPlansOf(org.id)]);
	return { students, waiting };
}) satisfies PageServerLoad;

const waitingIdSchema = z.object({ id: z.uuid('That plan is not waiting in this organisation.') });

export const actions = {
	removeWaiting: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'annotate');
		const form = parseForm(waitingIdSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'removeWaiting');
		if (!(await removeWaitingPlan(org.id, form.data.id))) return failForm(404, { id: 'That plan is not waiting in this organisation (already taken by a flight, or removed).' }, form.values, 'removeWaiting');
		return { action: 'removeWaiting', removed: true };
	}
} satisfies Actions;
