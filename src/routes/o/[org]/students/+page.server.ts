import { requireMember } from '$lib/server/access';
import { studentsOf } from '$lib/server/debriefs/students';
import type { PageServerLoad } from './$types';

// The signed-in instructor's students and their flights with this instructor.
export const load = (async (event) => {
	const { org, user } = await requireMember(event, event.params.org, 'annotate');
	return { students: await studentsOf(org.id, user.id) };
}) satisfies PageServerLoad;
