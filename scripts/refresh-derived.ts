// Recomputes the stored figures of flights written by an older derivation (see DERIVED_VERSION in
// src/lib/server/flights/summary.ts). npm start runs it after the migrations; quiet when nothing
// is stale.
//
//   DATABASE_URL=postgres://… tsx scripts/refresh-derived.ts
import { closeDb } from '../src/lib/server/db';
import { refreshStaleFlights } from '../src/lib/server/flights/refresh';

const started = Date.now();
try {
	const n = await refreshStaleFlights((done, total) => {
		if (done % 50 === 0 || done === total) console.log(`refresh: ${done} of ${total} flights recomputed`);
	});
	console.log(n === 0 ? 'refresh: stored figures are up to date' : `refresh: recomputed ${n} flight${n === 1 ? '' : 's'} in ${((Date.now() - started) / 1000).toFixed(1)} s`);
} finally {
	await closeDb();
}
