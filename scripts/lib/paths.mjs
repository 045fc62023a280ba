// Paths the start and test scripts derive from their own location, so a clone in any folder
// works (CI runs from a fresh clone elsewhere); nothing here may depend on the current directory.
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

/** A path inside the repository. */
export function inRoot(...parts) {
	return path.join(root, ...parts);
}

/** A tool installed in node_modules/.bin (vite, vitest, tsx, playwright, svelte-kit). */
export function bin(name) {
	return path.join(root, 'node_modules', '.bin', name);
}

/** Shown to people instead of the absolute path when the path is inside the repository. */
export function shortPath(p) {
	const rel = path.relative(root, p);
	return rel && !rel.startsWith('..') && !path.isAbsolute(rel) ? rel : p;
}
