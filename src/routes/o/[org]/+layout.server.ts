import { requireMember } from '$lib/server/access';
import type { LayoutServerLoad } from './$types';

// The organisation and the member's role, for navigation. Each page below checks access itself.
export const load = (async (event) => {
	const { org, role } = await requireMember(event, event.params.org);
	return { org: { id: org.id, name: org.name, slug: org.slug }, role };
}) satisfies LayoutServerLoad;
