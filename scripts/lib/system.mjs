// Machine-level steps for the start and test scripts: are we root, install Debian packages with
// apt-get (waiting for an apt-get already running), and the `postgres` system user.
import fs from 'node:fs';
import { run, runOk } from './proc.mjs';
import { StepError, info, now, seconds } from './log.mjs';

export function isRoot() {
	return typeof process.getuid === 'function' && process.getuid() === 0;
}

export function uid() {
	return typeof process.getuid === 'function' ? process.getuid() : 0;
}

/** Pids of running apt-get / apt / dpkg processes (what `pgrep -x` would find), from /proc. */
function packageManagersRunning() {
	const names = new Set(['apt-get', 'apt', 'dpkg']);
	const found = [];
	for (const pid of fs.readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
		try {
			if (names.has(fs.readFileSync(`/proc/${pid}/comm`, 'utf8').trim())) found.push(pid);
		} catch {
			// The process ended while we looked.
		}
	}
	return found;
}

/**
 * Installs Debian packages as root; for anyone else, explains what to run and fails. Waits for
 * another apt-get to finish first, since two at once fail on dpkg's lock.
 */
export async function aptInstall(packages, why) {
	const command = `apt-get update && apt-get install -y ${packages.join(' ')}`;
	if (!isRoot()) {
		throw new StepError(`${why}, and only root can install it`, `Run as root:\n  ${command}\nthen run this command again.`);
	}
	const waitStart = Date.now();
	let said = false;
	while (packageManagersRunning().length > 0) {
		if (!said) info(`waiting for another apt-get/dpkg to finish before installing ${packages.join(' ')}…`);
		said = true;
		if (Date.now() - waitStart > 20 * 60_000) throw new StepError('another apt-get has been running for 20 minutes; giving up');
		await new Promise((r) => setTimeout(r, 2000));
	}
	const started = now();
	info(`${why}: running ${command}`);
	const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
	const lockWait = ['-o', 'DPkg::Lock::Timeout=600'];
	await runOk('apt-get update', 'apt-get', [...lockWait, 'update'], { env });
	await runOk(`apt-get install ${packages.join(' ')}`, 'apt-get', [...lockWait, 'install', '-y', ...packages], { env });
	info(`installed ${packages.join(' ')} (${seconds(started)})`);
}

/** Makes sure the `postgres` system user exists (Debian's package creates it; a bare copy may not). */
export async function ensurePostgresUser() {
	if ((await run('id', ['-u', 'postgres'], { capture: true })).code === 0) return;
	const groupExists = (await run('getent', ['group', 'postgres'], { capture: true })).code === 0;
	info('creating the postgres system user');
	await runOk('useradd postgres', 'useradd', [
		'--system',
		...(groupExists ? ['--gid', 'postgres'] : ['--user-group']),
		'--home-dir',
		'/var/lib/postgresql',
		'--no-create-home',
		'--shell',
		'/bin/bash',
		'postgres'
	]);
}
