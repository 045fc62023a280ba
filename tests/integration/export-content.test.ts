// What the exports hold, as a spreadsheet or a script reads them: the per-sample log with each
// sample's latitude, longitude and altitude; the summary with the declaration, the fuel events
// and the notes; CSV and JSON in the same unit (the aircraft's display unit unless asked),
// stated in every column; times as ISO 8601 or "yyyy-mm-dd hh:mm:ss" UTC; and a byte-order mark
// only when asked for.
import { beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { db } from '$lib/server/db';
import { flightNotes, fuelEvents } from '$lib/server/db/schema';
import { GET as exportGET } from '../../src/routes/api/v1/flights/[id]/export/+server';
import { apiEvent, makeClub, upload, type Club } from './upload-fixture';
import { LITRES_PER_US_GALLON } from '$lib/units';

let club: Club;
let flightId: string;
const START = Date.UTC(2026, 6, 4, 9, 0, 0);
const SECONDS = 600;
// A straight track north-east from an invented field, climbing 1 ft a second.
const lat = (i: number) => 47.2 + i * 0.0001;
const lon = (i: number) => -31.4 + i * 0.00015;
const alt = (i: number) => 240 + i;

beforeAll(async () => {
	club = await makeClub('Export Content Club');
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint,latitude,longitude,altitude_ft'];
	for (let i = 0; i <= SECONDS; i++) lines.push(`${new Date(START + i * 1000).toISOString()},9,95,${(20 - i / 40).toFixed(3)},NORTHMOOR,${lat(i).toFixed(6)},${lon(i).toFixed(6)},${alt(i)}`);
	const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: lines.join('\n') + '\n', declaration: 'onBoard', amount: '30', fields: { title: 'Export content', notes: 'Tanks dipped at the pumps.' } });
	expect(res.status, JSON.stringify(res.body)).toBe(201);
	flightId = res.body.flightId;
	await db.insert(fuelEvents).values({ flightId, t: new Date(START + 300_000), kind: 'added', amountL: 2 * LITRES_PER_US_GALLON, note: 'from a jerrycan' });
	await db.insert(flightNotes).values({ flightId, authorId: club.pilot.id, t: new Date(START + 120_000), body: '=cmd: rough running at the hold' });
});

async function exportOf(query: string) {
	const e = apiEvent(new Request(`http://127.0.0.1:4173/api/v1/flights/${flightId}/export${query}`), club.viewer) as unknown as { params: Record<string, string> };
	e.params = { id: flightId };
	const res = await exportGET(e as never);
	expect(res.status).toBe(200);
	return res;
}
const table = (text: string) => Papa.parse<string[]>(text, { newline: '\r\n', delimiter: ',', skipEmptyLines: true }).data;

describe('the per-sample log', () => {
	it('has each sample’s latitude, longitude and altitude, in the screens’ words with units', async () => {
		const text = await (await exportOf('')).text();
		expect(text.charCodeAt(0)).not.toBe(0xfeff);
		const [header, ...rows] = table(text);
		expect(rows).toHaveLength(SECONDS + 1);
		const col = (name: string) => {
			expect(header, name).toContain(name);
			return header.indexOf(name);
		};
		// The aircraft's display unit (US gal) when none is asked for.
		expect(header.filter((h) => h.includes('(US gal)')).length).toBeGreaterThanOrEqual(5);
		for (const i of [0, 1, 299, SECONDS]) {
			expect(Number(rows[i][col('Latitude (°)')])).toBeCloseTo(lat(i), 6);
			expect(Number(rows[i][col('Longitude (°)')])).toBeCloseTo(lon(i), 6);
			expect(Number(rows[i][col('Altitude (ft)')])).toBe(alt(i));
			expect(rows[i][col('Time (UTC)')]).toBe(new Date(START + i * 1000).toISOString());
		}
		// 30 US gal declared; 9 US gal/h for 300 s is 0.75 US gal; then 2 US gal added.
		expect(Number(rows[0][col('Fuel on board (US gal)')])).toBeCloseTo(30, 3);
		expect(Number(rows[SECONDS][col('Fuel on board (US gal)')])).toBeCloseTo(30 - 1.5 + 2, 2);
	});

	it('for a spreadsheet: a byte-order mark and times it reads as date and time', async () => {
		const res = await exportOf('?bom=true&times=spreadsheet&unit=l');
		const bytes = new Uint8Array(await res.arrayBuffer());
		// U+FEFF in UTF-8 (RFC 3629).
		expect(Array.from(bytes.slice(0, 3))).toEqual([0xef, 0xbb, 0xbf]);
		const [header, first] = table(new TextDecoder().decode(bytes.slice(3)));
		expect(header[0]).toBe('Time (UTC)');
		expect(first[0]).toBe('2026-07-04 09:00:00');
		expect(header).toContain('Fuel on board (L)');
	});
});

