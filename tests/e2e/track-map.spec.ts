// The track on a map, on the replay and live pages: drawn for a flight whose samples carry
// positions, in step with the scrubber (the aircraft's marker moves as it moves, a click on the
// track moves the scrubber), with a scale bar and a north arrow and no tiles by default — so the
// browser asks nothing of any server but ours. A flight without positions shows no map at all.
// Screenshots at desk and tablet sizes in both themes go to test-results/.
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { expect, test, type Page } from '@playwright/test';
import { parseRecorderText } from '../../src/lib/csv';
import { generateFlight, insertFlight } from '../integration/replay-fixture';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn } from './support';

const o = `/o/${DEMO_ORG}`;
const CROSS_COUNTRY = 'Solo cross-country';

/** Every request the page makes, and a failure for any that would leave this machine. */
function onlyLoopback(page: Page): string[] {
	const outside: string[] = [];
	page.on('request', (r) => {
		const u = new URL(r.url());
		if (u.protocol === 'data:' || u.protocol === 'blob:') return;
		if (u.hostname !== '127.0.0.1') outside.push(r.url());
	});
	return outside;
}

async function flightPath(page: Page, title: string): Promise<string> {
	await page.goto(`${o}/flights`);
	const href = await page.getByTestId('flight-row').filter({ hasText: title }).getByRole('link').first().getAttribute('href');
	expect(href, title).toBeTruthy();
	return href!;
}

const marker = (page: Page) => page.locator('[data-testid="track-map-canvas"] path.track-position');
async function markerAt(page: Page): Promise<{ x: number; y: number }> {
	const box = await marker(page).boundingBox();
	expect(box, 'the aircraft marker is drawn').not.toBeNull();
	return { x: box!.x + box!.width / 2, y: box!.y + box!.height / 2 };
}

/** The map at the bottom of the window, clear of the sticky scrubber at the top. */
async function showMap(page: Page) {
	await page.getByTestId('track-map').evaluate((el) => el.scrollIntoView({ block: 'end' }));
}

async function mapReady(page: Page) {
	const canvas = page.getByTestId('track-map-canvas');
	await expect(canvas).toHaveAttribute('data-ready', 'true', { timeout: 15_000 });
	await expect(canvas.locator('path.track-flown')).toHaveCount(1);
	await expect(marker(page)).toHaveCount(1);
	// A scale bar in NM (and km), and north.
	await expect(page.getByTestId('map-scale')).toContainText(/\d NM/);
	await expect(page.getByTestId('map-scale')).toContainText(/\d km/);
	await expect(page.getByTestId('map-north')).toBeVisible();
	// No tiles are configured by default: the track draws on a plain background.
	await expect(canvas.locator('img.leaflet-tile')).toHaveCount(0);
}

