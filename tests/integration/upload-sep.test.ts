// A spreadsheet's "sep=" first line, through the real upload route: a recorder file in our format
// saved again with semicolons and decimal commas is stored with the same samples and figures as
// the original, and a hint naming a delimiter we do not read is refused by its text, storing nothing.
import { beforeAll, describe, expect, it } from 'vitest';
import { asc, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights, samples } from '$lib/server/db/schema';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { makeClub, steadyFile, tableCounts, upload, type Club } from './upload-fixture';

let club: Club;
beforeAll(async () => {
	club = await makeClub('Sep Line Club');
});

/** The same file as a spreadsheet in a decimal-comma locale writes it, with its hint line. */
function asSemicolonExport(csv: string): string {
	const [header, ...rows] = csv.trimEnd().split('\n');
	const cells = rows.map((r) => r.split(',').map((c) => (/^-?\d+\.\d+$/.test(c) ? c.replace('.', ',') : c)).join(';'));
	return ['sep=;', header.replaceAll(',', ';'), ...cells].join('\r\n') + '\r\n';
}

describe('a sep= first line', () => {
	it('is read as the delimiter and skipped: the same samples and figures as the comma file', async () => {
		// 8.5 US gal/h for ten minutes: 8.5 / 6 US gal, 1 US gal = 3.785411784 L (NIST Handbook 44, Appendix C).
		const original = steadyFile({ start: Date.UTC(2026, 3, 2, 10), seconds: 600, flowUsgph: 8.5 });
		const file = asSemicolonExport(original);
		expect(file.split('\r\n')[2]).toMatch(/;8,5;100;50(,000)?$/);
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file, fileName: 'spreadsheet.csv', declaration: 'full' });
		expect(res.body.problems ?? []).toEqual([]);
		expect(res.status).toBe(201);
		expect(res.body.rows).toBe(601);
		expect(res.body.report.headerLine).toBe(2);
		const id = res.body.flightId as string;
		const [first] = await db.select().from(samples).where(eq(samples.flightId, id)).orderBy(asc(samples.seq)).limit(1);
		expect(first.flow).toBeCloseTo(8.5 * LITRES_PER_US_GALLON, 10);
		expect(first.dtg).toBe(50);
		const [f] = await db.select().from(flights).where(eq(flights.id, id));
		expect((f.summary as { fuelUsedL: number }).fuelUsedL).toBeCloseTo((8.5 / 6) * LITRES_PER_US_GALLON, 9);
	});

	it('naming a delimiter we do not read, is refused by its text with nothing stored', async () => {
		const before = await tableCounts();
		const file = 'sep=|\n' + steadyFile({ start: Date.UTC(2026, 3, 3, 10), seconds: 60, flowUsgph: 8.5 }).replaceAll(',', '|');
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file, declaration: 'full' });
		expect(res.status).toBe(400);
		expect(res.body.problems[0]).toMatchObject({ line: 1, value: 'sep=|' });
		expect(res.body.problems[0].message).toMatch(/delimiter hint \(sep=\|\)/);
		expect(await tableCounts()).toEqual(before);
	});
});
