// Calibrating an aircraft's flow sensor against fuel pumped: records the reconciliation and, if
// asked, applies it as a new meter factor (Burndown corrects) or a new K-factor (the sensor does).
import { desc, eq } from 'drizzle-orm';
import { calibrate } from '$lib/fuel';
import { toLitres } from '$lib/units';
import type { CalibrationForm } from '$lib/schemas/calibration';
import { db } from '../db';
import { aircraft as aircraftTable, calibrations, type Aircraft } from '../db/schema';
import { lockAircraftFlights, recomputeAircraftFlights } from '../flights/summary';

/** The aircraft's latest calibrations, newest first. */
export async function listCalibrations(aircraftId: string, limit = 20) {
	return db.select().from(calibrations).where(eq(calibrations.aircraftId, aircraftId)).orderBy(desc(calibrations.createdAt)).limit(limit);
}

export async function recordCalibration(a: Aircraft, form: CalibrationForm, userId: string) {
	const shownL = toLitres(form.shown, a.displayUnit, a.densityKgPerL);
	const pumpedL = toLitres(form.pumped, a.displayUnit, a.densityKgPerL);
	// What Burndown showed already includes the current meter factor; the sensor's own reading did not.
	const indicatedL = shownL / a.meterFactor;
	const result = calibrate({ indicatedL, pumpedL, kFactorOld: a.kFactor });
	if (!result.ok) return result;

	const meterFactorNew = form.apply === 'meterFactor' ? result.meterFactor : form.apply === 'kFactor' ? 1 : a.meterFactor;
	const kFactorNew = form.apply === 'kFactor' ? result.kFactorNew : a.kFactor;
	await db.transaction(async (tx) => {
		if (form.apply !== 'none') await lockAircraftFlights(a.id, tx);
		await tx.insert(calibrations).values({
			aircraftId: a.id,
			indicatedL,
			pumpedL,
			meterFactorOld: a.meterFactor,
			meterFactorNew,
			kFactorOld: a.kFactor,
			kFactorNew,
			note: form.note,
			createdBy: userId
		});
		if (form.apply !== 'none') {
			await tx.update(aircraftTable).set({ meterFactor: meterFactorNew, kFactor: kFactorNew, updatedAt: new Date() }).where(eq(aircraftTable.id, a.id));
			// The meter factor scales every flight's fuel used: the stored figures follow it.
			if (meterFactorNew !== a.meterFactor) await recomputeAircraftFlights(a.id, tx);
		}
	});
	return { ...result, applied: form.apply, meterFactorNew, kFactorNew };
}