test('replay: the track is drawn, follows the scrubber, and a click on it moves the scrubber', async ({ page }) => {
	test.setTimeout(90_000);
	const outside = onlyLoopback(page);
	await page.setViewportSize({ width: 1440, height: 900 });
	await signIn(page, DEMO_USERS.instructor);
	await page.goto(await flightPath(page, CROSS_COUNTRY));
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	await mapReady(page);

	// Gaps are dashed and named in the legend; the plan's waypoints sit where they were passed.
	await expect(page.getByTestId('legend-gap')).toContainText('Gap, no samples or no position');
	const labels = page.locator('[data-testid="track-map-canvas"] .track-label');
	await expect(labels.first()).toBeVisible();
	expect(await labels.allInnerTexts()).toEqual(expect.arrayContaining([expect.stringMatching(/^1 \S+/)]));

	// At the first sample the aircraft is at the start of the track.
	const range = page.getByTestId('scrub-range');
	await range.focus();
	await page.keyboard.press('Home');
	const caption = page.getByTestId('track-here');
	const startText = await caption.innerText();
	expect(startText).toMatch(/\d+\.\d{4}° [NS] \d+\.\d{4}° [EW]/);
	const before = await markerAt(page);

	// Forty minutes on, the marker and the caption have moved with the scrubber.
	for (let k = 0; k < 4; k++) await page.keyboard.press('PageUp');
	await expect(caption).not.toHaveText(startText);
	const after = await markerAt(page);
	expect(Math.hypot(after.x - before.x, after.y - before.y)).toBeGreaterThan(10);
	await expect(page.getByTestId('track-map-canvas')).not.toHaveAttribute('data-index', '0');

	// A click on the track — on a waypoint's mark, which sits on it — with the scrubber back at the
	// start moves the scrubber there (to the nearest sample) and the aircraft with it.
	await showMap(page);
	await range.focus();
	await page.keyboard.press('Home');
	const timeAtStart = await page.getByTestId('scrub-time').innerText();
	const waypoint = page.locator('[data-testid="track-map-canvas"] path.track-waypoint').nth(2);
	const centre = async () => {
		const box = await waypoint.boundingBox();
		expect(box, 'a waypoint mark').not.toBeNull();
		return { x: box!.x + box!.width / 2, y: box!.y + box!.height / 2 };
	};
	const there = await centre();
	await page.mouse.click(there.x, there.y);
	await expect(page.getByTestId('scrub-time')).not.toHaveText(timeAtStart);
	// Measured again: the page around the map may have moved as the figures changed.
	const mark = await centre();
	const picked = await markerAt(page);
	expect(Math.hypot(picked.x - mark.x, picked.y - mark.y)).toBeLessThan(4);

	// Keyboard users pass through the map: Tab goes in, through its buttons, and out again.
	await page.getByTestId('track-map-canvas').focus();
	let left = false;
	for (let k = 0; k < 8 && !left; k++) {
		await page.keyboard.press('Tab');
		left = await page.evaluate(() => document.activeElement !== null && !document.activeElement.closest('[data-testid="track-map-canvas"]'));
	}
	expect(left, 'Tab leaves the map').toBe(true);

	// Desk and tablet sizes, day and night.
	fs.mkdirSync('test-results', { recursive: true });
	for (const [w, h] of [
		[1440, 900],
		[1024, 768]
	]) {
		for (const theme of ['light', 'dark'] as const) {
			await page.evaluate((t) => localStorage.setItem('burndown-theme', t), theme);
			await page.setViewportSize({ width: w, height: h });
			await page.reload();
			await expect(page.locator('html')).toHaveAttribute('data-theme', theme);
			await mapReady(page);
			await range.focus();
			for (let k = 0; k < 3; k++) await page.keyboard.press('PageUp');
			expect(await page.evaluate(() => document.documentElement.scrollWidth), 'no sideways scroll').toBeLessThanOrEqual(w);
			await showMap(page);
			await page.screenshot({ path: path.join('test-results', `track-map-replay-${w}x${h}-${theme}.png`) });
		}
	}
	await page.evaluate(() => localStorage.removeItem('burndown-theme'));
	expect(outside, 'requests that left 127.0.0.1').toEqual([]);
});

test('replay: a recorder dropout in the air is drawn dashed, apart from the track flown', async ({ page }) => {
	const outside = onlyLoopback(page);
	await page.setViewportSize({ width: 1440, height: 900 });
	await signIn(page, DEMO_USERS.admin);
	await page.goto(await flightPath(page, 'recorder connector came loose'));
	await mapReady(page);
	const gap = page.locator('[data-testid="track-map-canvas"] path.track-gap');
	await expect(gap).toHaveCount(1);
	const box = await gap.boundingBox();
	// Not a dash of zero length at a stop: the aircraft moved during the dropout.
	expect(Math.max(box!.width, box!.height)).toBeGreaterThan(10);
	await expect(gap).toHaveAttribute('stroke-dasharray', /\d/);
	await showMap(page);
	await page.screenshot({ path: path.join('test-results', 'track-map-replay-dropout-1440x900-light.png') });
	expect(outside, 'requests that left 127.0.0.1').toEqual([]);
});

test('replay: a flight without positions shows no map and no empty box', async ({ page }) => {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	let flightId: string;
	try {
		const { rows } = await client.query('select org_id from aircraft where id = $1', [DEMO_AIRCRAFT.trainer]);
		flightId = await insertFlight(client, { orgId: rows[0].org_id, aircraftId: DEMO_AIRCRAFT.trainer, pilotId: 'demo-pilot', title: 'map check: no positions' }, generateFlight({ cruiseS: 600, start: Date.UTC(2024, 1, 3, 9, 0, 0) / 1000 }));
	} finally {
		await client.end();
	}
	await signIn(page, DEMO_USERS.pilot);
	await page.goto(`${o}/flights/${flightId}`);
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	await expect(page.locator('[data-chart="fuel"] canvas')).toBeVisible();
	await expect(page.getByTestId('track-map')).toHaveCount(0);
	await expect(page.locator('.leaflet-container')).toHaveCount(0);
});

