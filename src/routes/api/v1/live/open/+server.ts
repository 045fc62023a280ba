// A recorder starts a flight, optionally with the start-of-flight declaration. See lib/server/live/api.ts.
import { handleOpen, startLive } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ request }) => {
	startLive();
	return handleOpen(request);
};
