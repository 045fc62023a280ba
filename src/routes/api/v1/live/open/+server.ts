// A recorder starts a flight, optionally with the start-of-flight declaration. See lib/server/live/api.ts.
import { requireRecorder } from '$lib/server/access';
import { handleOpen, startLive } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	startLive();
	return handleOpen(event.request, await requireRecorder(event));
};
