import { createHash, randomBytes } from 'node:crypto';
import { setTimeout as sleep } from 'node:timers/promises';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { multipartBoundary, readMultipart, MultipartError, type MultipartPart } from './multipart';
import { openUploadRequest, UploadRequestError } from './request';

/** A multipart body as the platform's own FormData encoder writes it (Node's undici). */
async function encode(fields: [string, string][], file: { name: string; bytes: Uint8Array }): Promise<{ body: Uint8Array; boundary: string }> {
	const fd = new FormData();
	for (const [k, v] of fields) fd.append(k, v);
	fd.append('file', new Blob([file.bytes as BlobPart]), file.name);
	const req = new Request('http://x/', { method: 'POST', body: fd });
	return { body: new Uint8Array(await req.arrayBuffer()), boundary: multipartBoundary(req.headers.get('content-type'))! };
}

/** A body written by hand, for shapes FormData never writes. */
function handMade(boundary: string, parts: { headers: string[]; body: string }[], close = true): Uint8Array {
	let s = '';
	for (const p of parts) s += `--${boundary}\r\n${p.headers.join('\r\n')}\r\n\r\n${p.body}\r\n`;
	if (close) s += `--${boundary}--\r\n`;
	return new TextEncoder().encode(s);
}

async function* pieces(bytes: Uint8Array, cuts: number[]) {
	const at = [0, ...cuts.filter((c) => c > 0 && c < bytes.length).sort((a, b) => a - b), bytes.length];
	for (let i = 1; i < at.length; i++) yield bytes.subarray(at[i - 1], at[i]);
}

/** Fixed-size pieces, counting how many bytes the reader has pulled so far. */
function metered(bytes: Uint8Array, size: number) {
	const meter = { pulled: 0 };
	async function* source() {
		for (let i = 0; i < bytes.length; i += size) {
			const piece = bytes.subarray(i, i + size);
			meter.pulled += piece.length;
			yield piece;
		}
	}
	return { meter, source: source() };
}

async function readAll(body: Uint8Array, boundary: string, cuts: number[] = []) {
	const order: string[] = [];
	const fields: Record<string, string> = {};
	let file: { name: string | null; bytes: Buffer; chunks: number } | null = null;
	for await (const part of readMultipart(pieces(body, cuts), boundary)) {
		order.push(`${part.kind}:${part.name}`);
		if (part.kind === 'file') {
			const chunks: Buffer[] = [];
			for await (const c of part.body) chunks.push(Buffer.from(c));
			file = { name: part.filename, bytes: Buffer.concat(chunks), chunks: chunks.length };
		} else fields[part.name] = part.value;
	}
	return { order, fields, file };
}

const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

