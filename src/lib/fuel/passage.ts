// When the aircraft passed each waypoint, found from the recorder's own navigation columns: the
// waypoint id it reports changes when the next leg begins, and the distance to go reaches its
// minimum as the waypoint is passed. The minimum is the better time (a pilot may sequence the next
// waypoint late, on the ground at a stop); the id change is the fallback when distance is blank.

import { WPT_NONE, type SampleColumns } from './types';

export interface WaypointPassage {
	/** The waypoint's name as the recorder reports it. */
	wpt: string;
	/** Sample index and time (epoch s) of the passage. */
	index: number;
	t: number;
	/** How it was found: distance to go at its minimum, or the last sample before the id changed. */
	by: 'minimum' | 'change';
	/** First and last sample of the run with this waypoint id. */
	runStart: number;
	runEnd: number;
}

/**
 * One passage per run of samples reporting the same waypoint id, in order. `names` maps the
 * wpt column's integers to names (the replay payload's list). No wpt column → no passages.
 */
export function findPassages(columns: Pick<SampleColumns, 't' | 'dtg' | 'wpt'>, names: readonly string[]): WaypointPassage[] {
	const wpt = columns.wpt;
	if (!wpt) return [];
	const out: WaypointPassage[] = [];
	const n = Math.min(wpt.length, columns.t.length);
	let i = 0;
	while (i < n) {
		const id = wpt[i];
		let j = i;
		while (j + 1 < n && wpt[j + 1] === id) j++;
		if (id !== WPT_NONE && names[id] !== undefined) {
			let best = -1;
			for (let k = i; k <= j; k++) {
				const d = columns.dtg[k];
				// The first sample at the smallest distance: once passed, the distance grows again
				// (or stays at zero parked on the field), and the first touch is the passage.
				if (Number.isFinite(d) && (best < 0 || d < columns.dtg[best])) best = k;
			}
			const index = best >= 0 ? best : j;
			out.push({ wpt: names[id], index, t: columns.t[index], by: best >= 0 ? 'minimum' : 'change', runStart: i, runEnd: j });
		}
		i = j + 1;
	}
	return out;
}
