// The upload page in the browser against the built app: another recorder's file (BD-KTD's panel
// logger) mapped column by column with its units, the mapping saved as an import profile, both
// progress bars run to the end, and the replay opens on figures checked against the file itself.
// Then the same file again (recognised, back to that flight) and a broken file (every problem by
// line, nothing stored). Screenshots at a cockpit tablet's width go to test-results/.
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { expect, test, type Page } from '@playwright/test';
import { columnMappingSchema, parseRecorderText, profileMapping, type RecorderRow } from '../../src/lib/csv';
import { computeFlight, WPT_NONE, type FlightComputation, type SampleColumns } from '../../src/lib/fuel';
import { engineInputsOf, fuelSetupOf, type AircraftFuelSetup } from '../../src/lib/flight-inputs';
import { nearestIndex } from '../../src/lib/components/replay/series';
import { phaseLabels } from '../../src/lib/labels';
import { count, formatDuration } from '../../src/lib/format';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn } from './support';

const DIESEL_FILE = path.resolve('samples/kestrel-diesel-panel-log.csv');
const BROKEN_FILE = path.resolve('samples/kestrel-broken.csv');
const dieselText = fs.readFileSync(DIESEL_FILE, 'utf8');
const brokenText = fs.readFileSync(BROKEN_FILE, 'utf8');
const PROFILE_NAME = 'BD-KTD panel logger';
// Typed with a decimal comma, as a pilot with a European keyboard would.
const DECLARED_TEXT = '142,4';
const DECLARED_L = 142.4;

// What the mapper should end up with for this file: the test sets each control to these.
const MAPPING = columnMappingSchema.parse({
	delimiter: ';',
	decimal: ',',
	time: { column: 'Clock', format: 'clock', date: '2026-08-14', utcOffsetMin: 0 },
	flow: { column: 'Fuel flow (l/h)', unit: 'l/h' },
	gs: { column: 'Speed over ground (km/h)', unit: 'km/h' },
	dtg: { column: 'Distance remaining (km)', unit: 'km' },
	alt: { column: 'Altitude (m)', unit: 'm' },
	wpt: { column: 'Next WP' }
});

/** The aircraft's fuel setup as the engine takes it, named as in AircraftFuelSetup. */
const SETUP_COLUMNS = ['capacity_l', 'lower_level_l', 'unusable_l', 'density_kg_per_l', 'meter_factor', 'baseline_cruise_lph', 'low_fuel_l', 'low_endurance_min', 'reserve_rule', 'reserve_custom_min']
	.map((c) => `${c} as "${c.replace(/_(\w)/g, (_, ch: string) => ch.toUpperCase())}"`)
	.join(', ');
const UPLOAD_URL = `/o/${DEMO_ORG}/flights/upload?aircraft=${DEMO_AIRCRAFT.diesel}`;
const TABLET = { width: 1024, height: 768 };

async function withDb<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		return await fn(client);
	} finally {
		await client.end();
	}
}

/** Flights and uploads of the diesel aircraft: what "nothing stored" is checked against. */
const storedFor = (aircraftId: string) =>
	withDb(async (c) => {
		const { rows } = await c.query<{ flights: number; uploads: number }>(
			'select (select count(*)::int from flights where aircraft_id = $1) as flights, (select count(*)::int from uploads where aircraft_id = $1) as uploads',
			[aircraftId]
		);
		return rows[0];
	});

/** The columns the way the server builds them from stored rows (ids in order of first appearance). */
function columnsOf(rows: RecorderRow[]): { columns: SampleColumns; waypoints: string[] } {
	const waypoints: string[] = [];
	const wpt = Int32Array.from(rows, (r) => {
		if (r.wpt === null) return WPT_NONE;
		if (!waypoints.includes(r.wpt)) waypoints.push(r.wpt);
		return waypoints.indexOf(r.wpt);
	});
	const col = (f: (r: RecorderRow) => number | null) => Float64Array.from(rows, (r) => f(r) ?? NaN);
	return { columns: { t: col((r) => r.tMs / 1000), flow: col((r) => r.flow), gs: col((r) => r.gs), dtg: col((r) => r.dtg), alt: col((r) => r.alt), wpt }, waypoints };
}