// The trainer's demo recorder (scripts/demo-scenario.ts).
const TRAINER_RECORDER_TOKEN = 'bdr_demo_kestrel_trainer_0002';

test('live: no map until positions arrive, then the track grows and the marker follows the newest sample', async ({ page }) => {
	test.setTimeout(90_000);
	const outside = onlyLoopback(page);
	// A demo recording with positions, moved to now so it overlaps no stored flight.
	const parsed = await parseRecorderText(fs.readFileSync('samples/kestrel-local-training.csv', 'utf8'), null, { densityKgPerL: 0.72 });
	if (!parsed.ok) throw new Error('the demo recording does not parse');
	const shift = Date.now() - 3 * 3600_000 - parsed.rows[0].tMs;
	// The first 120 samples without a fix, as a recorder before its receiver has one.
	const sample = (i: number) => {
		const r = parsed.rows[i];
		const fix = i >= 120;
		return { seq: i, t: new Date(r.tMs + shift).toISOString(), flow: r.flow, gs: r.gs, dtg: r.dtg, alt: r.alt, wpt: r.wpt, lat: fix ? r.lat : null, lon: fix ? r.lon : null };
	};
	const recorder = { authorization: `Bearer ${TRAINER_RECORDER_TOKEN}`, 'content-type': 'application/json' };
	const send = async (flightId: string, from: number, to: number) => {
		for (let a = from; a < to; a += 300) {
			const res = await page.request.post('/api/v1/live/samples', { headers: recorder, data: { flightId, samples: Array.from({ length: Math.min(300, to - a) }, (_, k) => sample(a + k)) } });
			expect(res.status(), await res.text()).toBe(200);
		}
	};
	const opened = await page.request.post('/api/v1/live/open', { headers: recorder, data: { declaration: { kind: 'full' } } });
	expect(opened.status(), await opened.text()).toBe(201);
	const flightId = String((await opened.json()).flightId);
	try {
		await send(flightId, 0, 100);
		await page.setViewportSize({ width: 1024, height: 768 });
		await signIn(page, DEMO_USERS.instructor);
		await page.goto(`${o}/flights/${flightId}/live`);
		await expect(page.getByTestId('last-sample')).toContainText('100 samples', { timeout: 15_000 });
		await expect(page.getByTestId('fuel-figures')).toBeVisible();
		await expect(page.getByTestId('track-map')).toHaveCount(0);

		// Positions come: the map appears, the marker on the newest sample.
		await send(flightId, 100, 900);
		await expect(page.getByTestId('last-sample')).toContainText('900 samples', { timeout: 15_000 });
		await mapReady(page);
		await showMap(page);
		await expect(page.getByTestId('track-map-canvas')).toHaveAttribute('data-index', '899');
		expect(await markerAt(page)).toBeTruthy();
		// Samples 120 to 899 have a position.
		await expect(page.getByTestId('track-extent')).toContainText('780 positions');
		const firstText = await page.getByTestId('track-here').innerText();

		// More of the flight: the track grows and the marker moves on with it.
		await send(flightId, 900, 1800);
		await expect(page.getByTestId('last-sample')).toContainText(/1,?800 samples/, { timeout: 15_000 });
		await expect(page.getByTestId('track-map-canvas')).toHaveAttribute('data-index', '1799');
		// The map keeps the aircraft and the track in view (it pans or zooms out as the track grows),
		// so where the aircraft is and how long the track is are read from the caption.
		await expect(page.getByTestId('track-here')).not.toHaveText(firstText);
		await expect(page.getByTestId('track-extent')).toContainText(/1,?680 positions/);
		expect(await markerAt(page)).toBeTruthy();
		for (const theme of ['light', 'dark'] as const) {
			await page.evaluate((t) => localStorage.setItem('burndown-theme', t), theme);
			await page.reload();
			await mapReady(page);
			await showMap(page);
			await page.screenshot({ path: path.join('test-results', `track-map-live-1024x768-${theme}.png`) });
		}
		await page.evaluate(() => localStorage.removeItem('burndown-theme'));
	} finally {
		// Leave the recorder with no open flight for the tests after this one.
		await page.request.post('/api/v1/live/close', { headers: recorder, data: { flightId } });
	}
	expect(outside, 'requests that left 127.0.0.1').toEqual([]);
});
