// Any /api/ path no endpoint serves, with any method: a problem 404 naming the path, never the
// HTML page a browser would get, so a script reads one kind of answer from the API.
import { problem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

export const fallback: RequestHandler = ({ url }) =>
	problem(404, `No API endpoint at ${url.pathname}. The endpoints are listed on the API page, /api-docs.`, { instance: url.pathname, extra: { path: url.pathname } });