const figure = async (page: Page, id: string) => Number((await page.getByTestId(id).innerText()).replace(/[^0-9.\-]/g, ''));
/** A figure shown to `decimals` places is within half a unit of its last place of the exact value. */
const near = (shown: number, exact: number, decimals: number) => expect(Math.abs(shown - exact)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
/** A figure card of the replay found by its label (ground speed and altitude carry no test id). */
const card = (page: Page, label: string) => page.getByTestId('fuel-figures').locator('div.rounded-lg', { has: page.getByText(label, { exact: true }) });
/** The cells of the file's line `line` (1-based), decimal commas read as points. */
const cellsAt = (text: string, line: number) => text.split(/\r?\n/)[line - 1].split(';');
const num = (cell: string) => Number(cell.replace(',', '.'));

async function openUpload(page: Page) {
	await page.goto(UPLOAD_URL);
	// The file input only reacts once the page is hydrated; nothing loads after that.
	await page.waitForLoadState('networkidle');
	await expect(page.getByTestId('upload-aircraft')).toHaveValue(DEMO_AIRCRAFT.diesel);
}

test('map another recorder’s columns, save the profile, upload with progress, scrub the replay', async ({ page }) => {
	test.setTimeout(90_000);
	const parsed = await parseRecorderText(dieselText, MAPPING);
	expect(parsed.ok, JSON.stringify(parsed.problems)).toBe(true);
	const rows = parsed.rows;
	const before = await storedFor(DEMO_AIRCRAFT.diesel);

	await page.setViewportSize(TABLET);
	await signIn(page, DEMO_USERS.pilot);
	await openUpload(page);
	await expect(page.getByTestId('upload-aircraft').locator('option:checked')).toHaveText(/^BD-KTD/);
	await page.getByTestId('upload-file').setInputFiles(DIESEL_FILE);

	// Not our format and no profile yet: the mapper opens with the file's columns and first rows.
	const mapper = page.getByTestId('column-mapper');
	await expect(mapper).toBeVisible();
	await expect(page.getByTestId('mode-manual')).toBeChecked();
	await expect(mapper.locator('caption')).toHaveText('Columns found on line 2, and the first rows');
	await expect(mapper.locator('thead th')).toHaveText(['Clock', 'Fuel flow (l/h)', 'Speed over ground (km/h)', 'Distance remaining (km)', 'Altitude (m)', 'Next WP']);

	await page.getByTestId('map-delimiter').selectOption(';');
	await page.getByTestId('map-decimal').selectOption(',');
	await page.getByTestId('map-time-column').selectOption('Clock');
	await page.getByTestId('map-time-format').selectOption('clock');
	await page.getByTestId('map-time-date').fill('');
	// Clock times alone do not say which day: the mapper asks before anything is read.
	await expect(page.getByTestId('mapping-error')).toHaveText('Clock times need the date of the flight.');
	await page.getByTestId('map-time-date').fill('2026-08-14');
	await page.getByTestId('map-time-offset').fill('0');
	await page.getByTestId('map-flow-column').selectOption('Fuel flow (l/h)');
	await page.getByTestId('map-flow-unit').selectOption('l/h');
	await page.getByTestId('map-gs-column').selectOption('Speed over ground (km/h)');
	await page.getByTestId('map-gs-unit').selectOption('km/h');
	await page.getByTestId('map-dtg-column').selectOption('Distance remaining (km)');
	await page.getByTestId('map-dtg-unit').selectOption('km');
	await page.getByTestId('map-alt-column').selectOption('Altitude (m)');
	await page.getByTestId('map-alt-unit').selectOption('m');
	await page.getByTestId('map-wpt-column').selectOption('Next WP');
	for (const f of ['lat', 'lon', 'seq']) await page.getByTestId(`map-${f}-column`).selectOption('');

	// The browser's trial read, in canonical units: km by 1 NM = 1852 m (BIPM), m by 1 ft = 0.3048 m.
	const trial = page.getByTestId('trial-rows');
	await expect(trial).toBeVisible();
	const firstCells = cellsAt(dieselText, 3);
	await expect(trial.locator('tbody tr').first().locator('td')).toHaveText([
		'3',
		'2026-08-14 23:05:00',
		num(firstCells[1]).toFixed(1),
		(num(firstCells[2]) / 1.852).toFixed(0),
		(num(firstCells[3]) / 1.852).toFixed(1),
		(num(firstCells[4]) / 0.3048).toFixed(0),
		firstCells[5]
	]);
	await expect(page.getByTestId('columns-section')).toContainText(`All ${count(rows.length)} samples of the file read cleanly.`);
	await page.getByTestId('columns-section').scrollIntoViewIfNeeded();
	await page.screenshot({ path: 'test-results/upload-mapper.png', fullPage: true });

	// Saved for the organisation: the page switches to the profile, which keeps no date of its own.
	await page.getByTestId('profile-name').fill(PROFILE_NAME);
	await page.getByTestId('profile-save').click();
	await expect(page.getByTestId('profile-applied')).toHaveText(`Applied automatically: this file's columns match "${PROFILE_NAME}".`);
	await expect(page.getByTestId('upload-profile').locator('option:checked')).toHaveText(`${PROFILE_NAME} (matches this file)`);
	const saved = await withDb(async (c) => (await c.query('select mapping from import_profiles where name = $1', [PROFILE_NAME])).rows);
	expect(saved).toHaveLength(1);
	expect(saved[0].mapping).toEqual(profileMapping(MAPPING));
	await expect(page.getByTestId('mapping-error')).toHaveText('This profile reads clock times: give the date of the flight.');
	await page.getByTestId('profile-time-date').fill('2026-08-14');
	await expect(page.getByTestId('trial-rows')).toBeVisible();

	await page.getByTestId('decl-onboard').check();
	await page.getByTestId('decl-amount').fill(DECLARED_TEXT);
	await page.getByTestId('upload-title').fill('Evening Saltmere turn-back (panel log)');

	// Every value both bars show, kept in the page: the replay opens by client-side navigation,
	// so the record outlives the upload page.
	await page.evaluate(() => {
		const seen = { sent: [] as number[], server: [] as number[], labels: [] as string[], stored: [] as string[] };
		(window as unknown as { uploadSeen: typeof seen }).uploadSeen = seen;
		const read = () => {
			const sent = document.querySelector<HTMLProgressElement>('[data-testid="progress-sent"]');
			const server = document.querySelector<HTMLProgressElement>('[data-testid="progress-server"]');
			const stored = document.querySelector('[data-testid="upload-stored"]');
			if (sent && sent.value !== seen.sent.at(-1)) seen.sent.push(sent.value);
			if (server && server.value !== seen.server.at(-1)) seen.server.push(server.value);
			const label = server?.parentElement?.querySelector('span')?.textContent?.trim();
			if (label && label !== seen.labels.at(-1)) seen.labels.push(label);
			if (stored?.textContent && stored.textContent !== seen.stored.at(-1)) seen.stored.push(stored.textContent.trim());
		};
		new MutationObserver(read).observe(document.body, { subtree: true, childList: true, attributes: true, characterData: true });
	});
	// A slow link (Chromium's own throttling, 64 KB/s up) so the transfer takes a few seconds.
	const cdp = await page.context().newCDPSession(page);
	await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 64 * 1024 });
	await page.getByTestId('upload-submit').click();
	await expect(page.getByTestId('progress-sent')).toBeVisible();
	await expect.poll(() => page.getByTestId('progress-sent').evaluate((p: HTMLProgressElement) => p.value)).toBeGreaterThan(10);
	await page.screenshot({ path: 'test-results/upload-progress.png', fullPage: false });

	await expect(page).toHaveURL(/\/flights\/[0-9a-f-]{36}$/, { timeout: 30_000 });
	await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
	const flightId = page.url().split('/').at(-1)!;
	const seen = await page.evaluate(() => (window as unknown as { uploadSeen: { sent: number[]; server: number[]; labels: string[]; stored: string[] } }).uploadSeen);
	// Both bars went forward only, from nothing to the end; the transfer was seen part-way.
	for (const bar of [seen.sent, seen.server]) {
		expect(bar[0]).toBe(0);
		expect(bar.every((v, k) => k === 0 || v >= bar[k - 1])).toBe(true);
		expect(bar.at(-1)).toBe(100);
	}
	expect(seen.sent.some((v) => v > 0 && v < 100)).toBe(true);
	// How many of the server's steps show depends on how its answer lines arrive (the browser reads
	// them once the body is sent), so only the end is certain; the rest goes into the report.
	test.info().annotations.push({ type: 'server progress seen', description: seen.labels.join(' → ') });
	expect(seen.labels.at(-1)).toBe('Done');
	expect(seen.stored).toContain(`Stored ${count(rows.length)} samples. Opening the flight…`);

	// Stored as mapped: the clock rolled past midnight into the next day, the amount read with its comma.
	const after = await storedFor(DEMO_AIRCRAFT.diesel);
	expect(after).toEqual({ flights: before.flights + 1, uploads: before.uploads + 1 });
	const [flight, aircraftRow] = await withDb(async (c) => [
		(await c.query('select started_at, ended_at, sample_count, declaration from flights where id = $1', [flightId])).rows[0],
		(await c.query<AircraftFuelSetup>(`select ${SETUP_COLUMNS} from aircraft where id = $1`, [DEMO_AIRCRAFT.diesel])).rows[0]
	]);
	expect(flight.started_at.toISOString()).toBe('2026-08-14T23:05:00.000Z');
	expect(flight.ended_at.toISOString()).toBe(new Date(rows.at(-1)!.tMs).toISOString());
	expect(flight.ended_at.toISOString().slice(0, 10)).toBe('2026-08-15');
	expect(flight.sample_count).toBe(rows.length);
	expect(flight.declaration).toEqual({ kind: 'onBoard', amountL: DECLARED_L });

	// The replay: the same engine run here on the file as parsed here.
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	const setup = fuelSetupOf(aircraftRow);
	const { columns, waypoints } = columnsOf(rows);
	const c: FlightComputation = computeFlight({ columns, ...engineInputsOf(setup, { declaration: { kind: 'onBoard', amountL: DECLARED_L }, previousOnBoardL: null }, []) });
	await expect(page.getByTestId('scrub-time')).toHaveText('23:05:00');
	// Litres are shown to a tenth ($lib/format PRECISION).
	expect(await figure(page, 'fig-onboard')).toBe(Math.round(DECLARED_L * 10) / 10);

	// Home, then three times Page Up (ten minutes each), then one sample on.
	const range = page.getByTestId('scrub-range');
	await range.focus();
	await page.keyboard.press('Home');
	let i = 0;
	for (let k = 0; k < 3; k++) {
		i = Math.max(i + 1, nearestIndex(columns.t, columns.t[i] + 600));
		await page.keyboard.press('PageUp');
	}
	await page.keyboard.press('ArrowRight');
	i += 1;
	const row = rows[i];
	const cells = cellsAt(dieselText, row.line);
	await expect(page.getByTestId('scrub-time')).toHaveText(cells[0]);
	expect(cells[0]).toBe('23:35:01');

	// Straight from the file's line: flow in L/h as written, km/h and metres converted exactly,
	// the waypoint as named, and the fuel used as the trapezoid sum of the flow cells up to here.
	near(await figure(page, 'fig-flow'), num(cells[1]), 1);
	await expect(card(page, 'Ground speed').locator('p.text-figure')).toHaveText(`${(num(cells[2]) / 1.852).toFixed(0)}kt`);
	await expect(card(page, 'Altitude').locator('p.text-figure')).toHaveText(`${count(Math.round(num(cells[4]) / 0.3048))}ft`);
	await expect(page.getByTestId('fig-wpt-name')).toHaveText(cells[5]);
	await expect(page.getByTestId('fig-waypoint')).toContainText(`${(num(cells[3]) / 1.852).toFixed(1)} NM to go`);
	const flowCells = dieselText.split(/\r?\n/).slice(2, 2 + i + 1).map((l) => num(l.split(';')[1]));
	let trapezoidL = 0;
	for (let k = 1; k < flowCells.length; k++) trapezoidL += ((flowCells[k - 1] + flowCells[k]) / 2) * ((rows[k].tMs - rows[k - 1].tMs) / 3_600_000);
	near(await figure(page, 'fig-used'), trapezoidL, 1);
	// Nothing added or removed on the way: on board is the declaration less what was used.
	near(await figure(page, 'fig-onboard'), DECLARED_L - trapezoidL, 1);

	// And every other figure as the engine gives it for this sample.
	near(await figure(page, 'fig-onboard'), c.onBoard[i], 1);
	near(await figure(page, 'fig-used'), c.used[i], 1);
	near(await figure(page, 'fig-flow'), c.flow[i], 1);
	// Fuel left on arrival is rounded down (never more than the engine's figure).
	expect(await figure(page, 'fig-arrival')).toBeLessThanOrEqual(c.arrivalL[i] + 1e-9);
	expect(c.arrivalL[i] - (await figure(page, 'fig-arrival'))).toBeLessThan(0.1 + 1e-9);
	near(await figure(page, 'fig-range'), c.specificRange[i], 2);
	await expect(page.getByTestId('fig-endurance')).toHaveText(`${formatDuration(c.endurance[i], { round: 'down' })}h:mm`);
	await expect(page.getByTestId('fig-time-to-wpt')).toHaveText(formatDuration(c.timeToWpt[i], { missing: '—' }));
	await expect(page.getByTestId('fig-phase')).toHaveText(phaseLabels[c.phase[i]]);
	expect(waypoints[columns.wpt![i]]).toBe(cells[5]);
	await page.evaluate(() => window.scrollTo(0, 0));
	await page.screenshot({ path: 'test-results/upload-replay.png', fullPage: true });
});

