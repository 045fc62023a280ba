import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { LITRES_PER_US_GALLON, LITRES_PER_IMPERIAL_GALLON, KG_PER_POUND } from '$lib/units';
import { columnMappingSchema, type ColumnMapping } from './mapping';
import { MAX_DROPPED_LINES, parseRecorderCsv, parseRecorderText, splitCsvLines, type MappingResolver } from './parse';
import { MAX_FLOW_LPH } from './format';

const HEADER = 'time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint,latitude,longitude,altitude_ft';
const T0 = Date.UTC(2026, 4, 2, 9, 0, 0);
const iso = (s: number) => new Date(T0 + s * 1000).toISOString().replace('.000Z', 'Z');

/** n rows of our format, one a second, with a fixed flow. */
function burndownFile(n: number, flow = '9.5'): string {
	const lines = [HEADER];
	for (let i = 0; i < n; i++) lines.push(`${iso(i)},${flow},${i < 5 ? 0 : 105},${(40 - i * 0.03).toFixed(2)},KFA2,51.2,-1.1,${1200 + i}`);
	return lines.join('\n') + '\n';
}

describe('the Burndown recorder CSV', () => {
	it('is recognised from its header and converted to canonical units', async () => {
		const res = await parseRecorderText(burndownFile(20), null);
		expect(res.ok).toBe(true);
		expect(res.origin).toEqual({ kind: 'burndown' });
		expect(res.rowCount).toBe(20);
		expect(res.rows[0].line).toBe(2);
		expect(res.rows[0].tMs).toBe(T0);
		expect(res.rows[19].tMs).toBe(T0 + 19_000);
		// 1 US gal = 3.785411784 L (NIST Handbook 44, Appendix C).
		expect(res.rows[0].flow).toBeCloseTo(9.5 * 3.785411784, 12);
		expect(res.rows[7]).toMatchObject({ gs: 105, wpt: 'KFA2', lat: 51.2, lon: -1.1, alt: 1207, seq: null });
		expect(res.firstTMs).toBe(T0);
		expect(res.lastTMs).toBe(T0 + 19_000);
		expect(res.lineCount).toBe(21);
		expect(res.blankLines).toBe(0);
	});

	it('takes each flow unit from the column name', async () => {
		const cases: [string, number, number?][] = [
			['fuel_flow_lph', 1],
			['fuel_flow_usgph', LITRES_PER_US_GALLON],
			['fuel_flow_impgph', LITRES_PER_IMPERIAL_GALLON],
			// Mass units go through the density: 1 kg at 0.8 kg/L is 1.25 L.
			['fuel_flow_kgph', 1 / 0.8, 0.8],
			['fuel_flow_lbph', KG_PER_POUND / 0.72, 0.72]
		];
		for (const [column, litresPerUnit, density] of cases) {
			const text = `time_utc,${column},ground_speed_kt,distance_to_go_nm\n${iso(0)},10,0,0\n${iso(1)},10,0,0\n`;
			const res = await parseRecorderText(text, null, { densityKgPerL: density });
			expect(res.ok, column).toBe(true);
			expect(res.rows[0].flow, column).toBeCloseTo(10 * litresPerUnit, 10);
		}
	});

	it('needs a density for mass flow units', async () => {
		const text = `time_utc,fuel_flow_kgph,ground_speed_kt,distance_to_go_nm\n${iso(0)},10,0,0\n${iso(1)},10,0,0\n`;
		const res = await parseRecorderText(text, null);
		expect(res.ok).toBe(false);
		expect(res.problems[0]).toMatchObject({ line: 1, column: 'fuel_flow_kgph' });
		expect(res.problems[0].message).toMatch(/density/);
	});

	it('reads a blank cell as not recorded, never as an error or a zero', async () => {
		const text = `${HEADER}\n${iso(0)},9,100,40,,,,\n${iso(1)},,100,,,,,\n${iso(2)},9,,39,W1,,,1500\n`;
		const res = await parseRecorderText(text, null);
		expect(res.ok).toBe(true);
		expect(res.rows[1]).toMatchObject({ flow: null, gs: 100, dtg: null, wpt: null, alt: null });
		expect(res.rows[2]).toMatchObject({ gs: null, wpt: 'W1', alt: 1500 });
		expect(res.blankCells).toEqual({ flow: 1, gs: 1, dtg: 1, alt: 2 });
	});

	it('handles a byte-order mark, CRLF, comment lines before the header and blank lines', async () => {
		const body = burndownFile(3).trimEnd().split('\n');
		const text = '\uFEFF# recorder export\r\n\r\n' + [body[0], body[1], '', body[2], body[3]].join('\r\n') + '\r\n';
		const res = await parseRecorderText(text, null);
		expect(res.ok).toBe(true);
		expect(res.header?.line).toBe(3);
		expect(res.header?.names[0]).toBe('time_utc');
		expect(res.rows.map((r) => r.line)).toEqual([4, 6, 7]);
		expect(res.blankLines).toBe(1);
		expect(res.rows[2].alt).toBe(1202);
	});

	it('gives the same rows from bytes cut at any point as from the whole text', async () => {
		const text = '\uFEFF' + burndownFile(60).replace(/\n/g, '\r\n').replace('KFA2', '"KFA,2"');
		const whole = await parseRecorderText(text, null);
		expect(whole.ok).toBe(true);
		const bytes = new TextEncoder().encode(text);
		await fc.assert(
			fc.asyncProperty(fc.uniqueArray(fc.integer({ min: 1, max: bytes.length - 1 }), { maxLength: 12 }), async (cuts) => {
				const at = [0, ...cuts.sort((a, b) => a - b), bytes.length];
				const pieces = at.slice(1).map((end, i) => bytes.subarray(at[i], end));
				const rows: unknown[] = [];
				const res = await parseRecorderCsv(pieces, null, { batchRows: 7, onRows: (b) => void rows.push(...b) });
				expect(res.ok).toBe(true);
				expect(rows).toEqual(whole.rows);
			}),
			{ numRuns: 40 }
		);
	});

	it('refuses a header that is not ours and says what is missing', async () => {
		const res = await parseRecorderText(`time,flow\n${iso(0)},9\n`, null);
		expect(res.ok).toBe(false);
		expect(res.problems[0].line).toBe(1);
		expect(res.problems[0].message).toMatch(/missing time_utc, fuel_flow_<unit>, ground_speed_kt, distance_to_go_nm/);
	});

	it('refuses two flow columns', async () => {
		const res = await parseRecorderText(`time_utc,fuel_flow_lph,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm\n`, null);
		expect(res.problems[0].message).toMatch(/2 fuel-flow columns/);
	});
});

