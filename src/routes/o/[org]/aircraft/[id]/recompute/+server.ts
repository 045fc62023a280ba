import { json } from '@sveltejs/kit';
import { requireAircraft } from '$lib/server/access';
import { latestRecompute } from '$lib/server/flights/recompute-jobs';
import type { RecomputeProgress } from '$lib/wire/recompute';
import type { RequestHandler } from './$types';

// The aircraft's newest recompute of its flights (done / total, running or ended), polled by the
// fuel pumped and calibration page while a new factor is applied. Who may read calibration reads it.
export const GET = (async (event) => {
	const { aircraft } = await requireAircraft(event, event.params.org, event.params.id, 'viewFuelRecords');
	return json({ job: await latestRecompute(aircraft.id) } satisfies { job: RecomputeProgress | null });
}) satisfies RequestHandler;
