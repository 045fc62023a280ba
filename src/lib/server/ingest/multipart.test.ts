import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { multipartBoundary, readField, readMultipart, MultipartError } from './multipart';

/** A multipart body as the platform's own FormData encoder writes it (Node's undici). */
async function encode(fields: [string, string][], file: { name: string; bytes: Uint8Array }): Promise<{ body: Uint8Array; boundary: string }> {
	const fd = new FormData();
	for (const [k, v] of fields) fd.append(k, v);
	fd.append('file', new Blob([file.bytes as BlobPart]), file.name);
	const req = new Request('http://x/', { method: 'POST', body: fd });
	return { body: new Uint8Array(await req.arrayBuffer()), boundary: multipartBoundary(req.headers.get('content-type'))! };
}

async function* pieces(bytes: Uint8Array, cuts: number[]) {
	const at = [0, ...cuts.filter((c) => c > 0 && c < bytes.length).sort((a, b) => a - b), bytes.length];
	for (let i = 1; i < at.length; i++) yield bytes.subarray(at[i - 1], at[i]);
}

async function readAll(body: Uint8Array, boundary: string, cuts: number[] = []) {
	const fields: Record<string, string> = {};
	let file: { name: string | null; bytes: Buffer } | null = null;
	for await (const part of readMultipart(pieces(body, cuts), boundary)) {
		if (part.filename !== null) {
			const chunks: Buffer[] = [];
			for await (const c of part.body) chunks.push(Buffer.from(c));
			file = { name: part.filename, bytes: Buffer.concat(chunks) };
		} else fields[part.name] = await readField(part);
	}
	return { fields, file };
}

describe('multipart reader', () => {
	it('reads the boundary from the content type', () => {
		expect(multipartBoundary('multipart/form-data; boundary=----abc123')).toBe('----abc123');
		expect(multipartBoundary('multipart/form-data; boundary="quoted b"')).toBe('quoted b');
		expect(multipartBoundary('text/csv')).toBeNull();
		expect(multipartBoundary(null)).toBeNull();
	});

	it('gives the same fields and file bytes as FormData wrote, however the body is cut', async () => {
		const file = new TextEncoder().encode('time_utc,fuel_flow_lph\r\n--not a boundary\r\n\r\n' + 'x'.repeat(5000) + '\r\n');
		const { body, boundary } = await encode(
			[
				['aircraftId', '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001'],
				['notes', 'Line one\r\nline two, with "quotes" and ünïcode']
			],
			{ name: 'flight "2".csv', bytes: file }
		);
		await fc.assert(
			fc.asyncProperty(fc.array(fc.integer({ min: 1, max: body.length - 1 }), { maxLength: 30 }), async (cuts) => {
				const got = await readAll(body, boundary, cuts);
				expect(got.fields).toEqual({ aircraftId: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001', notes: 'Line one\r\nline two, with "quotes" and ünïcode' });
				expect(got.file?.bytes.equals(Buffer.from(file))).toBe(true);
			}),
			{ numRuns: 60 }
		);
		// Byte by byte: the delimiter is split at every possible place.
		const oneByOne = await readAll(body, boundary, Array.from({ length: body.length }, (_, i) => i));
		expect(oneByOne.file?.bytes.equals(Buffer.from(file))).toBe(true);
	});

	it('keeps arbitrary binary file bytes intact', async () => {
		await fc.assert(
			fc.asyncProperty(fc.uint8Array({ maxLength: 3000 }), async (bytes) => {
				const { body, boundary } = await encode([['a', '1']], { name: 'b.bin', bytes });
				const got = await readAll(body, boundary, [7, 100, 1000]);
				expect(got.file?.bytes.equals(Buffer.from(bytes))).toBe(true);
			}),
			{ numRuns: 50 }
		);
	});

	it('refuses a body cut off inside the file', async () => {
		const { body, boundary } = await encode([['a', '1']], { name: 'f.csv', bytes: new Uint8Array(1000).fill(65) });
		await expect(readAll(body.subarray(0, body.length - 60), boundary)).rejects.toBeInstanceOf(MultipartError);
	});

	it('refuses an oversized text field', async () => {
		const { body, boundary } = await encode([['mapping', 'x'.repeat(300 * 1024)]], { name: 'f.csv', bytes: new Uint8Array(1) });
		await expect(readAll(body, boundary)).rejects.toThrow(/larger than 256 KB/);
	});
});
