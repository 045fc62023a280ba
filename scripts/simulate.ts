// A recorder in a terminal: replays a recorder file (our CSV format) to the live ingest API in
// accelerated real time, in batches, resending whatever the server has not acknowledged, and
// optionally dropping or duplicating batches to exercise a poor link. Prints its progress.
//
//   npm run simulate -- --file samples/<file>.csv --token <bdr_…> [--speed 30] [--drop 0.1]
//        [--duplicate 0.1] [--url http://127.0.0.1:5180] [--declare 30usgal|full|lower|unchanged]
//        [--pilot <e-mail>] [--batch-ms 1000] [--csv] [--keep-open] [--no-open] [--now]
import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { parseRecorderText, type RecorderRow } from '../src/lib/csv';

const usage = `Usage: npm run simulate -- --file samples/<file>.csv --token <recorder token> [options]
  --speed <n>        play n times faster than recorded (default 30)
  --drop <p>         pretend to send a batch but lose it, with probability p (0–1)
  --duplicate <p>    send a batch twice, with probability p (0–1)
  --url <origin>     the Burndown server (default http://127.0.0.1:5180)
  --declare <what>   start-of-flight fuel: full, lower, unchanged or an amount like 30usgal, 110l
  --pilot <e-mail>   the member flying
  --batch-ms <ms>    how often a batch goes out, in wall-clock ms (default 1000)
  --csv              send CSV lines of our recorder format instead of JSON
  --no-open          let the first batch open the flight (the last known fuel is assumed)
  --keep-open        do not close the flight at the end
  --now              move the recording in time so that it starts now (JSON batches only)`;

function fail(message: string): never {
	console.error(`simulate: ${message}`);
	process.exit(2);
}

const { values: opt } = (() => {
	try {
		return parseArgs({
			options: {
				file: { type: 'string' },
				token: { type: 'string' },
				speed: { type: 'string', default: '30' },
				drop: { type: 'string', default: '0' },
				duplicate: { type: 'string', default: '0' },
				url: { type: 'string', default: 'http://127.0.0.1:5180' },
				declare: { type: 'string' },
				pilot: { type: 'string' },
				'batch-ms': { type: 'string', default: '1000' },
				csv: { type: 'boolean', default: false },
				'no-open': { type: 'boolean', default: false },
				'keep-open': { type: 'boolean', default: false },
				now: { type: 'boolean', default: false },
				help: { type: 'boolean', short: 'h' }
			}
		});
	} catch (error) {
		fail(`${(error as Error).message}\n${usage}`);
	}
})();
if (opt.help) {
	console.log(usage);
	process.exit(0);
}
if (!opt.file || !opt.token) fail(`--file and --token are required.\n${usage}`);
const num = (name: string, v: string, min: number, max: number) => {
	const n = Number(v);
	if (!Number.isFinite(n) || n < min || n > max) fail(`--${name} must be a number from ${min} to ${max} (got ${v})`);
	return n;
};
const speed = num('speed', opt.speed!, 0.01, 10_000);
const dropP = num('drop', opt.drop!, 0, 0.9);
const dupP = num('duplicate', opt.duplicate!, 0, 1);
const batchMs = num('batch-ms', opt['batch-ms']!, 50, 60_000);
const base = opt.url!.replace(/\/$/, '');
const token = opt.token!;

function declaration(what: string | undefined) {
	if (!what) return undefined;
	if (['full', 'lower', 'unchanged'].includes(what)) return { kind: what };
	const m = /^(\d+(?:\.\d+)?)\s*(usgal|l|impgal|lb|kg)$/i.exec(what.trim());
	if (!m) fail(`--declare must be full, lower, unchanged or an amount with its unit, e.g. 30usgal (got ${what})`);
	return { kind: 'onBoard', amount: Number(m[1]), unit: m[2].toLowerCase() };
}

// ---- the file -----------------------------------------------------------------------------

