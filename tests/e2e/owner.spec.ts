// The owner's tools in the browser: the trainer's fuel history with the demo's full-rich trip
// marked against the aircraft's usual burn, and that trip compared with the leaned one of the same
// route. Screenshots go to test-results/.
import { expect, test } from '@playwright/test';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn } from './support';

const RICH = 'Merrow and back, never leaned';
const LEANED = 'Merrow and back, leaned in cruise';

test('the owner sees the rich trip marked, and its difference from the leaned trip at a glance', async ({ page }) => {
	await signIn(page, DEMO_USERS.admin);
	await page.goto(`/o/${DEMO_ORG}/aircraft/${DEMO_AIRCRAFT.trainer}`);
	await page.getByTestId('aircraft-history-link').click();
	await expect(page.getByTestId('history-table')).toBeVisible();
	await expect(page.getByTestId('burn-trend').locator('canvas').first()).toBeVisible();

	const rich = page.getByTestId('history-row').filter({ hasText: RICH });
	const leaned = page.getByTestId('history-row').filter({ hasText: LEANED });
	await expect(rich).toHaveAttribute('data-marked', '1');
	await expect(leaned).toHaveAttribute('data-marked', '0');
	// The extra fuel is quantified and a likely cause named, as a possibility.
	await expect(rich.getByTestId('high-burn')).toContainText(/cruise [\d.]+ US gal\/h over usual .* about [\d.]+ US gal extra/);
	await expect(rich.getByTestId('high-burn')).toContainText('mixture may not have been leaned');
	// The reserve column reads the flight's stored verdict, in the flights list's words.
	await expect(rich.getByTestId('history-verdict')).toHaveText(/^(Reserve kept|Landed below the reserve|No reserve amount to judge)/);
	await page.screenshot({ path: 'test-results/owner-history.png', fullPage: true });

	await leaned.getByRole('checkbox').check();
	await rich.getByRole('checkbox').check();
	await page.getByTestId('compare-selected').click();
	await expect(page).toHaveURL(/\/flights\/compare\?id=/);
	await expect(page.getByTestId('compare-flow').locator('canvas').first()).toBeVisible();
	// Newest first in the history, so the rich trip is the reference and the leaned one burns less.
	const cruise = page.getByTestId('compare-cruise');
	await expect(cruise.getByTestId('compare-delta')).toContainText(/−[\d.]+ US gal, flow −\d+\.\d %/);
	await page.screenshot({ path: 'test-results/owner-compare-rich-leaned.png', fullPage: true });
});

test('the maintenance viewer reads the history and gets no forms to change it', async ({ page }) => {
	await signIn(page, DEMO_USERS.viewer);
	await page.goto(`/o/${DEMO_ORG}/aircraft/${DEMO_AIRCRAFT.trainer}/history`);
	await expect(page.getByTestId('history-row').filter({ hasText: RICH })).toHaveAttribute('data-marked', '1');
	await expect(page.getByRole('button', { name: /Mark unusual/ })).toHaveCount(0);
	await expect(page.getByRole('heading', { name: 'High-burn settings' })).toHaveCount(0);
});

