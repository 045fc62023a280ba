import { describe, expect, it } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import { legsFromCsv, legsFromGpx } from './plan-import';
import { parsePlanForm } from './schemas/plan';

// A route written by hand for the test, GPX 1.1 (topografix.com/GPX/1/1): departure + 2 points.
const GPX = `<?xml version="1.0" encoding="UTF-8"?>
<gpx version="1.1" creator="burndown-test" xmlns="http://www.topografix.com/GPX/1/1">
  <rte>
    <name>Test route</name>
    <rtept lat="47.2" lon="-31.4"><name>KESTRL</name></rtept>
    <rtept lat="47.65" lon="-30.95"><name>CAIRNS</name></rtept>
    <rtept lat="47.95" lon="-30.1"><name>BRAMBL</name></rtept>
  </rte>
</gpx>`;
const wgs84Nm = (a: number, b: number, c: number, d: number) => geodesic.Geodesic.WGS84.Inverse(a, b, c, d).s12! / 1852;

describe('legsFromGpx', () => {
	it('turns a route into legs to each next point, distances as great circles', () => {
		const r = legsFromGpx(GPX);
		if (!r.ok) throw new Error(r.message);
		expect(r.rows.map((x) => x.to)).toEqual(['CAIRNS', 'BRAMBL']);
		// Checked against the WGS84 geodesic (geographiclib-geodesic) to 0.5 % and 0.1 NM rounding.
		expect(Math.abs(+r.rows[0].distance - wgs84Nm(47.2, -31.4, 47.65, -30.95))).toBeLessThan(0.005 * 35 + 0.05);
		expect(Math.abs(+r.rows[1].distance - wgs84Nm(47.65, -30.95, 47.95, -30.1))).toBeLessThan(0.005 * 40 + 0.05);
	});
	it('says what is wrong with a file that is not a route', () => {
		expect(legsFromGpx('<gpx><rte><rtept lat="x" lon="1"/><rtept lat="1" lon="1"/></rte></gpx>')).toMatchObject({ ok: false, message: expect.stringMatching(/Route point 1/) });
		expect(legsFromGpx('<gpx><trk/></gpx>')).toMatchObject({ ok: false, message: expect.stringMatching(/no route/) });
		expect(legsFromGpx('<gpx><rte>')).toMatchObject({ ok: false, message: expect.stringMatching(/not a readable GPX/) });
		expect(legsFromGpx('plain text')).toMatchObject({ ok: false });
	});
});

describe('legsFromCsv', () => {
	it('reads one leg per row by header name, in any column order', () => {
		const r = legsFromCsv('Waypoint,Distance NM,GS kt,Flow,Remark\nCAIRNS,36.2,120,8.5,first\nSALTMR,35.5,130,8.2,\n');
		if (!r.ok) throw new Error(r.message);
		expect(r.rows).toEqual([
			{ to: 'CAIRNS', distance: '36.2', gs: '120', time: '', flow: '8.5', fuel: '', refuel: '' },
			{ to: 'SALTMR', distance: '35.5', gs: '130', time: '', flow: '8.2', fuel: '', refuel: '' }
		]);
		expect(r.warnings[0]).toMatch(/remark/);
	});
	it('refuses a file without the waypoint or distance column, naming line 1', () => {
		expect(legsFromCsv('name,nm\nA,1')).toMatchObject({ ok: false, message: expect.stringMatching(/^Line 1: .*waypoint/) });
		expect(legsFromCsv('waypoint,gs\nA,1')).toMatchObject({ ok: false, message: expect.stringMatching(/distance/) });
	});
});

describe('parsePlanForm', () => {
	const header = { unit: 'usgal', start: '40', taxi: '1', climb: '1.5', reserveRule: 'faa-91.151-vfr-day', reserveMin: '', reserveFlow: '8', tolerance: '' };
	it('parses legs in row order whatever their numbers, fuel to litres', () => {
		const r = parsePlanForm({ ...header, 'legs.5.to': 'B', 'legs.5.distance': '210', 'legs.5.time': '1:45', 'legs.5.fuel': '14', 'legs.2.to': 'A', 'legs.2.distance': '400', 'legs.2.gs': '100', 'legs.2.flow': '5' }, 0.72);
		if (!r.ok) throw new Error(JSON.stringify(r.errors));
		expect(r.data.legs.map((l) => [l.to, l.timeMin, l.gsKt])).toEqual([
			['A', null, 100],
			['B', 105, null]
		]);
		expect(r.data.legs[0].flowLph).toBeCloseTo(5 * 3.785411784, 10); // NIST Handbook 44, App. C
		expect(r.data.tolerancePercent).toBe(10);
		expect(r.values['legs.1.to']).toBe('B');
	});
	it('names each bad cell and keeps the input', () => {
		const r = parsePlanForm({ ...header, start: 'lots', 'legs.0.to': '', 'legs.0.distance': '12', 'legs.1.to': 'X', 'legs.1.distance': 'far', 'legs.1.gs': '100', 'legs.1.flow': '8' }, 0.72);
		expect(r.ok).toBe(false);
		if (r.ok) return;
		expect(Object.keys(r.errors).sort()).toEqual(['legs.0.flow', 'legs.0.gs', 'legs.0.to', 'legs.1.distance', 'start']);
		expect(r.values['legs.1.distance']).toBe('far');
		expect(parsePlanForm(header, 0.72)).toMatchObject({ ok: false, errors: { legs: 'Add at least one leg.' } });
	});
});