const file = path.resolve(opt.file!);
let text: string;
try {
	text = fs.readFileSync(file, 'utf8');
} catch (error) {
	fail(`cannot read ${file}: ${(error as Error).message}`);
}
// The density only lets a mass-flow file parse here; the server converts with the aircraft's own.
const parsed = await parseRecorderText(text, null, { densityKgPerL: 0.72 });
if (!parsed.ok) {
	const p = parsed.problems[0];
	fail(`${path.basename(file)} is not a clean recorder file in our format: line ${p?.line}${p?.column ? `, ${p.column}` : ''}: ${p?.message} (${parsed.problemCount} problem${parsed.problemCount === 1 ? '' : 's'})`);
}
const rows: RecorderRow[] = parsed.rows;
const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
const header = lines[(parsed.header?.line ?? 1) - 1];
const hasSeq = parsed.mapping?.seq !== null && parsed.mapping?.seq !== undefined;
const seqOf = (i: number) => (hasSeq ? (rows[i].seq as number) : i);
if (opt.now && opt.csv) fail('--now rewrites sample times, which --csv sends as they are in the file: use one or the other.');
// With --now the flight happens today: every time moves by the same amount, spacing unchanged.
const shiftMs = opt.now && rows.length > 0 ? Date.now() - rows[0].tMs : 0;

// ---- talking to the server ----------------------------------------------------------------

async function post(route: string, body: string, type: string, query = ''): Promise<{ status: number; json: Record<string, unknown> }> {
	const res = await fetch(`${base}/api/v1/live/${route}${query}`, {
		method: 'POST',
		headers: { authorization: `Bearer ${token}`, 'content-type': type },
		body,
		signal: AbortSignal.timeout(15_000)
	});
	let json: Record<string, unknown> = {};
	try {
		json = (await res.json()) as Record<string, unknown>;
	} catch {
		/* not JSON: keep the status */
	}
	return { status: res.status, json };
}

interface Batch {
	from: number;
	to: number;
	sentAt: number;
	sends: number;
}

let flightId: string | null = null;
let ack = -1;
const stats = { batches: 0, sends: 0, resent: 0, dropped: 0, duplicated: 0, errors: 0 };

function body(b: Batch): { text: string; type: string; query: string } {
	if (opt.csv) {
		const out = [hasSeq ? header : `seq,${header}`];
		for (let i = b.from; i <= b.to; i++) {
			const line = lines[rows[i].line - 1];
			out.push(hasSeq ? line : `${seqOf(i)},${line}`);
		}
		return { text: out.join('\n'), type: 'text/csv', query: flightId ? `?flightId=${flightId}` : '' };
	}
	const samples = [];
	for (let i = b.from; i <= b.to; i++) {
		const r = rows[i];
		samples.push({ seq: seqOf(i), t: new Date(r.tMs + shiftMs).toISOString(), flow: r.flow, gs: r.gs, dtg: r.dtg, alt: r.alt, wpt: r.wpt, lat: r.lat, lon: r.lon });
	}
	return { text: JSON.stringify(flightId ? { flightId, samples } : { samples }), type: 'application/json', query: '' };
}

/** One attempt at a batch; a dropped batch is never sent but counts as sent, as on a real link. */
async function send(b: Batch): Promise<void> {
	b.sentAt = Date.now();
	b.sends++;
	stats.sends++;
	if (b.sends > 1) stats.resent++;
	if (Math.random() < dropP) {
		stats.dropped++;
		return;
	}
	const copies = Math.random() < dupP ? 2 : 1;
	if (copies === 2) stats.duplicated++;
	const { text: payload, type, query } = body(b);
	for (let c = 0; c < copies; c++) {
		try {
			const r = await post('samples', payload, type, query);
			if (r.status === 200) {
				flightId ??= String(r.json.flightId);
				ack = Math.max(ack, Number(r.json.ack));
			} else if (r.status === 401) fail('the server refused the token (401): check --token, or rotate it on the Recorders page.');
			else if (r.status === 409) fail(`the server refused the batch (409): ${String(r.json.error)}`);
			else {
				stats.errors++;
				console.error(`simulate: batch ${b.from}–${b.to} answered ${r.status}: ${JSON.stringify(r.json).slice(0, 300)}`);
				if (r.status === 400) process.exit(1);
			}
		} catch (error) {
			stats.errors++;
			console.error(`simulate: batch ${b.from}–${b.to} not delivered (${(error as Error).message}); will resend`);
		}
	}
}