test('the same file again goes to its flight; a broken file lists its problems and stores nothing', async ({ page }) => {
	const existing = await withDb(
		async (c) => (await c.query<{ id: string }>("select id from flights where aircraft_id = $1 and started_at = '2026-08-14T23:05:00Z'", [DEMO_AIRCRAFT.diesel])).rows
	);
	expect(existing, 'the first test stores the diesel flight').toHaveLength(1);
	const before = await storedFor(DEMO_AIRCRAFT.diesel);

	await page.setViewportSize(TABLET);
	await signIn(page, DEMO_USERS.pilot);
	await openUpload(page);
	await page.getByTestId('upload-file').setInputFiles(DIESEL_FILE);
	// The saved profile is picked because the header matches; only the date is asked again.
	await expect(page.getByTestId('mode-profile')).toBeChecked();
	await expect(page.getByTestId('profile-applied')).toContainText(PROFILE_NAME);
	await page.getByTestId('profile-time-date').fill('2026-08-14');
	await expect(page.getByTestId('trial-rows')).toBeVisible();
	await page.getByTestId('columns-section').scrollIntoViewIfNeeded();
	await page.screenshot({ path: 'test-results/upload-profile.png', fullPage: false });
	await page.getByTestId('upload-submit').click();
	await expect(page).toHaveURL(`/o/${DEMO_ORG}/flights/${existing[0].id}?duplicate=1`, { timeout: 20_000 });
	await expect(page.getByTestId('duplicate-notice')).toContainText('uploaded before for BD-KTD');
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	expect(await storedFor(DEMO_AIRCRAFT.diesel)).toEqual(before);

	// The broken file, in our own format, for the same aircraft.
	const expected = await parseRecorderText(brokenText, null);
	expect(expected.ok).toBe(false);
	const lines = expected.problems.map((p) => p.line);
	// The file's seven planted faults (scripts/make-samples.ts), by line.
	expect(lines).toEqual([15, 61, 96, 131, 171, 201, 241]);

	await openUpload(page);
	await page.getByTestId('upload-file').setInputFiles(BROKEN_FILE);
	await expect(page.getByTestId('format-burndown')).toBeVisible();
	// The browser's trial read already names the first problems, and says what they mean.
	await expect(page.getByTestId('trial-problems-note')).toHaveText(
		`${expected.problemCount} problems in this file (the first 5 below). Burndown stores nothing of a file with problems: correct the file or the column mapping first.`
	);
	await expect(page.getByTestId('trial-problems').locator('li')).toHaveText(expected.problems.slice(0, 5).map((p) => `Line ${p.line}${p.column ? `, ${p.column}` : ''}: ${p.message}`));
	await page.getByTestId('upload-submit').click();
	const report = page.getByTestId('upload-problems');
	await expect(report).toBeVisible({ timeout: 20_000 });
	await expect(page.getByTestId('upload-error')).toHaveText('The file was not stored: 7 problems found.');
	await expect(report).toContainText('Nothing was stored. 7 problems:');
	const shown = report.locator('tbody tr');
	await expect(shown).toHaveCount(lines.length);
	await expect(shown.locator('td:first-child')).toHaveText(lines.map(String));
	for (const [k, p] of expected.problems.entries()) {
		await expect(shown.nth(k).locator('td')).toHaveText([String(p.line), p.column || '—', p.value || '—', p.message]);
	}
	expect(await storedFor(DEMO_AIRCRAFT.diesel)).toEqual(before);
	// The list is below the form; the answer beside the button leads to it.
	await page.getByRole('link', { name: 'See the problems by line' }).click();
	await expect(page.getByRole('heading', { name: 'Problems in kestrel-broken.csv' })).toBeInViewport();
	await page.screenshot({ path: 'test-results/upload-errors-view.png', fullPage: false });
	await page.screenshot({ path: 'test-results/upload-errors.png', fullPage: true });
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(TABLET.width);
});
