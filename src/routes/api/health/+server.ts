import { json } from '@sveltejs/kit';
import { databaseReachable } from '$lib/server/health';
import type { RequestHandler } from './$types';

// Liveness and database reachability, for the test harness and load balancers. Public by design:
// it reveals nothing but "up".
export const GET: RequestHandler = async () => {
	if (await databaseReachable()) return json({ ok: true });
	return json({ ok: false }, { status: 503 });
};
