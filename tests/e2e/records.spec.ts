// Flight records in the browser: the demo "Merrow and back" trip shows its two logbook legs (the
// engine-off stop at Merrow) in the list and on the replay, with each average flow beside the
// engine time it was divided by; splitting it at the stop and merging the parts back, each behind
// the shared confirmation; the trash linked from the flights list; and a member's removal asking
// first. The trip ends as it started (same flight id and samples) for the specs after this one.
import pg from 'pg';
import { expect, test, type Page } from '@playwright/test';
import { DEMO_ORG, DEMO_USERS, signIn } from './support';

const TITLE = 'Merrow and back, never leaned';

async function flightIdOf(title: string): Promise<string> {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		const { rows } = await client.query<{ id: string }>('select id from flights where title = $1 and deleted_at is null order by started_at limit 1', [title]);
		return rows[0].id;
	} finally {
		await client.end();
	}
}

async function openReplay(page: Page, id: string) {
	await page.goto(`/o/${DEMO_ORG}/flights/${id}`);
	await expect(page.getByTestId('flight-summary')).toBeVisible({ timeout: 15_000 });
}

test('a trip with a stop shows two legs, splits at the stop and merges back, each step confirmed', async ({ page }) => {
	await page.setViewportSize({ width: 1366, height: 1000 });
	const id = await flightIdOf(TITLE);
	await signIn(page, DEMO_USERS.pilot);

	await page.goto(`/o/${DEMO_ORG}/flights?from=2026-07-04&to=2026-07-04`);
	await expect(page.getByTestId('trash-link')).toBeVisible();
	const row = page.getByTestId('flight-row').filter({ hasText: TITLE });
	await expect(row).toHaveCount(1);
	const legsRow = page.getByTestId('flight-legs').first();
	await expect(legsRow.getByTestId('flight-leg')).toHaveCount(2);
	await expect(legsRow).toContainText(/Leg 1.*block \d+:\d\d · engine \d+:\d\d/);
	await expect(legsRow).toContainText(/over \d+:\d\d engine time/);

	await openReplay(page, id);
	const legs = page.getByTestId('legs');
	await expect(legs.getByTestId('leg')).toHaveCount(2);
	await expect(legs.getByTestId('leg-stop')).toContainText('recorder off on the ground');
	const engine = await legs.getByTestId('leg-engine').first().innerText();
	await expect(legs.getByTestId('leg-flow').first()).toContainText(`over ${engine} engine time`);
	await page.screenshot({ path: 'test-results/records-legs.png', fullPage: true });

	// Asked first: the consequence is stated, Cancel leaves everything as it was.
	await page.getByTestId('split-0').locator('summary').click();
	await expect(page.getByTestId('split-0')).toContainText('This flight becomes two');
	await page.getByTestId('split-0').getByRole('button', { name: 'Cancel' }).click();
	await expect(page.getByTestId('split-0-confirm')).toBeHidden();
	await page.getByTestId('split-0').locator('summary').click();
	await page.getByTestId('split-0-confirm').click();
	await expect(page.getByTestId('split-notice')).toBeVisible();
	await expect(page).toHaveURL(new RegExp(`/flights/${id}\\?split=`));
	await expect(page.getByTestId('legs')).toHaveCount(0);

	// The second part, merged back into the first from its own page.
	await page.getByTestId('split-notice').getByRole('link').click();
	await expect(page.getByTestId('flight-summary')).toBeVisible({ timeout: 15_000 });
	await page.getByTestId('merge-before').locator('summary').click();
	await expect(page.getByTestId('merge-before')).toContainText('The two flights become one');
	await page.getByTestId('merge-before-confirm').click();
	await expect(page.getByTestId('merge-notice')).toBeVisible();
	await expect(page).toHaveURL(new RegExp(`/flights/${id}\\?merged=1`));
	await expect(page.getByTestId('legs').getByTestId('leg')).toHaveCount(2, { timeout: 15_000 });
});

test('the viewer has no trash link; removing a member asks first and Cancel keeps them', async ({ page }) => {
	await signIn(page, DEMO_USERS.viewer);
	await page.goto(`/o/${DEMO_ORG}/flights`);
	await expect(page.getByTestId('flight-table')).toBeVisible();
	await expect(page.getByTestId('trash-link')).toHaveCount(0);

	await page.context().clearCookies();
	await signIn(page, DEMO_USERS.admin);
	await page.goto(`/o/${DEMO_ORG}/members`);
	const remove = page.getByTestId('remove-member').first();
	const rows = await page.getByTestId('remove-member').count();
	await remove.locator('summary').click();
	await expect(remove).toContainText('no more access to its flights and aircraft');
	await remove.getByRole('button', { name: 'Cancel' }).click();
	await expect(page.getByTestId('remove-member-confirm').first()).toBeHidden();
	await page.reload();
	await expect(page.getByTestId('remove-member')).toHaveCount(rows);
});