test('the owner records two fills, reconciles, applies the factor and sees the figures change, then sets it back by hand', async ({ page }) => {
	const LONG = 'The long way round against a headwind';
	const usedInList = async () => {
		await page.goto(`/o/${DEMO_ORG}/flights`);
		const row = page.getByTestId('flight-row').filter({ hasText: LONG });
		return (await row.getByTestId('flight-used').textContent())?.trim() ?? '';
	};
	await signIn(page, DEMO_USERS.admin);
	const before = await usedInList();
	await page.goto(`/o/${DEMO_ORG}/aircraft/${DEMO_AIRCRAFT.trainer}`);
	await page.getByTestId('aircraft-reconciliation-link').click();
	// The demo's own receipts already make one reconciliation.
	await expect(page.getByTestId('reconciliation-window')).toHaveCount(1);
	await expect(page.getByTestId('reconciliation-window').first().getByTestId('window-ratio')).toContainText('%');

	const receipt = page.getByTestId('receipt-form');
	for (const [at, amount] of [
		['2026-07-11T08:00', '20'],
		['2026-07-11T18:00', '30']
	]) {
		await receipt.getByLabel('When (UTC)').fill(at);
		await receipt.getByLabel('Amount').fill(amount);
		await receipt.getByLabel('Unit').selectOption('usgal');
		await receipt.getByLabel('Filled to full').selectOption('1');
		await receipt.getByRole('button', { name: 'Record' }).click();
		await expect(receipt.getByRole('status')).toHaveText('Receipt recorded.');
	}
	const newest = page.getByTestId('reconciliation-window').first();
	await expect(page.getByTestId('reconciliation-window')).toHaveCount(3);
	await expect(newest.getByTestId('window-pumped')).toHaveText('30.0 US gal');
	await expect(newest.getByTestId('window-flights')).toContainText(LONG, { useInnerText: false });

	await newest.getByRole('button', { name: 'Preview' }).click();
	await expect(newest.getByTestId('apply-preview')).toContainText(/Would apply: meter factor 1\.0000 → [\d.]+, .* to the \d+ flights? started from 2026-07-11 08:00/);
	const proposed = /1\.0000 → ([\d.]+)/.exec((await newest.getByTestId('apply-preview').innerText()) ?? '')![1];
	await newest.getByTestId('apply-confirm').click();
	await expect(page.getByTestId('reconciliation-window').first().getByTestId('apply-preview')).toContainText('Applied');
	await expect(page.getByTestId('calibration-row').first()).toHaveAttribute('data-source', 'reconciliation');
	await page.screenshot({ path: 'test-results/owner-reconciliation.png', fullPage: true });

	const after = await usedInList();
	expect(after).not.toBe(before);
	// Pumped 30.0 US gal against what was computed: after the factor the flight's fuel used is the pumped amount.
	expect(after).toBe('30.0 US gal');
	// The replay computes each flight with the factor in force at its engine start, and says which:
	// the new one for the flight in the window, the old one for a flight before it.
	const factorOf = async (title: string) => {
		await page.goto(`/o/${DEMO_ORG}/flights`);
		await page.getByTestId('flight-row').filter({ hasText: title }).getByRole('link').first().click();
		return (await page.getByTestId('meter-factor').locator('strong').innerText()).trim();
	};
	expect(Number(await factorOf(LONG))).toBeCloseTo(Number(proposed), 4);
	expect(await factorOf('Merrow and back, leaned in cruise')).toBe('1.0000');

	// Back by hand, dated from the same time: the history keeps both, the figures return.
	await page.goto(`/o/${DEMO_ORG}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation`);
	const hand = page.getByTestId('factors-form');
	await hand.getByLabel('Meter factor').fill('1');
	await hand.getByLabel('In force from (UTC)').fill('2026-07-11T08:00');
	await hand.getByRole('button', { name: 'Save to the history' }).click();
	// The flights of other tests since that day (a live flight, uploads) are covered too.
	await expect(hand.getByRole('status')).toContainText(/\d+ flights? recomputed/);
	await expect(page.getByTestId('calibration-row').first()).toHaveAttribute('data-source', 'hand');
	expect(await usedInList()).toBe(before);
});

test('the maintenance viewer reads receipts and calibration history, with no forms', async ({ page }) => {
	await signIn(page, DEMO_USERS.viewer);
	await page.goto(`/o/${DEMO_ORG}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation`);
	await expect(page.getByTestId('receipt-row').first()).toBeVisible();
	await expect(page.getByTestId('reconciliation-window').first()).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Calibration history' })).toBeVisible();
	await expect(page.getByTestId('receipt-form')).toHaveCount(0);
	await expect(page.getByTestId('apply-form')).toHaveCount(0);
	await expect(page.getByTestId('factors-form')).toHaveCount(0);
	await expect(page.getByRole('button', { name: 'Delete' })).toHaveCount(0);
});
