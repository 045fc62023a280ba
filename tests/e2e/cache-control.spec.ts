// Personal answers are never cached (Cache-Control: no-store, OWASP ASVS 5.0 V14.3); the
// fingerprinted build assets keep their year-long immutable caching.
import { expect, test } from '@playwright/test';
import { apiAs, DEMO_ORG } from './support';

test('signed-in pages and API answers carry no-store; immutable assets keep their caching', async () => {
	const admin = await apiAs('admin');
	const anonymous = await apiAs('anonymous');
	try {
		const page = await admin.get(`/o/${DEMO_ORG}`, { headers: { accept: 'text/html' } });
		expect(page.status()).toBe(200);
		expect(page.headers()['cache-control']).toBe('no-store');
		const data = await admin.get(`/o/${DEMO_ORG}/__data.json`);
		expect(data.headers()['cache-control']).toBe('no-store');

		const list = await admin.get('/api/v1/flights/00000000-0000-4000-8000-000000000000/samples');
		expect(list.status()).toBe(404);
		expect(list.headers()['cache-control']).toBe('no-store');
		const refused = await anonymous.get('/api/v1/flights/00000000-0000-4000-8000-000000000000/samples');
		expect(refused.status()).toBe(401);
		expect(refused.headers()['cache-control']).toBe('no-store');

		// A script the signed-in page loads: served as a static file, before the hooks.
		const html = await page.text();
		const asset = /\/_app\/immutable\/[^"']+\.js/.exec(html)?.[0];
		expect(asset, 'the page links an immutable asset').toBeTruthy();
		const js = await admin.get(asset!);
		expect(js.status()).toBe(200);
		expect(js.headers()['cache-control']).toMatch(/max-age=31536000/);
		expect(js.headers()['cache-control']).toMatch(/immutable/);
	} finally {
		await admin.dispose();
		await anonymous.dispose();
	}
});
