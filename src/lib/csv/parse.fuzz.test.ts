// Property tests of the recorder-file reader over hostile input: arbitrary bytes, arbitrary cuts
// into pieces, and CSV-shaped text in our format and in mapped layouts (every time format). The
// reader must never throw: it answers a summary, ok or with problems on real line numbers.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { columnMappingSchema, type ColumnMapping } from './mapping';
import { parseRecorderCsv, type ParseSummary } from './parse';

async function* pieces(bytes: Uint8Array, cuts: number[]) {
	const at = [0, ...cuts.filter((c) => c > 0 && c < bytes.length).sort((a, b) => a - b), bytes.length];
	for (let i = 1; i < at.length; i++) yield bytes.subarray(at[i - 1], at[i]);
}

function checkSummary(s: ParseSummary, lines: number) {
	expect(typeof s.ok).toBe('boolean');
	expect(s.problemCount).toBeGreaterThanOrEqual(s.problems.length);
	if (s.ok) {
		expect(s.problemCount).toBe(0);
		expect(s.rowCount).toBeGreaterThan(0);
	} else expect(s.problemCount).toBeGreaterThan(0);
	for (const p of s.problems) {
		expect(Number.isInteger(p.line)).toBe(true);
		expect(p.line).toBeGreaterThanOrEqual(1);
		expect(p.line).toBeLessThanOrEqual(lines + 1);
		expect(typeof p.message).toBe('string');
	}
}

const lineCount = (bytes: Uint8Array) => bytes.reduce((n, b) => n + (b === 10 || b === 13 ? 1 : 0), 1);

/** Cells as recorders write them, and as they should not. */
const cell = fc.oneof(
	fc.constantFrom('', ' ', '-', '+', '.', ',', 'NaN', 'Infinity', '-0', '1e400', '0x10', '"', '""', '"a,b"', '\t', '12:60:00', '24:00:00', '99999999999999999', '-99999999999999999'),
	fc.constantFrom('2026-05-02T09:00:00Z', '2026-05-02T09:00:00.5+02:00', '275760-09-13T00:00:00Z', '2026-02-30T09:00:00Z', '09:00:00', '23:59:59.999'),
	fc.double().map(String),
	fc.integer({ min: -1e6, max: 1e13 }).map(String),
	fc.string({ maxLength: 12 })
);
const csvText = (header: string[], delimiter: string) =>
	fc.array(fc.array(cell, { minLength: 0, maxLength: header.length + 2 }), { maxLength: 40 }).chain((rows) =>
		fc.constantFrom('\n', '\r\n', '\r').map((eol) => [header.join(delimiter), ...rows.map((r) => r.join(delimiter))].join(eol))
	);

const OURS = ['time_utc', 'fuel_flow_usgph', 'ground_speed_kt', 'distance_to_go_nm', 'waypoint', 'altitude_ft'];
const mapped = (format: 'iso' | 'clock' | 'elapsedS' | 'epochS' | 'epochMs'): ColumnMapping =>
	columnMappingSchema.parse({
		delimiter: ';',
		decimal: ',',
		time: { column: 'T', format, date: '2026-05-02', start: '2026-05-02T09:00:00Z' },
		flow: { column: 'FF', unit: 'l/h' },
		gs: { column: 'GS', unit: 'km/h' },
		seq: { column: 'N' }
	});

describe('the recorder-file reader never throws', () => {
	it('on arbitrary bytes, cut anywhere', async () => {
		await fc.assert(
			fc.asyncProperty(fc.uint8Array({ maxLength: 2000 }), fc.array(fc.nat(2000), { maxLength: 8 }), async (bytes, cuts) => {
				checkSummary(await parseRecorderCsv(pieces(bytes, cuts), null), lineCount(bytes));
			}),
			{ numRuns: 300 }
		);
	});

	it('on CSV-shaped text in our format, cut anywhere', async () => {
		await fc.assert(
			fc.asyncProperty(csvText(OURS, ','), fc.array(fc.nat(3000), { maxLength: 8 }), async (text, cuts) => {
				const bytes = new TextEncoder().encode(text);
				checkSummary(await parseRecorderCsv(pieces(bytes, cuts), null), lineCount(bytes));
			}),
			{ numRuns: 300 }
		);
	});

	it('on rows whose times are near or past the ends of the representable range', async () => {
		const time = fc.oneof(
			fc.integer({ min: 0, max: 2 ** 53 }).map(String),
			fc.constantFrom('8640000000000', '8640000000001', '8640000000000000', '8640000000000001', '-8640000000000001', '1e300'),
			fc.integer({ min: 1, max: 10 ** 6 }).map((n) => String(1.7e9 + n))
		);
		const row = fc.tuple(time, fc.constantFrom('31,5', '0', '-1', 'x'), fc.constantFrom('100', ''), fc.integer({ min: -3, max: 2 ** 32 }).map(String));
		const formats = ['epochS', 'epochMs', 'elapsedS'] as const;
		await fc.assert(
			fc.asyncProperty(fc.constantFrom(...formats), fc.array(row, { minLength: 1, maxLength: 8 }), async (format, rows) => {
				const text = ['T;FF;GS;N', ...rows.map((r) => r.join(';'))].join('\n');
				checkSummary(await parseRecorderCsv(text, mapped(format)), rows.length + 1);
			}),
			{ numRuns: 500 }
		);
	});

	it('on CSV-shaped text in a mapped layout, for every time format', async () => {
		const formats = ['iso', 'clock', 'elapsedS', 'epochS', 'epochMs'] as const;
		const known = formats.filter((f) => columnMappingSchema.safeParse({ ...mapped('iso'), time: { ...mapped('iso').time, format: f } }).success);
		expect(known.length).toBeGreaterThan(1);
		await fc.assert(
			fc.asyncProperty(fc.constantFrom(...known), csvText(['T', 'FF', 'GS', 'N'], ';'), async (format, text) => {
				const bytes = new TextEncoder().encode(text);
				checkSummary(await parseRecorderCsv(pieces(bytes, []), mapped(format)), lineCount(bytes));
			}),
			{ numRuns: 300 }
		);
	});
});
