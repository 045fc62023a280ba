// `vite build` for the start and test scripts, and the check that lets `npm start` skip it when
// build/ is newer than every source file (a stamp written after each successful build).
import fs from 'node:fs';
import path from 'node:path';
import { bin, inRoot } from './paths.mjs';
import { info, now, seconds } from './log.mjs';
import { runOk } from './proc.mjs';

const STAMP = inRoot('build', '.burndown-build.json');
// What goes into the bundle. Folders are walked; their own mtimes count too, so a deleted or
// renamed file also makes the build stale.
const SOURCES = ['src', 'static', 'package.json', 'package-lock.json', 'svelte.config.js', 'vite.config.ts', 'tailwind.config.js', 'tsconfig.json'];

function newestMtime(p) {
	let stat;
	try {
		stat = fs.statSync(p);
	} catch {
		return 0;
	}
	let newest = stat.mtimeMs;
	if (stat.isDirectory()) {
		for (const name of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, name)));
	}
	return newest;
}

/** Null when build/ is current, else why a build is needed. */
export function buildStaleReason() {
	let stamp;
	try {
		stamp = JSON.parse(fs.readFileSync(STAMP, 'utf8'));
	} catch {
		return 'no finished build yet';
	}
	if (!fs.existsSync(inRoot('build', 'index.js'))) return 'build/index.js is missing';
	const newest = Math.max(...SOURCES.map((s) => newestMtime(inRoot(s))));
	return newest > stamp.startedAt ? 'sources changed since the last build' : null;
}

/**
 * `svelte-kit sync` writes .svelte-kit/tsconfig.json, which tsconfig.json extends and tsx reads
 * for the $lib alias. vite and vitest keep it current themselves, so it runs (2 s) only when missing.
 */
export async function ensureKitSync() {
	if (fs.existsSync(inRoot('.svelte-kit', 'tsconfig.json'))) return;
	await runOk('svelte-kit sync', bin('svelte-kit'), ['sync'], { capture: true });
}

/** Runs `vite build`; the stamp records when it started, so edits made during the build count. */
export async function viteBuild(env = process.env) {
	const startedAt = Date.now();
	const started = now();
	info('building the app (vite build)…');
	await runOk('vite build', bin('vite'), ['build', '--logLevel', 'warn'], { env });
	// The stamp speaks for build/ only; npm test builds elsewhere (BURNDOWN_BUILD_DIR).
	const out = env.BURNDOWN_BUILD_DIR || 'build';
	if (out === 'build') fs.writeFileSync(STAMP, `${JSON.stringify({ startedAt })}\n`);
	info(`app built (${seconds(started)})`);
}
