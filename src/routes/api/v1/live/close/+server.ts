// A recorder ends its flight. See lib/server/live/api.ts.
import { handleClose } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ request }) => handleClose(request);
