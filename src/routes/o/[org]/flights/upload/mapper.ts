// The column mapper's editable state: every choice as a plain string the form controls bind to,
// and the conversions to and from a checked ColumnMapping.
import {
	columnMappingSchema,
	type AltitudeUnit,
	type ColumnMapping,
	type Delimiter,
	type Preview,
	type TimeFormat
} from '$lib/csv';
import type { DistanceUnit, FlowUnit, SpeedUnit } from '$lib/units';

export interface MappingDraft {
	delimiter: Delimiter;
	decimal: '.' | ',';
	time: { column: string; format: TimeFormat; date: string; start: string; utcOffsetH: string };
	flow: { column: string; unit: FlowUnit };
	gs: { column: string; unit: SpeedUnit };
	dtg: { column: string; unit: DistanceUnit };
	alt: { column: string; unit: AltitudeUnit };
	wpt: { column: string };
	lat: { column: string };
	lon: { column: string };
	seq: { column: string };
}

export function draftFromPreview(p: Preview): MappingDraft {
	const g = p.guess;
	return {
		delimiter: p.delimiter,
		decimal: p.decimal,
		time: { column: g.time?.column ?? '', format: g.time?.format ?? 'iso', date: '', start: '', utcOffsetH: '0' },
		flow: { column: g.flow?.column ?? '', unit: (g.flow?.unit as FlowUnit) ?? 'usgal/h' },
		gs: { column: g.gs?.column ?? '', unit: (g.gs?.unit as SpeedUnit) ?? 'kt' },
		dtg: { column: g.dtg?.column ?? '', unit: (g.dtg?.unit as DistanceUnit) ?? 'nm' },
		alt: { column: g.alt?.column ?? '', unit: (g.alt?.unit as AltitudeUnit) ?? 'ft' },
		wpt: { column: g.wpt?.column ?? '' },
		lat: { column: g.lat?.column ?? '' },
		lon: { column: g.lon?.column ?? '' },
		seq: { column: g.seq?.column ?? '' }
	};
}

export function draftFromMapping(m: ColumnMapping): MappingDraft {
	return {
		delimiter: m.delimiter,
		decimal: m.decimal,
		time: { column: m.time.column, format: m.time.format, date: m.time.date ?? '', start: m.time.start ?? '', utcOffsetH: String((m.time.utcOffsetMin ?? 0) / 60) },
		flow: { ...m.flow },
		gs: m.gs ? { ...m.gs } : { column: '', unit: 'kt' },
		dtg: m.dtg ? { ...m.dtg } : { column: '', unit: 'nm' },
		alt: m.alt ? { ...m.alt } : { column: '', unit: 'ft' },
		wpt: { column: m.wpt?.column ?? '' },
		lat: { column: m.lat?.column ?? '' },
		lon: { column: m.lon?.column ?? '' },
		seq: { column: m.seq?.column ?? '' }
	};
}

/** The checked mapping, or the first thing to fix. */
export function mappingFromDraft(d: MappingDraft): { mapping: ColumnMapping } | { error: string } {
	const offsetH = Number(d.time.utcOffsetH.replace(',', '.') || '0');
	if (!Number.isFinite(offsetH)) return { error: 'Give the UTC offset in hours, e.g. 2 or -5.' };
	const opt = <T extends { column: string }>(c: T) => (c.column ? c : null);
	const candidate = {
		delimiter: d.delimiter,
		decimal: d.decimal,
		time: {
			column: d.time.column,
			format: d.time.format,
			// Left out while empty, so the message asks for the date rather than its format.
			...(d.time.format === 'clock' ? { ...(d.time.date ? { date: d.time.date } : {}), utcOffsetMin: Math.round(offsetH * 60) } : {}),
			...(d.time.format === 'elapsedS' && d.time.start ? { start: d.time.start } : {})
		},
		flow: d.flow,
		gs: opt(d.gs),
		dtg: opt(d.dtg),
		alt: opt(d.alt),
		wpt: opt(d.wpt),
		lat: opt(d.lat),
		lon: opt(d.lon),
		seq: opt(d.seq)
	};
	if (!d.time.column) return { error: 'Choose the column that holds the time.' };
	if (!d.flow.column) return { error: 'Choose the column that holds the fuel flow.' };
	const r = columnMappingSchema.safeParse(candidate);
	return r.success ? { mapping: r.data } : { error: r.error.issues[0].message };
}

/** The text up to its last complete line, so a sample cut mid-line parses cleanly. */
export function completeLines(text: string, whole: boolean): string {
	if (whole) return text;
	const cut = Math.max(text.lastIndexOf('\n'), text.lastIndexOf('\r'));
	return cut < 0 ? '' : text.slice(0, cut + 1);
}
