// Loads the demo flights from samples/ through the same ingest path an upload takes.
// Filled in once the ingest service lands; until then the demo has aircraft and no flights.
export async function loadDemoFlights(): Promise<number> {
	return 0;
}
