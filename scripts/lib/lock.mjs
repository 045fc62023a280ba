// A lock file so two test runs on one machine (two clones, or two people in one working tree)
// take turns: they share the test cluster, the template database and fixed ports.
import fs from 'node:fs';
import { StepError, info } from './log.mjs';
import { commandLine, pidAlive } from './proc.mjs';

/**
 * Waits until no other live process holds `file`, then holds it until this process exits.
 * A lock whose process is gone (killed run) is taken over.
 */
export async function acquireLock(file, { what, timeoutMs = 30 * 60_000 } = {}) {
	const deadline = Date.now() + timeoutMs;
	let said = false;
	for (;;) {
		try {
			fs.writeFileSync(file, `${JSON.stringify({ pid: process.pid, cwd: process.cwd(), since: new Date().toISOString() })}\n`, { flag: 'wx' });
			break;
		} catch (error) {
			if (error.code !== 'EEXIST') throw error;
		}
		let holder = null;
		try {
			holder = JSON.parse(fs.readFileSync(file, 'utf8'));
		} catch {
			// Unreadable or half-written: treat as stale below unless it is very new.
		}
		const live = holder && pidAlive(holder.pid) && commandLine(holder.pid).includes('node');
		if (!live) {
			const age = Date.now() - fs.statSync(file, { throwIfNoEntry: false })?.mtimeMs;
			if (holder || !(age < 2000)) fs.rmSync(file, { force: true });
			else await new Promise((r) => setTimeout(r, 200));
			continue;
		}
		if (!said) info(`waiting for another ${what} (pid ${holder.pid}, in ${holder.cwd}) to finish…`);
		said = true;
		if (Date.now() > deadline) throw new StepError(`another ${what} (pid ${holder.pid}) has held ${file} for too long`);
		await new Promise((r) => setTimeout(r, 1000));
	}
	process.on('exit', () => {
		try {
			if (JSON.parse(fs.readFileSync(file, 'utf8')).pid === process.pid) fs.rmSync(file, { force: true });
		} catch {
			// Already gone.
		}
	});
}
