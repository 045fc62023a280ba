// Only same-origin paths are accepted as a place to return to after sign-in (OWASP Unvalidated
// Redirects and Forwards Cheat Sheet). Browsers drop tabs and line breaks from URLs and read a
// backslash as a slash, so such characters are refused outright rather than cleaned away.
const BASE = 'http://burndown.invalid';
const REFUSED = /[\u0000-\u0020\u007f-\u00a0\u1680\u2000-\u200f\u2028-\u202f\u205f\u3000\ufeff\\]/;

export function safeNext(next: string | null | undefined, fallback = '/'): string {
	if (typeof next !== 'string' || next.length === 0 || next.length > 2048) return fallback;
	if (REFUSED.test(next) || !next.startsWith('/') || next.startsWith('//')) return fallback;
	// An encoded slash or backslash in the path has no use here and is a second-decoding trick.
	if (/%(2f|5c)/i.test(next.split(/[?#]/)[0])) return fallback;
	let url: URL;
	try {
		url = new URL(next, BASE);
	} catch {
		return fallback;
	}
	if (url.origin !== BASE) return fallback;
	// Re-serialised: whatever is left is percent-encoded and cannot break the Location header.
	return url.pathname + url.search + url.hash;
}
