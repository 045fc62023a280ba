// Opaque, stable cursors for the API's lists (keyset pagination): a page ends at a row, and the
// cursor holds that row's sort key and id, so the next page starts right after it whatever was
// added or removed meanwhile — every row is listed once, none twice. Callers treat it as opaque.
import { isUuid } from './access';
import { problem } from './problem';

export type CursorKind = 'aircraft' | 'flights';

export function encodeCursor(kind: CursorKind, key: string, id: string): string {
	return Buffer.from(JSON.stringify([kind, key, id]), 'utf8').toString('base64url');
}

/** The position a cursor names, or null when it is not one this API gave for this list. */
export function decodeCursor(kind: CursorKind, cursor: string): { key: string; id: string } | null {
	try {
		const v: unknown = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8'));
		if (!Array.isArray(v) || v.length !== 3 || v[0] !== kind || typeof v[1] !== 'string' || typeof v[2] !== 'string' || !isUuid(v[2])) return null;
		return { key: v[1], id: v[2] };
	} catch {
		return null;
	}
}

/**
 * A page of a list: { items, next } with the next page's URL (this URL with its cursor) also in a
 * Link header (RFC 8288, rel="next"), or next: null on the last page.
 */
export function pageResponse(url: URL, items: unknown[], nextCursor: string | null): Response {
	let next: string | null = null;
	const headers: Record<string, string> = { 'content-type': 'application/json', 'cache-control': 'no-store' };
	if (nextCursor) {
		const u = new URL(url);
		u.searchParams.set('cursor', nextCursor);
		next = u.pathname + u.search;
		headers.link = `<${next}>; rel="next"`;
	}
	return new Response(JSON.stringify({ items, next }), { headers });
}

/** The 400 for a cursor this list did not give. */
export const cursorProblem = (url: URL) =>
	problem(400, 'cursor is not one this list gave: pass the `next` of the previous page as it was, or leave it out for the first page.', {
		instance: url.pathname,
		errors: [{ field: 'cursor', detail: 'not a cursor of this list' }]
	});
