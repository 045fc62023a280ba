// A short invented recorder file in our CSV format for the live end-to-end test: taxi, a
// full-power climb and cruise towards a waypoint, one sample a second (values are plausible for
// a six-cylinder tourer, not taken from any real flight).
const START = Date.UTC(2026, 5, 14, 10, 0, 0);

export function liveRecording(seconds = 1200): string {
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint,altitude_ft'];
	let dtg = 82;
	let alt = 450;
	for (let s = 0; s < seconds; s++) {
		const taxi = s < 120;
		const climb = !taxi && s < 420;
		const flow = taxi ? 4 : climb ? 22 : 13.5;
		const gs = taxi ? 10 : climb ? 85 : 140;
		if (!taxi) dtg = Math.max(0, dtg - gs / 3600);
		if (climb) alt += 15;
		const t = new Date(START + s * 1000).toISOString().replace('.000Z', 'Z');
		lines.push(`${t},${flow.toFixed(1)},${gs},${dtg.toFixed(2)},MARSH,${Math.round(alt)}`);
	}
	return lines.join('\n') + '\n';
}
