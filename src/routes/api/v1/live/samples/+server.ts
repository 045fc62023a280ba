// A recorder's batch of samples (bearer recorder token; JSON or CSV lines). See lib/server/live/api.ts.
import { handleSamples, startLive } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ request, url }) => {
	startLive();
	return handleSamples(request, url);
};
