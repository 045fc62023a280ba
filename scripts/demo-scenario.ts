// The invented demo scenario. Every name, registration, airfield and figure here is fictional;
// only the trade facts behind them (fuel types, typical flows) are real.
import type { FuelUnit } from '../src/lib/units';

export const DEMO_ORG_ID = '0b8a1c52-5d0e-4f41-9a57-5a7d3c2e0001';
export const OTHER_ORG_ID = '0b8a1c52-5d0e-4f41-9a57-5a7d3c2e0002';

export const DEMO = {
	password: 'burndown-demo',
	users: [
		{ id: 'demo-admin', email: 'admin@kestrel.example', name: 'Morgan Hale', blurb: 'club admin and owner of the fleet' },
		{ id: 'demo-instructor', email: 'instructor@kestrel.example', name: 'Ines Varga', blurb: 'flight instructor' },
		{ id: 'demo-pilot', email: 'pilot@kestrel.example', name: 'Theo Lindqvist', blurb: 'club pilot' },
		{ id: 'demo-student', email: 'student@kestrel.example', name: 'Priya Achebe', blurb: 'student pilot (role pilot)' },
		{ id: 'demo-viewer', email: 'viewer@kestrel.example', name: 'Wrenmoor Aero Services', blurb: 'maintenance shop, read-only' },
		{ id: 'demo-other', email: 'chief@harrier.example', name: 'Sol Okafor', blurb: 'admin of another organisation' }
	],
	organisations: [
		{
			id: DEMO_ORG_ID,
			name: 'Kestrel Field Flying Club',
			slug: 'kestrel',
			members: [
				['demo-admin', 'admin'],
				['demo-instructor', 'instructor'],
				['demo-pilot', 'pilot'],
				['demo-student', 'pilot'],
				['demo-viewer', 'viewer']
			] as const
		},
		{ id: OTHER_ORG_ID, name: 'Harrier Flight School', slug: 'harrier', members: [['demo-other', 'admin']] as const }
	],
	aircraft: [
		{
			id: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001',
			orgId: DEMO_ORG_ID,
			registration: 'BD-KTR',
			type: 'Four-seat trainer',
			engine: '4-cylinder, 160 hp',
			fuelType: 'avgas' as const,
			displayUnit: 'usgal' as FuelUnit,
			capacity: 40,
			lowerLevel: 28,
			unusable: 3,
			meterFactor: 1,
			kFactor: 68000,
			lowFuel: 10,
			lowEnduranceMin: 45,
			reserveRule: 'faa-91.151-vfr-day',
			baselineCruise: 8.2,
			lastOnBoard: 36
		},
		{
			id: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000002',
			orgId: DEMO_ORG_ID,
			registration: 'BD-KTT',
			type: 'Six-seat tourer',
			engine: '6-cylinder, 285 hp',
			fuelType: 'avgas' as const,
			displayUnit: 'usgal' as FuelUnit,
			capacity: 88,
			lowerLevel: 62,
			unusable: 4,
			meterFactor: 1,
			kFactor: 29500,
			lowFuel: 20,
			lowEnduranceMin: 45,
			reserveRule: 'faa-91.151-vfr-day',
			baselineCruise: 13.4,
			lastOnBoard: 80
		},
		{
			id: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000003',
			orgId: DEMO_ORG_ID,
			registration: 'BD-KTD',
			type: 'Four-seat diesel tourer',
			engine: '4-cylinder jet-fuel diesel, 155 hp',
			fuelType: 'jet' as const,
			displayUnit: 'l' as FuelUnit,
			capacity: 190,
			lowerLevel: 120,
			unusable: 8,
			meterFactor: 1,
			kFactor: null,
			lowFuel: 40,
			lowEnduranceMin: 45,
			reserveRule: 'easa-nco.op.125-vfr-day',
			baselineCruise: 22,
			lastOnBoard: 150
		},
		{
			id: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000004',
			orgId: OTHER_ORG_ID,
			registration: 'BD-HFA',
			type: 'Two-seat trainer',
			engine: '4-cylinder, 100 hp',
			fuelType: 'avgas' as const,
			displayUnit: 'usgal' as FuelUnit,
			capacity: 24,
			lowerLevel: null,
			unusable: 2,
			meterFactor: 1,
			kFactor: null,
			lowFuel: 6,
			lowEnduranceMin: 40,
			reserveRule: 'faa-91.151-vfr-day',
			baselineCruise: 5.5,
			lastOnBoard: 20
		}
	],
	recorders: [
		{
			id: '9c7e5b10-3a2d-4e8f-b1c4-000000000001',
			orgId: DEMO_ORG_ID,
			aircraftId: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000002',
			name: 'Panel recorder (tourer)',
			// A fixed token so the demo can print a ready simulator command. Demo data only.
			token: 'bdr_demo_kestrel_tourer_0001'
		},
		{
			id: '9c7e5b10-3a2d-4e8f-b1c4-000000000002',
			orgId: DEMO_ORG_ID,
			aircraftId: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001',
			name: 'Panel recorder (trainer)',
			token: 'bdr_demo_kestrel_trainer_0002'
		}
	],
	/** The instructor watches the trainer: its alarms reach her by e-mail. */
	watches: [{ userId: 'demo-instructor', aircraftId: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001' }],
	/**
	 * The student's fuel plan for the solo cross-country (US gal, kt, NM; waypoint ids as the
	 * recorder reports them). The leg to FENWAY is planned at cruise flow, but the climb out of
	 * Bramble Down went full rich: that leg comes out off plan.
	 */
	crossCountryPlan: {
		file: 'kestrel-crosscountry-3leg.csv',
		/**
		 * Used where a test declares the flight itself, and for the waiting plan the seed makes for
		 * tomorrow; the seeded flight's plan starts from the fuel that flight declared instead.
		 */
		startOnBoard: 62,
		taxi: 0.8,
		climb: 1.0,
		reserveRule: 'faa-91.151-vfr-day' as const,
		reserveFlow: 13.4,
		legs: [
			{ to: 'CAIRNS', distanceNm: 36.2, gsKt: 120, flow: 13.4 },
			{ to: 'SALTMR', distanceNm: 35.5, gsKt: 140, flow: 9.5 },
			{ to: 'BRAMBL', distanceNm: 59.5, gsKt: 145, flow: 15.0, refuelTo: 88 },
			{ to: 'FENWAY', distanceNm: 35.3, gsKt: 140, flow: 16.0 },
			{ to: 'KESTRL', distanceNm: 74.4, gsKt: 160, flow: 11.5 }
		],
		note: { at: '2026-06-20T11:12:00Z', body: 'Climb out of Bramble Down full rich all the way to cruise: lean in the climb above 3000 ft as briefed.' }
	},
	/** The sample file the printed simulator command replays. */
	liveSample: 'kestrel-crosscountry-3leg.csv'
};