describe('multipart reader', () => {
	it('reads the boundary from the content type', () => {
		expect(multipartBoundary('multipart/form-data; boundary=----abc123')).toBe('----abc123');
		expect(multipartBoundary('multipart/form-data; boundary="quoted b"')).toBe('quoted b');
		expect(multipartBoundary('multipart/form-data')).toBeNull();
		expect(multipartBoundary('text/csv')).toBeNull();
		expect(multipartBoundary(null)).toBeNull();
	});

	it('gives the fields as strings, then the file, with the bytes FormData wrote, however the body is cut', async () => {
		const file = new TextEncoder().encode('time_utc,fuel_flow_lph\r\n--not a boundary\r\n\r\n' + 'x'.repeat(5000) + '\r\n');
		const { body, boundary } = await encode(
			[
				['aircraftId', '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001'],
				['notes', 'Line one\r\nline two, with "quotes" and ünïcode']
			],
			{ name: 'flüght 2.csv', bytes: file }
		);
		const expected = { aircraftId: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001', notes: 'Line one\r\nline two, with "quotes" and ünïcode' };
		await fc.assert(
			fc.asyncProperty(fc.array(fc.integer({ min: 1, max: body.length - 1 }), { maxLength: 30 }), async (cuts) => {
				const got = await readAll(body, boundary, cuts);
				expect(got.order).toEqual(['field:aircraftId', 'field:notes', 'file:file']);
				expect(got.fields).toEqual(expected);
				expect(got.file?.name).toBe('flüght 2.csv');
				expect(got.file?.bytes.equals(Buffer.from(file))).toBe(true);
			}),
			{ numRuns: 60 }
		);
		// Byte by byte: the delimiter is split at every possible place.
		const oneByOne = await readAll(body, boundary, Array.from({ length: body.length }, (_, i) => i));
		expect(oneByOne.fields).toEqual(expected);
		expect(oneByOne.file?.bytes.equals(Buffer.from(file))).toBe(true);
	});

	it('keeps arbitrary binary file bytes intact', async () => {
		await fc.assert(
			fc.asyncProperty(fc.uint8Array({ maxLength: 3000 }), async (bytes) => {
				const { body, boundary } = await encode([['a', '1']], { name: 'b.bin', bytes });
				const got = await readAll(body, boundary, [7, 100, 1000]);
				expect(got.fields).toEqual({ a: '1' });
				expect(got.file?.bytes.equals(Buffer.from(bytes))).toBe(true);
			}),
			{ numRuns: 50 }
		);
	});

	it('streams a large file in many chunks, none much larger than what came in, byte-identical', async () => {
		const bytes = randomBytes(3 * 1024 * 1024);
		const { body, boundary } = await encode([['aircraftId', 'x']], { name: 'big.bin', bytes });
		const { source } = metered(body, 64 * 1024);
		const hash = createHash('sha256');
		let chunks = 0;
		let largest = 0;
		let total = 0;
		for await (const part of readMultipart(source, boundary)) {
			if (part.kind !== 'file') continue;
			for await (const c of part.body) {
				chunks++;
				largest = Math.max(largest, c.length);
				total += c.length;
				hash.update(c);
			}
		}
		expect(total).toBe(bytes.length);
		expect(hash.digest('hex')).toBe(sha(bytes));
		expect(chunks).toBeGreaterThanOrEqual(48);
		// Nothing is gathered up: a chunk is at most what came in plus the few bytes the boundary
		// search held back from the previous one (when random bytes began like the boundary).
		expect(largest).toBeLessThanOrEqual(64 * 1024 + boundary.length + 4);
	});

	it('reads the body no faster than the file part is consumed', async () => {
		const bytes = randomBytes(8 * 1024 * 1024);
		const { body, boundary } = await encode([['a', '1']], { name: 'slow.bin', bytes });
		const { meter, source } = metered(body, 64 * 1024);
		const parts = readMultipart(source, boundary);
		const field = (await parts.next()).value as MultipartPart;
		expect(field).toMatchObject({ kind: 'field', name: 'a', value: '1' });
		const file = (await parts.next()).value as MultipartPart;
		expect(file.kind).toBe('file');
		if (file.kind !== 'file') return;
		const it = file.body[Symbol.asyncIterator]();
		const first = await it.next();
		expect(first.done).toBe(false);
		// A slow consumer (COPY busy): the reader must wait for it instead of pulling the whole body.
		await sleep(100);
		expect(meter.pulled).toBeLessThan(1024 * 1024);
		const hash = createHash('sha256').update(first.value as Buffer);
		for (let n = await it.next(); !n.done; n = await it.next()) hash.update(n.value);
		expect(hash.digest('hex')).toBe(sha(bytes));
		expect(meter.pulled).toBe(body.length);
		expect((await parts.next()).done).toBe(true);
	});

	it('refuses a text field over the limit, and takes one exactly at it', async () => {
		const big = await encode([['mapping', 'x'.repeat(256 * 1024 + 1)]], { name: 'f.csv', bytes: new Uint8Array(1) });
		const error = await readAll(big.body, big.boundary).catch((e) => e);
		expect(error).toBeInstanceOf(MultipartError);
		expect(error.message).toBe('The form field "mapping" is larger than 256 KB.');
		expect(error.field).toBe('mapping');
		const atLimit = await encode([['mapping', 'y'.repeat(256 * 1024)]], { name: 'f.csv', bytes: new Uint8Array([65]) });
		const got = await readAll(atLimit.body, atLimit.boundary);
		expect(got.fields.mapping).toBe('y'.repeat(256 * 1024));
		expect(got.file?.bytes.toString()).toBe('A');
		// A smaller limit from the caller is kept too.
		const small = await encode([['title', 'abcdef']], { name: 'f.csv', bytes: new Uint8Array(1) });
		const parts = readMultipart(pieces(small.body, []), small.boundary, 5);
		await expect(parts.next()).rejects.toThrow('The form field "title" is larger than 5 bytes.');
	});

	it('refuses a body whose boundary does not match, or that has no parts', async () => {
		const { body } = await encode([['a', '1']], { name: 'f.csv', bytes: new Uint8Array(10) });
		await expect(readAll(body, 'not-the-boundary')).rejects.toThrow(new MultipartError('The form data has no parts.'));
		await expect(readAll(new TextEncoder().encode('just some text'), 'b0undary')).rejects.toThrow('The form data has no parts.');
		await expect(readAll(new Uint8Array(0), 'b0undary')).rejects.toThrow('The form data has no parts.');
		// A well-formed body with no parts at all is not an error: there is simply nothing in it.
		expect((await readAll(new TextEncoder().encode('--b0undary--\r\n'), 'b0undary')).order).toEqual([]);
	});

	it('refuses a body cut off inside the file, when the file is read', async () => {
		const { body, boundary } = await encode([['a', '1']], { name: 'f.csv', bytes: new Uint8Array(1000).fill(65) });
		const error = await readAll(body.subarray(0, body.length - 60), boundary).catch((e) => e);
		expect(error).toBeInstanceOf(MultipartError);
		expect(error.message).toBe('The form data ends inside a part (the upload was cut off).');
	});

	it('refuses a body cut off inside a field, a part without a name, and overlong part headers', async () => {
		const b = 'XyZ';
		const cutField = handMade(b, [{ headers: ['Content-Disposition: form-data; name="a"'], body: 'half a val' }], false);
		await expect(readAll(cutField, b)).rejects.toThrow(/ends early|has no parts/);
		const noName = handMade(b, [{ headers: ['Content-Disposition: form-data'], body: '1' }]);
		await expect(readAll(noName, b)).rejects.toThrow('A form part has no name.');
		const longHeaders = handMade(b, [{ headers: ['Content-Disposition: form-data; name="a"', `X-Padding: ${'p'.repeat(20_000)}`], body: '1' }]);
		await expect(readAll(longHeaders, b)).rejects.toThrow('A form part’s headers are malformed or too long.');
	});

	it('passes on a failure of the body itself as it is', async () => {
		const { body, boundary } = await encode([['a', '1']], { name: 'f.csv', bytes: new Uint8Array(200_000).fill(66) });
		async function* resets() {
			yield body.subarray(0, 100_000);
			throw new Error('connection reset');
		}
		const parts = readMultipart(resets(), boundary);
		expect((await parts.next()).value).toMatchObject({ kind: 'field', name: 'a' });
		const file = (await parts.next()).value as MultipartPart;
		if (file.kind !== 'file') throw new Error('expected the file part');
		const reading = (async () => {
			for await (const c of file.body) void c;
		})();
		await expect(reading).rejects.toThrow('connection reset');
	});

	it('skips a file part left unread and goes on to the next part', async () => {
		const b = 'XyZ';
		const body = handMade(b, [
			{ headers: ['Content-Disposition: form-data; name="first"; filename="a.csv"'], body: 'q'.repeat(100_000) },
			{ headers: ['Content-Disposition: form-data; name="after"'], body: 'still here' }
		]);
		const seen: string[] = [];
		for await (const part of readMultipart(pieces(body, [1000, 50_000]), b)) seen.push(part.kind === 'field' ? `${part.name}=${part.value}` : `file ${part.filename}`);
		expect(seen).toEqual(['file a.csv', 'after=still here']);
	});
});

describe('the upload request over multipart', () => {
	const boundaryOf = (req: Request) => req.headers.get('content-type')!;
	const fields = { aircraftId: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001', declaration: 'full' };
	const url = new URL('http://127.0.0.1/api/v1/flights');

	async function bytesOfFile(file: AsyncIterable<Uint8Array>): Promise<Buffer> {
		const out: Buffer[] = [];
		for await (const c of file) out.push(Buffer.from(c));
		return Buffer.concat(out);
	}

	it('gives the fields and the file stream, with the file name', async () => {
		const fd = new FormData();
		for (const [k, v] of Object.entries(fields)) fd.set(k, v);
		fd.set('file', new Blob(['time_utc\n1\n']), 'trip.csv');
		const req = new Request(url, { method: 'POST', body: fd });
		const up = await openUploadRequest(req, url);
		expect(up.fields).toEqual(fields);
		expect(up.fileName).toBe('trip.csv');
		expect((await bytesOfFile(up.file)).toString()).toBe('time_utc\n1\n');
	});

	it('takes a small file sent as a text field "file" (curl -F "file=<…"), and explains the limit on a large one', async () => {
		const small = new FormData();
		small.set('aircraftId', fields.aircraftId);
		// FormData writes a string's line ends as CRLF, so the sample has them already.
		small.set('file', 'time_utc\r\n1\r\n');
		const up = await openUploadRequest(new Request(url, { method: 'POST', body: small }), url);
		expect((await bytesOfFile(up.file)).toString()).toBe('time_utc\r\n1\r\n');
		const large = new FormData();
		large.set('file', 'z'.repeat(300 * 1024));
		const error = await openUploadRequest(new Request(url, { method: 'POST', body: large }), url).catch((e) => e);
		expect(error).toBeInstanceOf(UploadRequestError);
		expect(error.status).toBe(400);
		expect(error.message).toMatch(/as a file part with a file name .* at most 256 KB/);
	});

	it('answers 400 for a file in the wrong field, no file, a malformed body, and a body cut off inside the file', async () => {
		const wrong = new FormData();
		wrong.set('upload', new Blob(['x']), 'x.csv');
		await expect(openUploadRequest(new Request(url, { method: 'POST', body: wrong }), url)).rejects.toMatchObject({ status: 400, message: 'Send the recorder file in the form field "file" (got "upload").' });
		const none = new FormData();
		none.set('aircraftId', fields.aircraftId);
		await expect(openUploadRequest(new Request(url, { method: 'POST', body: none }), url)).rejects.toMatchObject({ status: 400, message: /No file in the form data/ });
		const garbled = new Request(url, { method: 'POST', body: 'not a form', headers: { 'content-type': 'multipart/form-data; boundary=abc' } });
		await expect(openUploadRequest(garbled, url)).rejects.toMatchObject({ status: 400, field: 'file', message: 'The form data has no parts.' });

		const fd = new FormData();
		fd.set('aircraftId', fields.aircraftId);
		fd.set('file', new Blob([new Uint8Array(5000).fill(67)]), 'cut.csv');
		const full = new Request(url, { method: 'POST', body: fd });
		const cut = new Request(url, { method: 'POST', body: new Uint8Array(await full.arrayBuffer()).subarray(0, 3000), headers: { 'content-type': boundaryOf(full) } });
		const up = await openUploadRequest(cut, url);
		const error = await bytesOfFile(up.file).catch((e) => e);
		expect(error).toBeInstanceOf(UploadRequestError);
		expect(error).toMatchObject({ status: 400, field: 'file', message: 'The form data ends inside a part (the upload was cut off).' });
	});
});
