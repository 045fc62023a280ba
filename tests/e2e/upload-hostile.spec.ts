// Cut-off uploads against the built server (node build behind adapter-node, as in production):
// a multipart body that ends inside the part headers, a field, the file or the closing boundary
// answers 400, and a client that announces more bytes than it sends and then hangs up leaves the
// server answering. This once ended the whole Node process.
import net from 'node:net';
import { expect, test } from '@playwright/test';
import { DEMO_AIRCRAFT, ORIGIN, apiAs } from './support';

const BOUNDARY = '----burndownCutOff7MA4YWxkTrZu0gW';

function body(): { bytes: Buffer; fileStart: number; closeAt: number } {
	const file = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm', ...Array.from({ length: 200 }, (_, i) => `${new Date(Date.UTC(2026, 8, 1, 9, 0, i)).toISOString()},8.5,100,40`)].join('\n') + '\n';
	const head =
		`--${BOUNDARY}\r\nContent-Disposition: form-data; name="aircraftId"\r\n\r\n${DEMO_AIRCRAFT.trainer}\r\n` +
		`--${BOUNDARY}\r\nContent-Disposition: form-data; name="declaration"\r\n\r\nfull\r\n` +
		`--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="cut.csv"\r\nContent-Type: text/csv\r\n\r\n`;
	const bytes = Buffer.from(`${head}${file}\r\n--${BOUNDARY}--\r\n`);
	return { bytes, fileStart: head.length, closeAt: head.length + file.length };
}

test('a multipart upload cut off anywhere answers 400 and the server keeps answering', async () => {
	const ctx = await apiAs('pilot');
	const { bytes, fileStart, closeAt } = body();
	const cuts = [0, 5, 40, 70, 90, 120, 160, 200, fileStart - 30, fileStart - 2, fileStart + 1, fileStart + 500, Math.floor((fileStart + closeAt) / 2), closeAt - 1, closeAt + 2, closeAt + 6, bytes.length - 3];
	for (const cut of cuts) {
		const res = await ctx.post('/api/v1/flights', { data: bytes.subarray(0, cut), headers: { 'content-type': `multipart/form-data; boundary=${BOUNDARY}` } });
		expect(res.status(), `cut at byte ${cut}: ${await res.text()}`).toBe(400);
		// The rest of a refused body is not read: the server closes the connection after answering.
		expect(res.headers()['connection'], `cut at byte ${cut}`).toBe('close');
		expect((await res.json()).detail, `cut at byte ${cut}`).toEqual(expect.any(String));
		expect((await ctx.get('/api/health')).status()).toBe(200);
	}

	// A client that announces the whole body, sends part of it and hangs up.
	const cookie = (await ctx.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join('; ');
	for (const cut of [fileStart - 10, fileStart + 300, closeAt + 3]) {
		await new Promise<void>((resolve, reject) => {
			const socket = net.connect(Number(new URL(ORIGIN).port), '127.0.0.1', () => {
				socket.write(
					`POST /api/v1/flights HTTP/1.1\r\nHost: 127.0.0.1\r\nOrigin: ${ORIGIN}\r\nCookie: ${cookie}\r\nContent-Type: multipart/form-data; boundary=${BOUNDARY}\r\nContent-Length: ${bytes.length}\r\n\r\n`
				);
				socket.end(bytes.subarray(0, cut));
			});
			socket.on('error', () => resolve());
			socket.on('close', () => resolve());
			socket.setTimeout(10_000, () => {
				socket.destroy();
				reject(new Error('the server neither answered nor closed'));
			});
			socket.resume();
		});
		expect((await ctx.get('/api/health')).status(), `after a hang-up at byte ${cut}`).toBe(200);
	}

	await ctx.dispose();
});