// ---- the replay ---------------------------------------------------------------------------

if (rows.length === 0) fail('the file has no samples');
const t0 = rows[0].tMs;
const durationS = (rows[rows.length - 1].tMs - t0) / 1000;
console.log(`simulate: ${rows.length} samples, ${(durationS / 60).toFixed(1)} min of flight, at ${speed}× → about ${(durationS / speed / 60).toFixed(1)} min; to ${base}`);

if (!opt['no-open']) {
	const decl = declaration(opt.declare);
	const r = await post('open', JSON.stringify({ ...(decl ? { declaration: decl } : {}), ...(opt.pilot ? { pilot: opt.pilot } : {}), ...(hasSeq ? { firstSeq: seqOf(0) } : {}) }), 'application/json');
	if (r.status === 401) fail('the server refused the token (401): check --token, or rotate it on the Recorders page.');
	if (r.status !== 201) fail(`open answered ${r.status}: ${JSON.stringify(r.json)}`);
	flightId = String(r.json.flightId);
	console.log(`simulate: flight ${flightId} open${decl ? '' : ' (start fuel assumed: unchanged since the last flight)'}`);
}
if (opt.declare && opt['no-open']) fail('--declare needs the open call; leave out --no-open');

const RESEND_AFTER_MS = Math.max(3000, batchMs * 3);
const MAX_BATCH = 500;
const pending: Batch[] = [];
const started = Date.now();
let next = 0;
let lastPrint = 0;
let interrupted = false;
process.once('SIGINT', () => {
	interrupted = true;
});

function progress(force = false) {
	const nowMs = Date.now();
	if (!force && nowMs - lastPrint < 2000) return;
	lastPrint = nowMs;
	const at = next > 0 ? new Date(rows[next - 1].tMs + shiftMs).toISOString().slice(11, 19) : '--:--:--';
	console.log(
		`simulate: ${at} UTC  sent ${next}/${rows.length} (${Math.round((100 * next) / rows.length)} %)  acknowledged up to ${ack}  resent ${stats.resent}  dropped ${stats.dropped}  duplicated ${stats.duplicated}${stats.errors ? `  errors ${stats.errors}` : ''}`
	);
}

const lastSeq = seqOf(rows.length - 1);
while (!interrupted) {
	const elapsedS = ((Date.now() - started) / 1000) * speed;
	// New samples that are due, in batches of at most MAX_BATCH.
	while (next < rows.length && (rows[next].tMs - t0) / 1000 <= elapsedS) {
		let end = next;
		while (end + 1 < rows.length && end + 1 - next < MAX_BATCH && (rows[end + 1].tMs - t0) / 1000 <= elapsedS) end++;
		const b: Batch = { from: next, to: end, sentAt: 0, sends: 0 };
		pending.push(b);
		stats.batches++;
		next = end + 1;
		await send(b);
	}
	// Drop what is acknowledged; resend what has waited too long.
	for (let i = pending.length - 1; i >= 0; i--) if (seqOf(pending[i].to) <= ack) pending.splice(i, 1);
	for (const b of pending) if (Date.now() - b.sentAt > RESEND_AFTER_MS) await send(b);
	progress();
	if (next >= rows.length && ack >= lastSeq) break;
	await new Promise((r) => setTimeout(r, batchMs));
}
progress(true);
if (interrupted) {
	console.log('simulate: interrupted; the flight stays open (it closes by itself when idle)');
	process.exit(130);
}
if (!opt['keep-open']) {
	const r = await post('close', JSON.stringify(flightId ? { flightId } : {}), 'application/json');
	console.log(r.status === 200 ? `simulate: flight ${flightId} closed` : `simulate: close answered ${r.status}: ${JSON.stringify(r.json)}`);
}
console.log(`simulate: done: ${rows.length} samples in ${stats.batches} batches (${stats.sends} sends), all acknowledged`);
