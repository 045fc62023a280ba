// The replay page in the browser against the built app: open a flight from the list, scrub and
// read the figures (checked against the fuel engine run here on the same samples), correct the
// start fuel and watch fuel on board change before and after saving, play back, annotate, and
// the page in a cockpit tablet's width at night. Screenshots go to test-results/.
import pg from 'pg';
import { expect, test, type Page } from '@playwright/test';
import { computeFlight, type FlightComputation } from '../../src/lib/fuel';
import { engineInputsOf, fuelSetupOf, type AircraftFuelSetup } from '../../src/lib/flight-inputs';
import { arrivalWords } from '../../src/lib/labels';
import { LITRES_PER_US_GALLON } from '../../src/lib/units';
import { generateFlight, insertFlight, WAYPOINTS } from '../integration/replay-fixture';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn } from './support';

const samples = generateFlight({ cruiseS: 4200, dropout: { at: 2500, seconds: 50 }, start: Date.UTC(2025, 3, 2, 9, 0, 0) / 1000 });
let flightId = '';
let setup: AircraftFuelSetup;

test.beforeAll(async () => {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		const { rows } = await client.query('select * from aircraft where id = $1', [DEMO_AIRCRAFT.trainer]);
		const a = rows[0];
		setup = fuelSetupOf({
			capacityL: a.capacity_l,
			lowerLevelL: a.lower_level_l,
			unusableL: a.unusable_l,
			densityKgPerL: a.density_kg_per_l,
			meterFactor: a.meter_factor,
			baselineCruiseLph: a.baseline_cruise_lph,
			lowFuelL: a.low_fuel_l,
			lowEnduranceMin: a.low_endurance_min,
			reserveRule: a.reserve_rule,
			reserveCustomMin: a.reserve_custom_min
		});
		flightId = await insertFlight(client, { orgId: a.org_id, aircraftId: a.id, pilotId: 'demo-pilot', title: 'replay check: Oxbow round trip', declaration: { kind: 'full' } }, samples);
	} finally {
		await client.end();
	}
});

