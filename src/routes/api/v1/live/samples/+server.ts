// A recorder's batch of samples (bearer recorder token; JSON or CSV lines). See lib/server/live/api.ts.
import { requireRecorder } from '$lib/server/access';
import { handleSamples, startLive } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => {
	startLive();
	return handleSamples(event.request, event.url, await requireRecorder(event));
};
