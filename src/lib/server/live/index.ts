// Live flights on the server: recorder ingest (api.ts, ingest.ts), opening and closing flights
// (flights.ts, sweeper.ts), alarms and their e-mails (alarms.ts), and the fan-out to viewers
// (hub.ts, stream.ts). This file holds the one hub of this app instance and its start and stop.
import type { ServerInit } from '@sveltejs/kit';
import { sweepIntervalMs } from './config';
import { LiveHub } from './hub';
import { sweepIdleFlights } from './sweeper';

export { handleClose, handleOpen, handleSamples, RECORDER_TOKEN_PREFIX } from './api';
export { liveStream, parseAfter, resumeAfter } from './stream';
export { LiveHub } from './hub';

let hub: LiveHub | null = null;
let sweeper: ReturnType<typeof setInterval> | null = null;
let shutdownHooked = false;

function hookShutdown(): void {
	if (shutdownHooked) return;
	shutdownHooked = true;
	// adapter-node emits this once the server stopped taking requests; the LISTEN connection
	// would otherwise keep `node build` from exiting.
	process.once('sveltekit:shutdown', () => {
		void stopLive();
	});
}

/** This instance's hub; its LISTEN connection opens with the first viewer. */
export function liveHub(): LiveHub {
	if (!hub) {
		hub = new LiveHub();
		hookShutdown();
	}
	return hub;
}

/** Starts the idle sweeper (once). Called from the server's init hook and by the ingest routes. */
export function startLive(): void {
	if (sweeper) return;
	hookShutdown();
	sweeper = setInterval(() => {
		sweepIdleFlights().catch((error) => console.error('[live] idle sweep failed:', (error as Error).message));
	}, sweepIntervalMs());
	sweeper.unref?.();
}

export async function stopLive(): Promise<void> {
	if (sweeper) clearInterval(sweeper);
	sweeper = null;
	const h = hub;
	hub = null;
	await h?.stop();
}

/** For src/hooks.server.ts: `export { init } from '$lib/server/live';` */
export const init: ServerInit = () => {
	startLive();
};
