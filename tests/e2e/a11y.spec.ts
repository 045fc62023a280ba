// WCAG 2.2 AA, checked by axe-core (@axe-core/playwright) on every page a role reaches, signed in
// as each demo role and signed out, in the day and the night colours. A serious or critical
// finding fails the test; the report names the page, the theme, the rule and the elements.
import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn, type DemoRole } from './support';

/** The WCAG 2.0–2.2 A and AA rules (axe's tags for them). */
const WCAG_AA = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];
const THEMES = ['light', 'dark'] as const;
const o = `/o/${DEMO_ORG}`;

/** A flight of the demo, by its title, as the flights list links it. */
async function flightPath(page: Page, title: string): Promise<string> {
	await page.goto(`${o}/flights`);
	const href = await page.getByTestId('flight-row').filter({ hasText: title }).getByRole('link').first().getAttribute('href');
	expect(href, title).toBeTruthy();
	return href!;
}

const CROSS_COUNTRY = 'Solo cross-country';
const LEANED = 'Merrow and back, leaned in cruise';
const LONG = 'The long way round against a headwind';

/** The pages each role uses (paths with a {flight} are resolved from the flights list). */
const PAGES: Record<DemoRole | 'anonymous', string[]> = {
	anonymous: ['/', '/sign-in', '/sign-up', '/reset-password', '/caution', '/api-docs'],
	admin: [
		o,
		`${o}/flights`,
		`{xc}`,
		`${o}/aircraft`,
		`${o}/aircraft/${DEMO_AIRCRAFT.trainer}`,
		`${o}/aircraft/${DEMO_AIRCRAFT.trainer}/history`,
		`${o}/aircraft/${DEMO_AIRCRAFT.trainer}/reconciliation`,
		`${o}/members`,
		`${o}/recorders`,
		`${o}/flights/upload`,
		`${o}/trash`,
		'/account',
		'/orgs'
	],
	instructor: [o, `${o}/students`, `${o}/plans/new`, `{xc}/plan`, `{xc}/debrief`, `{long}/live`],
	pilot: [o, `${o}/flights`, `{leaned}`],
	student: [o, `{xc}/debrief`],
	viewer: [o, `${o}/flights`, `{leaned}`, `${o}/aircraft/${DEMO_AIRCRAFT.trainer}/history`],
	other: ['/orgs']
};

for (const [role, paths] of Object.entries(PAGES) as [DemoRole | 'anonymous', string[]][]) {
	test(`axe finds nothing serious on the pages of the ${role}, day and night`, async ({ page }) => {
		test.setTimeout(120_000);
		await page.setViewportSize({ width: 1366, height: 900 });
		if (role !== 'anonymous') await signIn(page, DEMO_USERS[role]);
		else await page.goto('/');
		const resolved: string[] = [];
		for (const p of paths) {
			if (p.startsWith('{xc}')) resolved.push((await flightPath(page, CROSS_COUNTRY)) + p.slice(4));
			else if (p.startsWith('{leaned}')) resolved.push((await flightPath(page, LEANED)) + p.slice(8));
			else if (p.startsWith('{long}')) resolved.push((await flightPath(page, LONG)) + p.slice(6));
			else resolved.push(p);
		}
		const findings: string[] = [];
		for (const theme of THEMES) {
			await page.evaluate((t) => localStorage.setItem('burndown-theme', t), theme);
			for (const path of resolved) {
				const res = await page.goto(path);
				expect(res?.status(), path).toBeLessThan(400);
				await expect(page.locator('html')).toHaveAttribute('data-theme', theme);
				// Charts and figures drawn after load are part of the page.
				await page.waitForLoadState('networkidle');
				const result = await new AxeBuilder({ page }).withTags(WCAG_AA).analyze();
				for (const v of result.violations) {
					if (v.impact !== 'serious' && v.impact !== 'critical') continue;
					const where = v.nodes
						.slice(0, 4)
						.map((n) => `${n.target.join(' ')}${n.failureSummary ? ` (${n.failureSummary.split('\n').slice(1, 2).join('').trim()})` : ''}`)
						.join('; ');
					findings.push(`${theme} ${path}: ${v.id} [${v.impact}] ×${v.nodes.length} — ${where}`);
				}
			}
		}
		expect(findings, findings.join('\n')).toEqual([]);
	});
}