describe('bad files: every problem with line, column and value', () => {
	const bad = async (rows: string[]) => parseRecorderText([HEADER, ...rows].join('\n') + '\n', null);
	const ok = (s: number, flow = '9') => `${iso(s)},${flow},100,40,W,51,-1,1000`;

	it('a malformed number', async () => {
		const res = await bad([ok(0), `${iso(1)},9.1.2,100,40,W,51,-1,1000`, ok(2)]);
		expect(res.ok).toBe(false);
		expect(res.problems).toEqual([{ line: 3, column: 'fuel_flow_usgph', value: '9.1.2', message: 'Malformed fuel flow: not a number.' }]);
		expect(res.rows).toEqual([]);
	});

	it('a malformed time, and a time without a zone', async () => {
		const res = await bad([ok(0), `2026-05-02 09:00:01,9,100,40,W,51,-1,1000`, `soon,9,100,40,W,51,-1,1000`]);
		expect(res.problems.map((p) => [p.line, p.column])).toEqual([
			[3, 'time_utc'],
			[4, 'time_utc']
		]);
		expect(res.problems[0].message).toMatch(/no zone/);
	});

	it('time going backwards or repeated', async () => {
		const res = await bad([ok(0), ok(5), ok(3), ok(6), ok(6)]);
		expect(res.problemCount).toBe(2);
		expect(res.problems[0]).toMatchObject({ line: 4, column: 'time_utc', value: iso(3) });
		expect(res.problems[0].message).toMatch(/goes backwards.*2 s before the previous sample \(line 3/);
		expect(res.problems[1]).toMatchObject({ line: 6 });
		expect(res.problems[1].message).toMatch(/repeats the previous sample's \(line 5\)/);
	});

	it('negative and absurd flow, absurd speed', async () => {
		const res = await bad([ok(0), ok(1, '-2'), ok(2, '140'), `${iso(3)},9,450,40,W,51,-1,1000`]);
		expect(res.problems.map((p) => [p.line, p.column, p.value])).toEqual([
			[3, 'fuel_flow_usgph', '-2'],
			[4, 'fuel_flow_usgph', '140'],
			[5, 'ground_speed_kt', '450']
		]);
		expect(res.problems[0].message).toMatch(/Negative fuel flow/);
		// 140 US gal/h is 530 L/h, above the limit.
		expect(140 * LITRES_PER_US_GALLON).toBeGreaterThan(MAX_FLOW_LPH);
		expect(res.problems[1].message).toMatch(/Implausible fuel flow: 140 US gal\/h \(530(\.\d)? L\/h\); the limit is 500 L\/h/);
		expect(res.problems[2].message).toMatch(/limit is 400 kt/);
	});

	it('a line with the wrong number of fields', async () => {
		const res = await bad([ok(0), `${iso(1)},9,100`]);
		expect(res.problems[0]).toMatchObject({ line: 3, column: '' });
		expect(res.problems[0].message).toBe('The line has 3 fields; the header has 8.');
	});

	it('a missing time', async () => {
		const res = await bad([ok(0), `,9,100,40,W,51,-1,1000`]);
		expect(res.problems[0]).toMatchObject({ line: 3, column: 'time_utc', message: 'The time is missing; every sample needs one.' });
	});

	it('lists the first 50 problems and counts them all', async () => {
		const rows = [ok(0)];
		for (let i = 1; i <= 120; i++) rows.push(ok(i, 'x'));
		const res = await bad(rows);
		expect(res.problemCount).toBe(120);
		expect(res.problems).toHaveLength(50);
		expect(res.problems[49].line).toBe(52);
	});

	it('stops handing out rows at the first problem', async () => {
		const rows = [];
		for (let i = 0; i < 50; i++) rows.push(ok(i));
		rows.push(ok(50, '-1'));
		for (let i = 51; i < 100; i++) rows.push(ok(i));
		const received: number[] = [];
		const res = await parseRecorderCsv([HEADER, ...rows].join('\n'), null, { batchRows: 10, onRows: (b) => void received.push(...b.map((r) => r.line)) });
		expect(res.ok).toBe(false);
		expect(received.length).toBeLessThanOrEqual(50);
		expect(Math.max(...received)).toBeLessThan(52);
	});

	it('an empty file, a header alone, a single sample', async () => {
		expect((await parseRecorderText('', null)).problems[0].message).toMatch(/empty/);
		expect((await parseRecorderText('\n\n', null)).problems[0].message).toMatch(/empty/);
		expect((await parseRecorderText(HEADER + '\n', null)).problems[0].message).toMatch(/no samples/);
		expect((await parseRecorderText(`${HEADER}\n${ok(0)}\n`, null)).problems[0].message).toMatch(/only one sample/);
	});

	it('bytes that are not UTF-8, and UTF-16', async () => {
		const latin1 = new Uint8Array([...new TextEncoder().encode(`${HEADER}\n${ok(0)}\n`), 0xe9, 0x0a]);
		const res = await parseRecorderCsv([latin1], null);
		expect(res.ok).toBe(false);
		expect(res.problems[0].message).toMatch(/not UTF-8/);
		const utf16 = new Uint8Array([0xff, 0xfe, 0x74, 0x00]);
		expect((await parseRecorderCsv([utf16], null)).problems[0].message).toMatch(/UTF-16/);
	});

	it('a file with no line breaks at all', async () => {
		const res = await parseRecorderCsv(`${HEADER}\n` + 'x'.repeat(3 << 20), null);
		expect(res.ok).toBe(false);
		expect(res.problems[0].message).toMatch(/longer than 1 MB/);
	});

	it('lets errors of the input itself through', async () => {
		async function* failing() {
			yield new TextEncoder().encode(`${HEADER}\n`);
			throw new RangeError('too big');
		}
		await expect(parseRecorderCsv(failing(), null)).rejects.toThrow('too big');
	});
});

describe('mapped files from other recorders', () => {
	const mapping = (over: Partial<Record<string, unknown>>): ColumnMapping =>
		columnMappingSchema.parse({
			delimiter: ';',
			decimal: ',',
			time: { column: 'Zeit', format: 'clock', date: '2026-05-02' },
			flow: { column: 'FF l/h', unit: 'l/h' },
			gs: { column: 'GS km/h', unit: 'km/h' },
			dtg: { column: 'Rest km', unit: 'km' },
			alt: { column: 'Höhe m', unit: 'm' },
			...over
		});

	it('reads semicolons, decimal commas, clock times and metric units', async () => {
		const text = 'Zeit;FF l/h;GS km/h;Rest km;Höhe m\r\n09:00:00;31,5;0;120,4;150\r\n09:00:01;31,6;185,2;120,3;152,4\r\n';
		const res = await parseRecorderText(text, mapping({}));
		expect(res.ok).toBe(true);
		expect(res.rows[0].tMs).toBe(T0);
		expect(res.rows[0].flow).toBe(31.5);
		// 1 NM = 1852 m (BIPM SI Brochure): 185.2 km/h = 100 kt, 120.4 km = 65.01 NM.
		expect(res.rows[1].gs).toBeCloseTo(100, 10);
		expect(res.rows[0].dtg).toBeCloseTo(120.4 / 1.852, 10);
		// 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
		expect(res.rows[1].alt).toBeCloseTo(152.4 / 0.3048, 10);
	});

	it('rolls clock times over midnight, and applies the UTC offset', async () => {
		const text = 'Zeit;FF l/h;GS km/h;Rest km;Höhe m\n23:59:58;30;0;1;0\n23:59:59;30;0;1;0\n00:00:00;30;0;1;0\n00:00:01;30;0;1;0\n';
		const res = await parseRecorderText(text, mapping({ time: { column: 'Zeit', format: 'clock', date: '2026-05-02', utcOffsetMin: 120 } }));
		expect(res.ok).toBe(true);
		const midnightLocal = Date.UTC(2026, 4, 3) - 120 * 60_000;
		expect(res.rows.map((r) => r.tMs - midnightLocal)).toEqual([-2000, -1000, 0, 1000]);
	});

	it('still catches a clock that steps back a little', async () => {
		const text = 'Zeit;FF l/h;GS km/h;Rest km;Höhe m\n10:00:05;30;0;1;0\n10:00:03;30;0;1;0\n';
		const res = await parseRecorderText(text, mapping({}));
		expect(res.problems[0]).toMatchObject({ line: 3, column: 'Zeit', value: '10:00:03' });
	});

	it('reads epoch seconds, epoch milliseconds and elapsed seconds', async () => {
		const base = { delimiter: ',', decimal: '.', flow: { column: 'f', unit: 'l/h' } };
		const epochS = columnMappingSchema.parse({ ...base, time: { column: 't', format: 'epochS' } });
		const epochMs = columnMappingSchema.parse({ ...base, time: { column: 't', format: 'epochMs' } });
		const elapsed = columnMappingSchema.parse({ ...base, time: { column: 't', format: 'elapsedS', start: '2026-05-02T11:00:00+02:00' } });
		const s = T0 / 1000;
		expect((await parseRecorderText(`t,f\n${s},20\n${s + 0.5},20\n`, epochS)).rows.map((r) => r.tMs)).toEqual([T0, T0 + 500]);
		expect((await parseRecorderText(`t,f\n${T0},20\n${T0 + 250},20\n`, epochMs)).rows.map((r) => r.tMs)).toEqual([T0, T0 + 250]);
		expect((await parseRecorderText(`t,f\n0,20\n1.5,20\n`, elapsed)).rows.map((r) => r.tMs)).toEqual([T0, T0 + 1500]);
	});

	it('says when epoch seconds were read as milliseconds', async () => {
		const epochMs = columnMappingSchema.parse({ delimiter: ',', decimal: '.', time: { column: 't', format: 'epochMs' }, flow: { column: 'f', unit: 'l/h' } });
		const res = await parseRecorderText(`t,f\n${T0 / 1000},20\n${T0 / 1000 + 1},20\n`, epochMs);
		expect(res.problems[0].message).toMatch(/outside 2000–2099/);
	});

	it('names the mapped column missing from the header', async () => {
		const res = await parseRecorderText('Zeit;FF;GS km/h;Rest km;Höhe m\n', mapping({}));
		expect(res.problems[0]).toMatchObject({ line: 1, column: 'FF l/h' });
		expect(res.problems[0].message).toMatch(/fuel flow column "FF l\/h" is not in the header/);
	});

	it('hints at a decimal comma the mapping did not expect', async () => {
		const res = await parseRecorderText('Zeit;FF l/h;GS km/h;Rest km;Höhe m\n09:00:00;31,5;0;1;0\n', mapping({ decimal: '.' }));
		expect(res.problems[0].message).toMatch(/decimal comma/);
	});

	it('asks a resolver for the mapping once the header is known', async () => {
		const seen: string[] = [];
		const resolver: MappingResolver = async (h) => {
			seen.push(h.signature, h.layout.delimiter, h.layout.decimal);
			return { mapping: mapping({}), origin: { kind: 'profile', profileName: 'Diesel panel' } };
		};
		const res = await parseRecorderText('Zeit;FF l/h;GS km/h;Rest km;Höhe m\n09:00:00;31,5;0;1,5;0\n09:00:01;31,5;0;1,5;0\n', resolver);
		expect(res.ok).toBe(true);
		expect(res.origin).toEqual({ kind: 'profile', profileName: 'Diesel panel' });
		expect(seen).toEqual(['zeit|ff l/h|gs km/h|rest km|höhe m', ';', ',']);
	});

	it('counts quoted line breaks in line numbers', async () => {
		const m = columnMappingSchema.parse({ delimiter: ',', decimal: '.', time: { column: 't', format: 'epochS' }, flow: { column: 'f', unit: 'l/h' }, wpt: { column: 'w' } });
		const res = await parseRecorderText(`t,f,w\n${T0 / 1000},20,"two\nlines"\n${T0 / 1000 + 1},x,W\n`, m);
		expect(res.problems[0]).toMatchObject({ line: 4, column: 'f', value: 'x' });
	});
});

describe('live batches', () => {
	it('split headerless lines, quotes and CRLF included', () => {
		expect(splitCsvLines('a,1\r\n"b,2",3\r\n')).toEqual([
			['a', '1'],
			['b,2', '3']
		]);
		expect(splitCsvLines('x;1,5', ';')).toEqual([['x', '1,5']]);
		expect(splitCsvLines('')).toEqual([]);
	});

	it('may hold a single sample when asked', async () => {
		const one = `${HEADER}\n${iso(0)},9,100,40,W,51,-1,1000\n`;
		expect((await parseRecorderText(one, null)).ok).toBe(false);
		const res = await parseRecorderText(one, null, { minSamples: 1, afterTMs: T0 - 1000 });
		expect(res.ok).toBe(true);
		expect((await parseRecorderText(one, null, { minSamples: 1, afterTMs: T0 })).problems[0].message).toMatch(/repeats the previous sample's \(the samples already stored\)/);
	});
});

describe('a spreadsheet export with a sep= first line', () => {
	it('reads our format saved by a spreadsheet with semicolons and decimal commas', async () => {
		// Our format re-saved where a comma is the decimal mark: semicolons between the cells.
		const [header, ...data] = burndownFile(5).trimEnd().split('\n');
		const cells = data.map((r) => r.split(',').map((c) => c.replace('.', ',')).join(';'));
		const text = ['sep=;', header.replaceAll(',', ';'), ...cells].join('\r\n') + '\r\n';
		const res = await parseRecorderText(text, null);
		expect(res.problems).toEqual([]);
		expect(res.ok).toBe(true);
		expect(res.header).toMatchObject({ line: 2, layout: { delimiter: ';', sep: ';' } });
		expect(res.rowCount).toBe(5);
		expect(res.rows[0].line).toBe(3);
		// 9.5 US gal/h, written 9,5 (1 US gal = 3.785411784 L, NIST Handbook 44, Appendix C).
		expect(res.rows[0].flow).toBeCloseTo(9.5 * LITRES_PER_US_GALLON, 12);
		expect(res.rows[4].tMs).toBe(T0 + 4000);
		expect(res.lineCount).toBe(7);
	});

	it('reads a comma file with the hint like one without it, a line further down', async () => {
		const plain = await parseRecorderText(burndownFile(8), null);
		const hinted = await parseRecorderText('sep=,\n' + burndownFile(8), null);
		expect(hinted.ok).toBe(true);
		expect(hinted.rows.map((r) => ({ ...r, line: r.line - 1 }))).toEqual(plain.rows);
	});

	it('refuses a hint naming a delimiter it cannot read, saying so', async () => {
		const res = await parseRecorderText('sep=|\n' + burndownFile(3).replaceAll(',', '|'), null);
		expect(res.ok).toBe(false);
		expect(res.problems[0]).toMatchObject({ line: 1, value: 'sep=|' });
		expect(res.problems[0].message).toMatch(/sep=\|/);
	});

	it('refuses a mapping whose delimiter contradicts the hint, naming both', async () => {
		const given = columnMappingSchema.parse({
			delimiter: ',',
			decimal: '.',
			time: { column: 'time_utc', format: 'iso' },
			flow: { column: 'fuel_flow_usgph', unit: 'usgal/h' },
			gs: { column: 'ground_speed_kt', unit: 'kt' },
			dtg: { column: 'distance_to_go_nm', unit: 'nm' }
		});
		const res = await parseRecorderText('sep=;\n' + burndownFile(3).replaceAll(',', ';'), given);
		expect(res.ok).toBe(false);
		expect(res.problems[0]).toMatchObject({ line: 1, value: 'sep=;' });
		expect(res.problems[0].message).toMatch(/semicolon.*comma|comma.*semicolon/);
	});
});

describe('leaving bad lines out, by the uploader’s choice', () => {
	/** A good file whose lines `bad` (1-based file lines) are spoiled: a letter in the flow cell. */
	function spoiled(n: number, bad: number[]): string {
		const lines = burndownFile(n).split('\n');
		for (const l of bad) lines[l - 1] = lines[l - 1].replace(',9.5,', ',9.x,');
		return lines.join('\n');
	}

	it('refuses by default, listing each bad line, and says the file could be stored without them', async () => {
		const res = await parseRecorderText(spoiled(30, [5, 9]), null);
		expect(res.ok).toBe(false);
		expect(res.problems.map((p) => p.line)).toEqual([5, 9]);
		expect(res.droppable).toBe(true);
		expect(res.dropped).toEqual([]);
	});

	it('with the choice, keeps every other row and lists the lines left out', async () => {
		const res = await parseRecorderText(spoiled(30, [5, 9]), null, { dropBadLines: true });
		expect(res.ok).toBe(true);
		expect(res.rowCount).toBe(28);
		expect(res.dropped.map((p) => p.line)).toEqual([5, 9]);
		expect(res.rows.map((r) => r.line)).not.toContain(5);
	});

	it('a last line cut off at shutdown is named as such and can be left out', async () => {
		const whole = burndownFile(10);
		const cut = whole.slice(0, whole.length - 30);
		const refused = await parseRecorderText(cut, null);
		expect(refused.ok).toBe(false);
		expect(refused.problems).toHaveLength(1);
		expect(refused.problems[0].line).toBe(11);
		expect(refused.problems[0].message).toMatch(/cut off when the recorder lost power/);
		const kept = await parseRecorderText(cut, null, { dropBadLines: true });
		expect(kept.ok).toBe(true);
		expect(kept.rowCount).toBe(9);
	});

	it('more bad lines than the limit: refused even with the choice, every one listed', async () => {
		const bad = Array.from({ length: MAX_DROPPED_LINES + 1 }, (_, k) => 3 + k);
		const res = await parseRecorderText(spoiled(60, bad), null, { dropBadLines: true });
		expect(res.ok).toBe(false);
		expect(res.problemCount).toBe(MAX_DROPPED_LINES + 1);
		expect(res.droppable).toBe(false);
		expect(res.dropped).toEqual([]);
	});

	it('a header problem is never left out', async () => {
		const res = await parseRecorderText('a,b\n1,2\n3,4\n', null, { dropBadLines: true });
		expect(res.ok).toBe(false);
		expect(res.droppable).toBe(false);
	});

	it('a decimal comma in a comma-separated file is named as the likely cause', async () => {
		const lines = burndownFile(5).split('\n');
		lines[3] = lines[3].replace(',9.5,', ',9,5,');
		const res = await parseRecorderText(lines.join('\n'), null);
		expect(res.problems[0].line).toBe(4);
		expect(res.problems[0].message).toMatch(/decimal comma in a comma-separated file/);
	});
});
