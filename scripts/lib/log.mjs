// Console output and timings for the start and test scripts: one prefixed line per step, and an
// error type whose message (and hint) is printed without a stack trace.

const prefix = 'burndown:';

export function info(message) {
	console.log(`${prefix} ${message}`);
}

export function warn(message) {
	console.warn(`${prefix} warning: ${message}`);
}

/** Seconds since `startMs`, one decimal, for step lines and the summary. */
export function seconds(startMs) {
	return `${((performance.now() - startMs) / 1000).toFixed(1)} s`;
}

export function now() {
	return performance.now();
}

/** A failure the user can act on: printed as its message plus an optional hint, no stack. */
export class StepError extends Error {
	constructor(message, hint) {
		super(message);
		this.name = 'StepError';
		this.hint = hint;
	}
}

/** Prints an error the way the scripts report failures and returns exit status 1. */
export function report(error) {
	if (error instanceof StepError) {
		console.error(`${prefix} error: ${error.message}`);
		if (error.hint) console.error(error.hint.replace(/^/gm, '  '));
	} else {
		console.error(`${prefix} unexpected error:`, error);
	}
	return 1;
}
