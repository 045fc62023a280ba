// Any /api/ path no endpoint serves, with any method: a JSON 404 naming the path, never the HTML
// page a browser would get, so a script reads one kind of answer from the API.
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

export const fallback: RequestHandler = ({ url }) =>
	json({ error: `No API endpoint at ${url.pathname}. The endpoints are listed in the README, section "Uploading from scripts".`, path: url.pathname }, { status: 404 });
