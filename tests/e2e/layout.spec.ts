// Layout at desk and tablet, in both themes, measured rather than eyeballed: the site header stays
// one row (a menu below 1280 px); on the replay page the player and the figures at the scrubber are
// in view without scrolling at 1440×900 and 1024×768, and once scrolled the sticky player never
// covers them; the in-flight controls are at least 44 px; the marks under the scrubber are named;
// on a portrait tablet the flights table keeps its date column in place and scrolls the rest.
// Screenshots go to test-results/layout-*.png.
import pg from 'pg';
import { expect, test, type Locator, type Page } from '@playwright/test';
import { generateFlight, insertFlight } from '../integration/replay-fixture';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn } from './support';

const SIZES = [
	{ name: 'desk', width: 1440, height: 900 },
	{ name: 'laptop', width: 1024, height: 768 },
	{ name: 'tablet-portrait', width: 768, height: 1024 }
] as const;
const THEMES = ['light', 'dark'] as const;
/** WCAG 2.5.5 (AAA) size, which we keep for the controls used in flight on a tablet. */
const IN_FLIGHT_TARGET = 44;

const TITLE = 'layout check: Oxbow and back';
let flightId = '';
test.beforeAll(async () => {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		// Once per run: a worker restarted after a failure finds the flight already there.
		const existing = await client.query(`select id from flights where title = $1 and deleted_at is null limit 1`, [TITLE]);
		if (existing.rows.length > 0) return void (flightId = existing.rows[0].id as string);
		const { rows } = await client.query('select org_id from aircraft where id = $1', [DEMO_AIRCRAFT.trainer]);
		const samples = generateFlight({ cruiseS: 3000, dropout: { at: 1800, seconds: 60 }, start: Date.UTC(2025, 5, 3, 8, 0, 0) / 1000 });
		flightId = await insertFlight(client, { orgId: rows[0].org_id, aircraftId: DEMO_AIRCRAFT.trainer, pilotId: 'demo-pilot', title: TITLE }, samples);
	} finally {
		await client.end();
	}
});

type Box = { x: number; y: number; width: number; height: number };
async function box(l: Locator): Promise<Box> {
	const b = await l.boundingBox();
	expect(b, 'element has a box').not.toBeNull();
	return b!;
}
const overlap = (a: Box, b: Box) => a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
function inViewport(b: Box, vw: number, vh: number, what: string) {
	expect.soft(b.y, `${what} top in view`).toBeGreaterThanOrEqual(0);
	expect.soft(b.y + b.height, `${what} bottom in view`).toBeLessThanOrEqual(vh + 0.5);
	expect.soft(b.x, `${what} left in view`).toBeGreaterThanOrEqual(0);
	expect.soft(b.x + b.width, `${what} right in view`).toBeLessThanOrEqual(vw + 0.5);
}
async function atLeast(l: Locator, px: number, what: string) {
	const b = await box(l);
	expect.soft(b.height, `${what} height`).toBeGreaterThanOrEqual(px - 0.5);
	expect.soft(b.width, `${what} width`).toBeGreaterThanOrEqual(px - 0.5);
}

/** The header is one row: no taller than one 44 px control and its padding, every item on the same line. */
async function headerIsOneRow(page: Page, width: number) {
	const header = page.getByTestId('site-header');
	const h = await box(header);
	expect.soft(h.height, 'header height').toBeLessThanOrEqual(IN_FLIGHT_TARGET + 2 * 8 + 2);
	const items = header.locator(':scope > div > *:visible');
	const n = await items.count();
	for (let k = 0; k < n; k++) {
		const b = await box(items.nth(k));
		expect.soft(b.y + b.height, `header item ${k} inside the row`).toBeLessThanOrEqual(h.y + h.height + 0.5);
	}
	if (width >= 1280) {
		await expect.soft(page.getByTestId('nav-inline')).toBeVisible();
		await expect.soft(page.getByTestId('menu-button')).toBeHidden();
	} else {
		await expect.soft(page.getByTestId('nav-inline')).toBeHidden();
		const menu = page.getByTestId('menu-button');
		await atLeast(menu, IN_FLIGHT_TARGET, 'menu button');
		await menu.click();
		const panel = page.getByTestId('menu-panel');
		await expect.soft(panel.getByRole('link', { name: 'Flights' })).toBeVisible();
		// The open menu lies over the page; the header itself does not grow.
		expect.soft((await box(header)).height).toBeCloseTo(h.height, 0);
		await page.keyboard.press('Escape');
		await expect.soft(panel).toHaveCount(0);
	}
	await atLeast(header.getByRole('button', { name: 'Switch between day and night colours' }), IN_FLIGHT_TARGET, 'theme switch');
}

const FIGURES = ['fig-onboard', 'fig-endurance'] as const;
const MORE_FIGURES = ['fig-onboard', 'fig-endurance', 'fig-flow', 'fig-used'] as const;

