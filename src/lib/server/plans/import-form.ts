// The plan form's "fill the legs from a file" step, shared by a flight's plan page and the page
// that makes a plan before the flight: the file read as CSV of legs or GPX route, the legs put into
// the form's values beside what was typed. Nothing is stored until the form is saved.
import { legsFromCsv, legsFromGpx, MAX_PLAN_FILE_BYTES } from '$lib/plan-import';
import { failForm, formValues } from '$lib/schemas/form';
import { PLAN_LEG_FIELDS } from '$lib/schemas/plan';

export async function importPlanFile(body: FormData) {
	const values = formValues(body);
	const file = body.get('file');
	if (!(file instanceof File) || file.size === 0) return failForm(400, { file: 'Choose a CSV of legs or a GPX route file.' }, values, 'import');
	if (file.size > MAX_PLAN_FILE_BYTES) return failForm(400, { file: `The file is larger than ${MAX_PLAN_FILE_BYTES / 1024} KB; a plan's legs fit in far less.` }, values, 'import');
	const text = await file.text();
	const gpx = /\.gpx$/i.test(file.name) || /^\s*(<\?xml|<gpx)/i.test(text);
	const result = gpx ? legsFromGpx(text) : legsFromCsv(text);
	if (!result.ok) return failForm(400, { file: `${file.name}: ${result.message}` }, values, 'import');
	const kept = Object.fromEntries(Object.entries(values).filter(([k]) => !k.startsWith('legs.')));
	result.rows.forEach((row, i) => {
		for (const f of PLAN_LEG_FIELDS) kept[`legs.${i}.${f}`] = row[f];
	});
	return { action: 'import' as const, imported: result.rows.length, warnings: result.warnings, values: kept };
}