describe('the summary', () => {
	it('holds the declaration, the fuel events and the notes; CSV and JSON the same rows in the same unit', async () => {
		const csvText = await (await exportOf('?what=summary')).text();
		const [header, ...rows] = table(csvText);
		expect(header).toEqual(['Field', 'Value', 'Unit']);
		const value = (label: string) => rows.find((r) => r[0] === label);
		expect(value('Declared at engine start')?.[1]).toBe('Amount on board (dipstick or gauge)');
		expect(value('Declared amount')).toEqual(['Declared amount', '30', 'US gal']);
		expect(value('Fuel on board at engine start')).toEqual(['Fuel on board at engine start', '30', 'US gal']);
		expect(value('Fuel event 1')?.[1]).toBe('Fuel added');
		expect(value('Fuel event 1: time')).toEqual(['Fuel event 1: time', '2026-07-04T09:05:00.000Z', 'UTC']);
		expect(value('Fuel event 1: amount')).toEqual(['Fuel event 1: amount', '2', 'US gal']);
		expect(value('Fuel event 1: note')?.[1]).toBe('from a jerrycan');
		expect(value('Notes')?.[1]).toBe('Tanks dipped at the pumps.');
		// Someone's note that starts like a formula comes out neutralised (OWASP, CSV Injection).
		expect(value('Note 1')).toEqual(['Note 1', "'=cmd: rough running at the hold", 'by Pat Pilot']);
		expect(value('Fuel used')?.[2]).toBe('US gal');

		const json = await (await exportOf('?what=summary&format=json')).json();
		expect(json.unit).toEqual({ code: 'usgal', label: 'US gal' });
		expect(json.rows.map((r: { label: string; unit: string }) => [r.label, r.unit])).toEqual(rows.map((r) => [r[0], r[2]]));
		for (const [k, r] of json.rows.entries()) {
			const cell = rows[k][1];
			if (typeof r.value === 'number') expect(Number(cell), r.label).toBe(r.value);
			else if (r.value === null) expect(cell).toBe('');
			else expect(cell.replace(/^'(?=[=+\-@\t\r])/, ''), r.label).toBe(r.value);
		}
		expect(json.rows.find((r: { key: string }) => r.key === 'fuelEvent.1.amount').value).toBe(2);
	});

	it('in litres when asked, in both', async () => {
		const csv = table(await (await exportOf('?what=summary&unit=l')).text());
		const json = await (await exportOf('?what=summary&format=json&unit=l')).json();
		const csvAmount = csv.find((r) => r[0] === 'Fuel event 1: amount')!;
		// 2 US gal = 7.570823568 L (NIST Handbook 44, Appendix C: 1 US gal = 3.785411784 L).
		expect(csvAmount).toEqual(['Fuel event 1: amount', '7.571', 'L']);
		expect(json.rows.find((r: { key: string }) => r.key === 'fuelEvent.1.amount')).toMatchObject({ value: 7.571, unit: 'L' });
	});
});