for (const size of SIZES) {
	for (const theme of THEMES) {
		test(`${size.name} ${size.width}×${size.height}, ${theme}: header, replay player and figures${size.width === 768 ? ', flights table' : ''}`, async ({ page }) => {
			await page.addInitScript((t) => localStorage.setItem('burndown-theme', t), theme);
			await page.setViewportSize({ width: size.width, height: size.height });
			await signIn(page, DEMO_USERS.pilot);
			await page.goto(`/o/${DEMO_ORG}/flights/${flightId}`);
			await expect.soft(page.locator('html')).toHaveAttribute('data-theme', theme);
			await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
			await expect(page.locator('[data-chart="fuel"] canvas')).toBeVisible();
			await headerIsOneRow(page, size.width);

			const player = page.getByTestId('player');
			const range = page.getByTestId('scrub-range');
			// Nothing wider than the screen.
			expect.soft(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(size.width);

			// The marks under the slider are named: the recorder dropout is a "Data gap".
			const legend = page.getByTestId('scrub-legend');
			await expect.soft(legend.locator('[data-kind="gap"]')).toContainText('Data gap');
			const gapMark = page.getByTestId('scrub-marks').locator('[data-kind="gap"]').first();
			expect.soft((await box(gapMark)).height).toBeGreaterThanOrEqual(6);

			// Controls used in flight: 44 px at least.
			await atLeast(page.getByTestId('play'), IN_FLIGHT_TARGET, 'play');
			for (const name of ['1×', '10×', '60×']) await atLeast(page.getByRole('button', { name, exact: true }), IN_FLIGHT_TARGET, `speed ${name}`);
			await atLeast(page.getByRole('button', { name: 'One sample back' }), IN_FLIGHT_TARGET, 'one sample back');
			await atLeast(page.getByRole('button', { name: 'One sample on' }), IN_FLIGHT_TARGET, 'one sample on');
			expect.soft((await box(range)).height, 'slider height').toBeGreaterThanOrEqual(IN_FLIGHT_TARGET - 0.5);
			for (const id of ['unit-fuel', 'unit-distance', 'unit-speed']) expect.soft((await box(page.getByTestId(id))).height, id).toBeGreaterThanOrEqual(IN_FLIGHT_TARGET - 0.5);

			if (size.width >= 1024) {
				// Without scrolling: the player and the first figures are in view, and apart.
				await page.evaluate(() => window.scrollTo(0, 0));
				const p0 = await box(player);
				inViewport(p0, size.width, size.height, 'player');
				for (const id of FIGURES) {
					const f = await box(page.getByTestId(id));
					inViewport(f, size.width, size.height, id);
					expect.soft(overlap(p0, f), `${id} clear of the player`).toBe(false);
				}
				await page.screenshot({ path: `test-results/layout-replay-${size.width}-${theme}.png` });

				// Scrolled down to the timeline: the player sticks to the top and the figures stay
				// in view below it, never under it.
				await page.evaluate(() => {
					const timeline = document.querySelector('[data-testid="timeline"]')!.closest('.card')!;
					const player = document.querySelector('[data-testid="player"]')!;
					window.scrollTo(0, timeline.getBoundingClientRect().top + window.scrollY - player.getBoundingClientRect().height);
				});
				await page.waitForTimeout(150);
				const column = await box(page.getByTestId('figures-column'));
				const p1 = await box(player);
				expect.soft(p1.y, 'player stuck to the top').toBeLessThanOrEqual(1);
				expect.soft(await page.evaluate(() => window.scrollY), 'the page did scroll').toBeGreaterThan(300);
				for (const id of MORE_FIGURES) {
					const f = await box(page.getByTestId(id));
					inViewport(f, size.width, size.height, `${id} after scrolling`);
					expect.soft(f.y, `${id} below the player`).toBeGreaterThanOrEqual(p1.y + p1.height);
					// …and not cut off by the figures column, which scrolls on its own.
					expect.soft(f.y + f.height, `${id} inside its column`).toBeLessThanOrEqual(column.y + column.height + 0.5);
				}
				await page.screenshot({ path: `test-results/layout-replay-${size.width}-${theme}-scrolled.png` });
			} else {
				await page.evaluate(() => window.scrollTo(0, 0));
				await page.screenshot({ path: `test-results/layout-replay-${size.width}-${theme}.png` });

				// Portrait tablet: the flights table keeps the date in place and scrolls the rest.
				await page.goto(`/o/${DEMO_ORG}/flights`);
				await headerIsOneRow(page, size.width);
				expect.soft(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(size.width);
				const scroller = page.getByTestId('flight-table-scroll');
				const sb = await box(scroller);
				const heads = page.getByTestId('flight-table').locator('thead th');
				// The priority columns are in view without scrolling sideways.
				for (const name of ['Date', 'Aircraft', 'Reserve at landing', 'On board at shutdown']) {
					const th = await box(heads.filter({ hasText: name }));
					expect.soft(th.x + th.width, `${name} column in view`).toBeLessThanOrEqual(sb.x + sb.width + 0.5);
				}
				const date = page.getByTestId('flight-date').first();
				const before = await box(date);
				const scrollable = await scroller.evaluate((el) => el.scrollWidth - el.clientWidth);
				expect.soft(scrollable, 'the other columns scroll sideways').toBeGreaterThan(0);
				await scroller.evaluate((el) => (el.scrollLeft = el.scrollWidth));
				await page.waitForTimeout(50);
				const after = await box(date);
				expect.soft(after.x, 'date column stays put').toBeCloseTo(before.x, 0);
				// The last column is now in view, beside (not under) the date.
				const pilot = await box(heads.filter({ hasText: 'Pilot' }));
				expect.soft(pilot.x + pilot.width).toBeLessThanOrEqual(sb.x + sb.width + 0.5);
				expect.soft(pilot.x).toBeGreaterThanOrEqual(after.x + after.width - 0.5);
				await page.screenshot({ path: `test-results/layout-flights-${size.width}-${theme}.png` });
			}
		});
	}
}
