// What a script meets at the edges of the API: an unknown /api/ path answers a JSON 404 (not the
// HTML page), whatever the method and whoever asks; a 401 says how to authenticate
// (WWW-Authenticate, RFC 9110 §11.6.1, with the bearer scheme of RFC 6750).
import { expect, test } from '@playwright/test';
import { apiAs } from './support';

test('an unknown API path answers a JSON 404 naming it, signed in or not, for any method', async () => {
	for (const role of ['anonymous', 'pilot'] as const) {
		const api = await apiAs(role);
		for (const method of ['GET', 'POST', 'DELETE'] as const) {
			const res = await api.fetch('/api/v1/no-such-thing?x=1', { method, headers: { accept: 'text/html' } });
			expect(res.status(), `${role} ${method}`).toBe(404);
			expect(res.headers()['content-type']).toMatch(/^application\/problem\+json/);
			expect(await res.json()).toMatchObject({ status: 404, instance: '/api/v1/no-such-thing', path: '/api/v1/no-such-thing' });
		}
		await api.dispose();
	}
});

test('a 401 from the API names the bearer scheme', async () => {
	const api = await apiAs('anonymous');
	const flights = await api.get('/api/v1/flights/00000000-0000-4000-8000-000000000000/samples');
	expect(flights.status()).toBe(401);
	expect(flights.headers()['www-authenticate']).toBe('Bearer realm="burndown"');
	// The recorder API keeps its own realm.
	const live = await api.post('/api/v1/live/open', { data: {} });
	expect(live.status()).toBe(401);
	expect(live.headers()['www-authenticate']).toBe('Bearer realm="burndown-live"');
	await api.dispose();
});

test('what the framework answers on its own under /api/v1 is a problem too: a method the endpoint lacks', async () => {
	const api = await apiAs('pilot');
	const res = await api.fetch('/api/v1/aircraft', { method: 'DELETE' });
	expect(res.status()).toBe(405);
	expect(res.headers()['content-type']).toBe('application/problem+json');
	expect(await res.json()).toMatchObject({ status: 405, instance: '/api/v1/aircraft', type: '/api-docs#problem-method-not-allowed' });
	// A cookie-authenticated write from another site is refused as a problem naming the origin.
	const cross = await api.post('/api/v1/flights', { headers: { origin: 'https://elsewhere.example', 'content-type': 'text/csv' }, data: '' });
	expect(cross.status()).toBe(403);
	expect(await cross.json()).toMatchObject({ status: 403, errors: [{ field: 'origin' }] });
	await api.dispose();
});
