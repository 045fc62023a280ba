// Child processes for the start and test scripts: run a command to completion, keep long-running
// services (app server, mail sink) and stop them all together on Ctrl-C, failure or exit, and
// tell who holds a TCP port when a service cannot listen.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import { root } from './paths.mjs';
import { StepError } from './log.mjs';

/** Every child still running, so a signal or an early exit can stop them all. */
const children = new Set();

function track(child) {
	children.add(child);
	child.once('exit', () => children.delete(child));
	return child;
}

function exitOf(child) {
	return new Promise((resolve) => {
		if (child.exitCode !== null || child.signalCode !== null) {
			resolve({ code: child.exitCode, signal: child.signalCode });
			return;
		}
		child.once('exit', (code, signal) => resolve({ code, signal }));
	});
}

/**
 * Runs a command to completion. Output goes to the terminal unless `capture` is set, in which
 * case stdout and stderr are collected and returned. Never rejects for a non-zero exit: the
 * caller decides; rejects only when the program cannot be started at all.
 */
export function run(cmd, args, { cwd = root, env = process.env, capture = false, stdin = 'ignore' } = {}) {
	return new Promise((resolve, reject) => {
		const child = track(
			spawn(cmd, args, { cwd, env, stdio: [stdin, capture ? 'pipe' : 'inherit', capture ? 'pipe' : 'inherit'] })
		);
		let stdout = '';
		let stderr = '';
		if (capture) {
			child.stdout.setEncoding('utf8').on('data', (d) => (stdout += d));
			child.stderr.setEncoding('utf8').on('data', (d) => (stderr += d));
		}
		child.once('error', (error) => reject(new StepError(`cannot run ${cmd}: ${error.message}`)));
		child.once('close', (code, signal) => resolve({ code: code ?? 1, signal, stdout, stderr }));
	});
}

/** Like run(), but a non-zero exit becomes a StepError naming the step (with captured output). */
export async function runOk(what, cmd, args, options = {}) {
	const result = await run(cmd, args, options);
	if (result.code !== 0) {
		const output = `${result.stdout}${result.stderr}`.trim();
		throw new StepError(
			`${what} failed (${result.signal ? `signal ${result.signal}` : `exit ${result.code}`})`,
			output ? output.split('\n').slice(-30).join('\n') : undefined
		);
	}
	return result;
}

/**
 * Starts a long-running service with its output on the terminal. Returns the child and a
 * promise of its exit, so a caller can notice a service dying while it is needed.
 */
export function startService(cmd, args, { cwd = root, env = process.env, stdin = 'ignore' } = {}) {
	const child = track(spawn(cmd, args, { cwd, env, stdio: [stdin, 'inherit', 'inherit'] }));
	const exited = new Promise((resolve) => {
		child.once('error', (error) => resolve({ code: 1, signal: null, error }));
		child.once('exit', (code, signal) => resolve({ code, signal }));
	});
	return { child, exited };
}

/** SIGTERM to one child, SIGKILL after `graceMs` if it is still there. */
export async function stop(child, graceMs = 8000) {
	if (child.exitCode !== null || child.signalCode !== null) return;
	child.kill('SIGTERM');
	const timer = setTimeout(() => child.kill('SIGKILL'), graceMs);
	await exitOf(child);
	clearTimeout(timer);
}

/** Stops every child this process started, newest first. */
export async function stopAll(graceMs = 8000) {
	await Promise.all([...children].reverse().map((child) => stop(child, graceMs)));
}

/**
 * Calls `handler(signal)` once on the first SIGINT/SIGTERM/SIGHUP; a second Ctrl-C while it runs
 * kills the children at once. Children that outlive us (a hard kill of this process) are the
 * reason services also watch our pid (see BURNDOWN_PARENT_PID in scripts/mail-sink.ts).
 */
export function onSignals(handler) {
	let handling = false;
	for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
		process.on(signal, () => {
			if (handling) {
				for (const child of children) child.kill('SIGKILL');
				process.exit(130);
			}
			handling = true;
			handler(signal);
		});
	}
	process.on('exit', () => {
		for (const child of children) child.kill('SIGKILL');
	});
}

/** True when something accepts TCP connections on host:port. */
export function portInUse(port, host = '127.0.0.1') {
	return new Promise((resolve) => {
		const socket = net.connect({ port, host });
		socket.setTimeout(1000);
		socket.once('connect', () => {
			socket.destroy();
			resolve(true);
		});
		socket.once('timeout', () => {
			socket.destroy();
			resolve(false);
		});
		socket.once('error', () => resolve(false));
	});
}

/**
 * Waits until host:port accepts connections. Fails early when `exited` (a service's exit
 * promise) settles first, so a crashing service is reported at once rather than after the timeout.
 */
export async function waitForPort(port, { host = '127.0.0.1', timeoutMs = 30_000, exited, what = `port ${port}` } = {}) {
	let gone = null;
	exited?.then((result) => (gone = result));
	const deadline = Date.now() + timeoutMs;
	while (Date.now() < deadline) {
		if (gone) throw new StepError(`${what} exited before it was ready (exit ${gone.code ?? gone.signal})`);
		if (await portInUse(port, host)) return;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new StepError(`${what} did not start listening on ${host}:${port} within ${timeoutMs / 1000} s`);
}

/**
 * Best effort, Linux only: "pid 1234 (node build)" for the process listening on a TCP port, read
 * from /proc, so a port clash message can say what to stop. Empty string when unknown.
 */
export function describePortOwner(port) {
	try {
		const inodes = new Set();
		for (const table of ['/proc/net/tcp', '/proc/net/tcp6']) {
			if (!fs.existsSync(table)) continue;
			for (const line of fs.readFileSync(table, 'utf8').split('\n').slice(1)) {
				const cols = line.trim().split(/\s+/);
				if (cols.length < 10 || cols[3] !== '0A') continue; // 0A = LISTEN
				if (parseInt(cols[1].split(':')[1], 16) === port) inodes.add(cols[9]);
			}
		}
		if (inodes.size === 0) return '';
		for (const pid of fs.readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
			let fds;
			try {
				fds = fs.readdirSync(`/proc/${pid}/fd`);
			} catch {
				continue;
			}
			for (const fd of fds) {
				let target;
				try {
					target = fs.readlinkSync(`/proc/${pid}/fd/${fd}`);
				} catch {
					continue;
				}
				const m = /^socket:\[(\d+)\]$/.exec(target);
				if (m && inodes.has(m[1])) return `pid ${pid} (${commandLine(Number(pid)) || 'unknown'})`;
			}
		}
	} catch {
		// /proc missing or unreadable: the caller's message stands without the owner.
	}
	return '';
}

/** The command line of a process from /proc, or '' if it is gone or unreadable. */
export function commandLine(pid) {
	try {
		return fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').filter(Boolean).join(' ');
	} catch {
		return '';
	}
}

/** True when a process with this pid exists (a process of another user counts as existing). */
export function pidAlive(pid) {
	try {
		process.kill(pid, 0);
		return true;
	} catch (error) {
		return error.code === 'EPERM';
	}
}

/** Throws a clear error when a port the script needs is already taken. */
export async function requireFreePort(port, what, hint) {
	if (!(await portInUse(port))) return;
	const owner = describePortOwner(port);
	throw new StepError(
		`port ${port} (${what}) is already in use${owner ? ` by ${owner}` : ''}`,
		hint ?? 'Stop that program (an earlier run left behind?) or choose another port.'
	);
}
