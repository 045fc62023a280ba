// Words for codes shown to people, one map per list, so a code is worded the same on every page.
import type { DebriefStatus, PlanImportFormat } from '$lib/wire/plan';

export const debriefStatusLabels: Record<DebriefStatus, string> = {
	draft: 'Draft — not yet shown to the student',
	published: 'Published to the student'
};

export const planImportFormatLabels: Record<PlanImportFormat, string> = {
	csv: 'CSV of legs',
	gpx: 'GPX 1.1 route'
};
