// Size of the replay payload for the demo flights, with and without their positions, in each
// encoding (binary and JSON, plain and gzipped), and of the live stream's sample events (a
// minute of samples each): what the track on the map costs on the wire.
// Reads samples/ through the recorder-file parser and the one rows→columns builder; no database.
// A measurement that prints figures, not a test.
//
//   npx tsx scripts/bench-payload.ts
import fs from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { fileURLToPath } from 'node:url';
import { parseRecorderText } from '../src/lib/csv';
import { ColumnBuilder } from '../src/lib/fuel';
import { encodeBinary, encodeJson, PAYLOAD_VERSION, type ReplayData } from '../src/lib/wire/replay';
import { samplesEventOf, type SampleRunRows } from '../src/lib/wire/live';

const samplesDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', 'samples');
const kib = (n: number) => `${(n / 1024).toFixed(1)} KiB`;
const pct = (a: number, b: number) => `${b >= a ? '+' : ''}${(((b - a) / a) * 100).toFixed(0)} %`;

function payload(file: string, rows: Awaited<ReturnType<typeof parseRecorderText>> & { ok: true }, withPositions: boolean): ReplayData {
	const b = new ColumnBuilder(rows.rows.length);
	rows.rows.forEach((r, i) => b.push(r.seq ?? i, r.tMs, r.flow, r.gs, r.dtg, r.alt, r.wpt, withPositions ? r.lat : null, withPositions ? r.lon : null));
	return {
		version: PAYLOAD_VERSION,
		flight: { id: '00000000-0000-4000-8000-000000000000', title: file, status: 'closed', source: 'upload', startedAt: new Date(rows.rows[0].tMs).toISOString(), endedAt: null, lastSeq: b.length - 1, declarationConfirmed: true },
		aircraft: { id: '00000000-0000-4000-8000-000000000001', registration: 'BD-KTR', type: 'trainer', displayUnit: 'usgal', fuelType: 'avgas' },
		setup: { capacityL: 151.4, lowerLevelL: 98.4, unusableL: 11.4, densityKgPerL: 0.72, meterFactor: 1, baselineCruiseLph: 30, lowFuelL: null, lowEnduranceMin: 45, reserveRule: 'faa-91.151-vfr-day', reserveCustomMin: null },
		declaration: { kind: 'full' },
		previousOnBoardL: null,
		events: [],
		waypoints: b.waypoints(),
		count: b.length,
		hasAlt: b.hasAlt,
		hasWpt: b.hasWpt,
		hasPos: b.hasPos,
		columns: b.columns(),
		seq: b.seq()
	};
}

console.log('file · samples · binary before → after (gzip) · JSON before → after (gzip) · live events of 60 samples, JSON, all of them');
for (const file of fs.readdirSync(samplesDir).filter((f) => f.endsWith('.csv')).sort()) {
	const parsed = await parseRecorderText(fs.readFileSync(path.join(samplesDir, file), 'utf8'), null, { densityKgPerL: 0.72 });
	if (!parsed.ok) {
		console.log(`${file}: does not parse as it is (${parsed.problems.length} problems), skipped`);
		continue;
	}
	const before = payload(file, parsed, false);
	const after = payload(file, parsed, true);
	const bin = [encodeBinary(before), encodeBinary(after)];
	const json = [JSON.stringify(encodeJson(before)), JSON.stringify(encodeJson(after))].map((s) => Buffer.from(s));
	const gz = (x: Uint8Array) => gzipSync(x).length;
	const rows = parsed.rows;
	const run = (withPositions: boolean): SampleRunRows => ({
		tMs: rows.map((r) => r.tMs),
		flow: rows.map((r) => r.flow),
		gs: rows.map((r) => r.gs),
		dtg: rows.map((r) => r.dtg),
		alt: rows.map((r) => r.alt),
		wpt: rows.map((r) => r.wpt),
		...(withPositions ? { lat: rows.map((r) => r.lat), lon: rows.map((r) => r.lon) } : {})
	});
	const liveBytes = (withPositions: boolean) => {
		const r = run(withPositions);
		let total = 0;
		for (let a = 0; a < rows.length; a += 60) total += JSON.stringify(samplesEventOf(r, a, Math.min(rows.length, a + 60), 0, 0)).length;
		return total;
	};
	const live = [liveBytes(false), liveBytes(true)];
	console.log(
		`${file} · ${after.count} · ${after.hasPos ? 'positions' : 'no positions'} · ` +
			`binary ${kib(bin[0].length)} → ${kib(bin[1].length)} (${pct(bin[0].length, bin[1].length)}; gzip ${kib(gz(bin[0]))} → ${kib(gz(bin[1]))}) · ` +
			`JSON ${kib(json[0].length)} → ${kib(json[1].length)} (${pct(json[0].length, json[1].length)}; gzip ${kib(gz(json[0]))} → ${kib(gz(json[1]))}) · ` +
			`live ${kib(live[0])} → ${kib(live[1])} (${pct(live[0], live[1])})`
	);
}