/** The engine's answer for the fixture with a declaration, as the browser should show it. */
function engine(declaration: unknown): FlightComputation {
	const columns = { t: samples.t, flow: samples.flow, gs: samples.gs, dtg: samples.dtg, alt: samples.alt, wpt: Int32Array.from(samples.wpt, (w) => WAYPOINTS.indexOf(w!)) };
	return computeFlight({ columns, ...engineInputsOf(setup, { declaration, previousOnBoardL: null }, []) });
}
const gal = (litres: number) => litres / LITRES_PER_US_GALLON;
const figure = async (page: Page, id: string) => Number((await page.getByTestId(id).innerText()).replace(/[^0-9.\-]/g, ''));
/** A figure shown to `decimals` places is within half a unit of the last place of the engine's value. */
const near = (shown: number, exact: number, decimals: number) => expect(Math.abs(shown - exact)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
const url = () => `/o/${DEMO_ORG}/flights/${flightId}`;

async function openReplay(page: Page) {
	await page.goto(url());
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	await expect(page.locator('[data-chart="fuel"] canvas')).toBeVisible();
}

/** Moves the scrubber with the keyboard: Page Up is ten minutes on. */
async function scrubTo(page: Page, minutes: number) {
	const range = page.getByTestId('scrub-range');
	await range.focus();
	await page.keyboard.press('Home');
	for (let k = 0; k < minutes / 10; k++) await page.keyboard.press('PageUp');
}

test('open a flight from the list, scrub, and read figures that match the engine', async ({ page }) => {
	await page.setViewportSize({ width: 1366, height: 1000 });
	await signIn(page, DEMO_USERS.pilot);
	await page.goto(`/o/${DEMO_ORG}/flights?from=2025-04-02&to=2025-04-02`);
	await page.getByRole('link', { name: '2025-04-02 09:00' }).click();
	await expect(page).toHaveURL(url());
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	// The advisory caution and the reserve rule with its citation are on the page.
	await expect(page.getByTestId('caution')).toContainText('Advisory only.');
	await expect(page.getByTestId('reserve-rule')).toContainText('14 CFR 91.151(a)(1)');

	const c = engine({ kind: 'full' });
	// At the first sample: filled to full, 40 US gal usable on the demo trainer.
	await expect(page.getByTestId('fig-onboard')).toContainText('40.0');
	await expect(page.getByTestId('fig-phase')).toHaveText('Taxi');

	// Forty minutes in: cruise towards the second waypoint.
	await scrubTo(page, 40);
	await expect(page.getByTestId('scrub-time')).toHaveText('09:40:00');
	const i = samples.t.findIndex((t) => t === samples.t[0] + 2400);
	await expect(page.getByTestId('fig-phase')).toHaveText('Cruise');
	near(await figure(page, 'fig-onboard'), gal(c.onBoard[i]), 1);
	near(await figure(page, 'fig-used'), gal(c.used[i]), 1);
	near(await figure(page, 'fig-flow'), gal(c.flow[i]), 1);
	// Fuel left on arrival is rounded down (never more than the engine's figure).
	const arrivalShown = await figure(page, 'fig-arrival');
	expect(arrivalShown).toBeLessThanOrEqual(gal(c.arrivalL[i]) + 1e-9);
	expect(gal(c.arrivalL[i]) - arrivalShown).toBeLessThan(0.1 + 1e-9);
	await expect(page.getByTestId('fig-waypoint')).toHaveAttribute('data-arrival', arrivalWords[c.arrivalState[i]].id);
	const endurance = (await page.getByTestId('fig-endurance').innerText()).match(/(\d+):(\d\d)/)!;
	expect(Number(endurance[1]) * 60 + Number(endurance[2])).toBe(Math.floor(c.endurance[i] * 60));
	await expect(page.getByTestId('fig-wpt-name')).toHaveText(samples.wpt[i]!);

	// One sample on with the arrow key.
	await page.keyboard.press('ArrowRight');
	await expect(page.getByTestId('scrub-time')).toHaveText('09:40:01');

	// The recorder dropout is on the timeline; picking it moves the scrubber there.
	await page.getByTestId('timeline-list').getByRole('button', { name: /Recorder dropout/ }).click();
	await expect(page.getByTestId('scrub-time')).toHaveText('09:41:39');
	// From the top, so the sticky scrubber sits where it belongs in a full-page picture.
	await page.evaluate(() => window.scrollTo(0, 0));
	await page.screenshot({ path: 'test-results/replay-desktop.png', fullPage: true });

	// Switching units converts every figure: litres now.
	await page.getByTestId('unit-fuel').selectOption('l');
	await scrubTo(page, 40);
	near(await figure(page, 'fig-onboard'), c.onBoard[i], 1);
	await page.getByTestId('unit-fuel').selectOption('usgal');
});

test('correct the start fuel: figures change at once, and for everyone after saving', async ({ page, browser }) => {
	await page.setViewportSize({ width: 1366, height: 1000 });
	await signIn(page, DEMO_USERS.pilot);
	await openReplay(page);
	await scrubTo(page, 40);
	const before = await figure(page, 'fig-onboard');

	await page.getByTestId('fuel-inputs').locator('summary').click();
	await page.getByLabel('Amount on board (dipstick or gauge)').check();
	await page.getByTestId('decl-amount').fill('30');
	// Before saving: the preview already runs the engine with 30 US gal at engine start.
	await expect(page.getByTestId('preview-banner')).toBeVisible();
	await expect(page.getByTestId('decl-onboard')).toHaveText('30.0 US gal');
	await expect.poll(() => figure(page, 'fig-onboard')).toBeCloseTo(before - 10, 1);
	await page.screenshot({ path: 'test-results/replay-declaration-preview.png', fullPage: false });

	// More than the tanks hold is clamped, and the engine says so.
	await page.getByTestId('decl-amount').fill('55');
	await expect(page.getByTestId('decl-result')).toContainText('more than the usable capacity');
	await expect(page.getByTestId('engine-warnings')).toContainText('using the capacity');

	await page.getByTestId('decl-amount').fill('30');
	await page.getByTestId('decl-reason').fill('dipstick reading after landing');
	await page.getByTestId('decl-save').click();
	await expect(page.getByText('Saved. Everyone now sees these figures.')).toBeVisible();
	await expect(page.getByTestId('preview-banner')).toHaveCount(0);

	// The instructor, in another browser, sees the corrected figures.
	const other = await browser.newPage({ viewport: { width: 1366, height: 1000 } });
	await signIn(other, DEMO_USERS.instructor);
	await openReplay(other);
	const c = engine({ kind: 'onBoard', amountL: 30 * LITRES_PER_US_GALLON });
	await expect(other.getByTestId('fig-onboard')).toContainText('30.0');
	await expect(other.getByTestId('sum-shutdown')).toContainText(gal(c.onBoard[c.length - 1]).toFixed(1));
	// The correction is on record for everyone: from full to 30 US gal, and why.
	const latest = other.getByTestId('correction').first();
	await expect(latest).toContainText('Filled to full');
	await expect(latest.getByTestId('correction-to')).toContainText('Amount on board (dipstick or gauge) 30.0 US gal');
	await expect(latest.getByTestId('correction-reason')).toContainText('dipstick reading after landing');
	await other.close();

	// And the flights list shows the recomputed figure at shutdown.
	await page.goto(`/o/${DEMO_ORG}/flights?from=2025-04-02&to=2025-04-02`);
	await expect(page.getByTestId('flight-row')).toContainText(`${gal(c.onBoard[c.length - 1]).toFixed(1)} US gal`);

	// Put it back for the other tests.
	await openReplay(page);
	await page.getByTestId('fuel-inputs').locator('summary').click();
	await page.getByLabel('Filled to full').check();
	await page.getByTestId('decl-save').click();
	await expect(page.getByText('Saved. Everyone now sees these figures.')).toBeVisible();
});

test('add a refuel at the scrubbed moment, preview it, save it and remove it', async ({ page }) => {
	await page.setViewportSize({ width: 1366, height: 1000 });
	await signIn(page, DEMO_USERS.pilot);
	await openReplay(page);
	await page.getByTestId('fuel-inputs').locator('summary').click();
	await scrubTo(page, 80);
	const before = await figure(page, 'fig-onboard');
	await page.getByLabel('What happened').selectOption('added');
	await page.getByLabel('Amount', { exact: true }).fill('5');
	await expect(page.getByTestId('preview-banner')).toBeVisible();
	await expect.poll(() => figure(page, 'fig-onboard')).toBeCloseTo(before + 5, 1);
	await page.getByTestId('add-event').click();
	await expect(page.getByTestId('fuel-event')).toHaveCount(1);
	await expect(page.getByTestId('fuel-event')).toContainText('Fuel added 5.0 US gal');
	await expect(page.getByTestId('timeline-list')).toContainText('Fuel added');

	await page.getByRole('button', { name: 'Remove…' }).click();
	await expect(page.getByTestId('preview-banner')).toBeVisible();
	await page.getByRole('button', { name: 'Confirm removal' }).click();
	await expect(page.getByTestId('fuel-event')).toHaveCount(0);
});

test('play back at 60×, pick a moment on a chart, and annotate it as the instructor', async ({ page }) => {
	await page.setViewportSize({ width: 1366, height: 1000 });
	await signIn(page, DEMO_USERS.instructor);
	await openReplay(page);
	await page.getByRole('button', { name: '60×' }).click();
	await page.getByTestId('play').click();
	await page.waitForTimeout(1500);
	await page.getByTestId('play').click();
	const [h, m, s] = (await page.getByTestId('scrub-time').innerText()).split(':').map(Number);
	// About 90 flight seconds in 1.5 s of wall time; a slow machine gets fewer frames, never more.
	const elapsed = (h - 9) * 3600 + m * 60 + s;
	expect(elapsed).toBeGreaterThan(30);
	expect(elapsed).toBeLessThan(200);

	// A click in the middle of the flow chart moves the scrubber to about the middle of the flight.
	const chart = page.locator('[data-chart="flow"] .u-over');
	await chart.scrollIntoViewIfNeeded();
	const box = (await chart.boundingBox())!;
	await chart.click({ position: { x: box.width / 2, y: box.height / 2 } });
	const mid = (await page.getByTestId('scrub-time').innerText()).split(':').map(Number);
	const midS = (mid[0] - 9) * 3600 + mid[1] * 60 + mid[2];
	const span = samples.t[samples.t.length - 1] - samples.t[0];
	expect(Math.abs(midS - span / 2)).toBeLessThan(span * 0.05);

	await page.getByLabel('Add a note').fill('Leaned late in the climb; cruise flow fine after that.');
	await page.getByRole('button', { name: 'Add the note' }).click();
	await expect(page.getByTestId('note')).toContainText('Leaned late in the climb');
	await expect(page.getByTestId('timeline-list')).toContainText('Note by Ines Varga');
});

test('a viewer reads but cannot change; another organisation gets 404', async ({ page }) => {
	await signIn(page, DEMO_USERS.viewer);
	await openReplay(page);
	// No write-looking control: the fuel inputs in words, no greyed form, no details, trash or note form.
	await expect(page.getByTestId('fuel-inputs-readonly')).toBeVisible();
	await expect(page.getByTestId('fuel-inputs')).toHaveCount(0);
	await expect(page.locator('main form, main fieldset[disabled], main button[disabled]')).toHaveCount(0);
	await expect(page.getByTestId('flight-details')).toHaveCount(0);
	await expect(page.getByTestId('trash-flight')).toHaveCount(0);
	await expect(page.getByTestId('decl-save')).toHaveCount(0);
	await expect(page.getByTestId('note-form')).toHaveCount(0);

	await page.getByRole('button', { name: 'Sign out' }).click();
	await signIn(page, DEMO_USERS.other);
	const res = await page.goto(url());
	expect(res?.status()).toBe(404);
});

test('cockpit tablet width at night', async ({ page }) => {
	await page.addInitScript(() => localStorage.setItem('burndown-theme', 'dark'));
	await page.setViewportSize({ width: 768, height: 1024 });
	await signIn(page, DEMO_USERS.pilot);
	await openReplay(page);
	await expect(page.locator('html')).toHaveAttribute('data-theme', 'dark');
	await scrubTo(page, 60);
	// Nothing wider than the screen: the page does not scroll sideways.
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
	await page.screenshot({ path: 'test-results/replay-tablet-night.png', fullPage: false });
	await page.evaluate(() => window.scrollTo(0, 0));
	await page.screenshot({ path: 'test-results/replay-tablet-night-full.png', fullPage: true });
});
