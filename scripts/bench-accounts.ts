// `npx tsx scripts/bench-accounts.ts`: what an outsider can learn from the account forms' timing,
// and whether the sign-in throttle holds under a burst. Serves the built app on its own port
// against a scratch database and prints, for password-reset requests and sign-ups, the answer
// time for an address with an account against one without (median and p90, and their ratio), and
// how many of 30 parallel wrong passwords were verified against the limit of 10.
// A benchmark, not a test: it prints figures and fails only when the throttle let more through.
//
//   npx tsx scripts/bench-accounts.ts [-- --rounds 40 --port 4192]
import { parseArgs } from 'node:util';
import pg from 'pg';
import { scratchDatabase, startBenchApp } from './lib/bench-app';

const { values: opt } = parseArgs({ options: { rounds: { type: 'string', default: '40' }, port: { type: 'string', default: '4192' } } });
const ROUNDS = Math.min(200, Math.max(5, Number(opt.rounds)));
const log = (s: string) => console.log(`bench:accounts: ${s}`);

const { dbUrl } = await scratchDatabase('burndown_bench_accounts');
// Every request from its own address (X-Forwarded-For), so the per-address limits stay out of it.
const app = await startBenchApp({ databaseUrl: dbUrl, port: Number(opt.port), log, env: { ADDRESS_HEADER: 'x-forwarded-for', XFF_DEPTH: '1' } });
let address = 0;
const post = async (path: string, form: Record<string, string>) => {
	address++;
	const started = performance.now();
	const res = await fetch(`${app.origin}${path}`, {
		method: 'POST',
		body: new URLSearchParams(form),
		redirect: 'manual',
		// The form action's own answer (what enhance receives), not the page around it.
		headers: { origin: app.origin, accept: 'application/json', 'x-sveltekit-action': 'true', 'x-forwarded-for': `10.${(address >> 16) & 255}.${(address >> 8) & 255}.${address & 255}` }
	});
	const ms = performance.now() - started;
	const body = await res.text();
	// A form action answers 200 with its own status inside the JSON.
	const inner = (() => {
		try {
			return (JSON.parse(body) as { status?: number }).status;
		} catch {
			return undefined;
		}
	})();
	return { ms, status: inner ?? res.status, body };
};

const db = new pg.Client({ connectionString: dbUrl });
await db.connect();
try {
	// A real argon2id hash, so a sign-in check costs what it costs in production.
	const { hash } = await import('@node-rs/argon2');
	const passwordHash = await hash('the real passphrase', { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 });
	for (let i = 0; i < ROUNDS + 1; i++) await db.query(`insert into users (id, email, name, password_hash) values ($1, $2, 'Bench', $3)`, [`bench${i}`, `known${i}@example.org`, passwordHash]);

	const stats = (xs: number[]) => {
		const s = [...xs].sort((a, b) => a - b);
		return { p50: s[Math.floor(s.length / 2)], p90: s[Math.floor(s.length * 0.9)] };
	};
	const compare = async (label: string, path: string, form: (email: string) => Record<string, string>) => {
		const known: number[] = [];
		const unknown: number[] = [];
		const bodies = new Set<string>();
		await post(path, form('warm-up@example.org'));
		for (let i = 0; i < ROUNDS; i++) {
			const k = await post(path, form(`known${i}@example.org`));
			const u = await post(path, form(`unknown${i}@example.org`));
			known.push(k.ms);
			unknown.push(u.ms);
			bodies.add(`${k.status} ${k.body.replaceAll(`known${i}@example.org`, 'X')}`);
			bodies.add(`${u.status} ${u.body.replaceAll(`unknown${i}@example.org`, 'X')}`);
		}
		const a = stats(known);
		const b = stats(unknown);
		log(
			`${label}: account ${a.p50.toFixed(1)} ms median / ${a.p90.toFixed(1)} ms p90, no account ${b.p50.toFixed(1)} / ${b.p90.toFixed(1)} ms; ` +
				`median ratio ${(a.p50 / b.p50).toFixed(2)}; distinct answers ${bodies.size} (1 = the same wording)`
		);
	};
	await compare('reset request', '/reset-password', (email) => ({ email }));
	await compare('sign-up', '/sign-up', (email) => ({ name: 'Bench Newcomer', email, password: 'a bench passphrase' }));

	const target = `known${ROUNDS}@example.org`;
	const burst = await Promise.all(Array.from({ length: 30 }, (_, i) => post('/sign-in', { email: target, password: `wrong ${i}` })));
	const verified = burst.filter((r) => r.status === 400).length;
	const refused = burst.filter((r) => r.status === 429).length;
	log(`sign-in burst: 30 parallel wrong passwords, ${verified} verified, ${refused} refused (limit 10)`);
	if (verified > 10) process.exitCode = 1;
} finally {
	await db.end();
	await app.stop();
}
