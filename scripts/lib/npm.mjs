// Installs the npm packages when node_modules is missing or older than package-lock.json. Needs
// only Node's built-ins, since it runs before anything in node_modules can be imported.
import fs from 'node:fs';
import { inRoot } from './paths.mjs';
import { runOk } from './proc.mjs';
import { StepError, info, now, seconds } from './log.mjs';

function mtimeMs(p) {
	try {
		return fs.statSync(p).mtimeMs;
	} catch {
		return null;
	}
}

/** Why `npm ci` is needed, or null when node_modules matches the lock. */
function staleReason() {
	const lock = mtimeMs(inRoot('package-lock.json'));
	if (lock === null) throw new StepError('package-lock.json is missing; the scripts install exactly what it pins');
	if (mtimeMs(inRoot('node_modules')) === null) return 'node_modules is missing';
	// npm rewrites node_modules/.package-lock.json on every install; it can be written a few
	// milliseconds before package-lock.json itself, hence the two-second allowance.
	const installed = mtimeMs(inRoot('node_modules', '.package-lock.json')) ?? mtimeMs(inRoot('node_modules'));
	if (lock > installed + 2000) return 'package-lock.json is newer than node_modules';
	return null;
}

export async function ensureNodeModules() {
	const reason = staleReason();
	if (!reason) return false;
	const started = now();
	info(`${reason}: running npm ci`);
	await runOk('npm ci', 'npm', ['ci', '--no-audit', '--no-fund']);
	info(`npm packages installed (${seconds(started)})`);
	return true;
}
