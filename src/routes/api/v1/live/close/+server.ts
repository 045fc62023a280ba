// A recorder ends its flight. See lib/server/live/api.ts.
import { requireRecorder } from '$lib/server/access';
import { handleClose } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async (event) => handleClose(event.request, await requireRecorder(event));
