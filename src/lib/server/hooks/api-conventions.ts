// What every answer under /api/ keeps to, whichever route gave it: a 401 names the scheme it
// wants in WWW-Authenticate (RFC 9110 §11.6.1; bearer tokens, RFC 6750 §3), so a script knows to
// send its API token (the recorder API sets its own realm; others get Burndown's); and every error
// is an RFC 9457 problem (application/problem+json) naming the path asked for in `instance`. The
// endpoints answer problems themselves (lib/server/problem.ts); this turns what the framework
// answers on its own (405, a 500, an error page) into one, keeping its detail when it had one.
import type { Handle } from '@sveltejs/kit';
import { PROBLEM_CONTENT_TYPE, problemBody, problemResponse, type Problem } from '../problem';

export const API_REALM = 'Bearer realm="burndown"';

/** The detail of an answer that is not a problem yet: its JSON `error` or `message`, or the status's. */
async function detailOf(response: Response): Promise<{ detail: string; extra: Record<string, unknown> }> {
	const fallback = { detail: response.status >= 500 ? 'Something went wrong on our side. Nothing was changed.' : `The server answered ${response.status}.`, extra: {} };
	if (!(response.headers.get('content-type') ?? '').includes('json')) return fallback;
	try {
		const body = (await response.json()) as Record<string, unknown>;
		const { error, message, ...extra } = body;
		const detail = typeof error === 'string' ? error : typeof message === 'string' ? message : null;
		return detail ? { detail, extra } : fallback;
	} catch {
		return fallback;
	}
}

async function asProblem(response: Response, instance: string): Promise<Response> {
	const isProblem = (response.headers.get('content-type') ?? '').startsWith(PROBLEM_CONTENT_TYPE);
	let body: Problem;
	if (isProblem) {
		body = (await response.json()) as Problem;
		if (body.instance) return new Response(JSON.stringify(body), response);
		body = { ...body, instance };
	} else {
		const { detail, extra } = await detailOf(response);
		body = problemBody(response.status, detail, { instance, extra });
	}
	const headers = new Headers(response.headers);
	headers.set('content-type', PROBLEM_CONTENT_TYPE);
	headers.delete('content-length');
	const out = problemResponse(body);
	for (const [k, v] of headers) out.headers.set(k, v);
	return out;
}

export const apiConventions: Handle = async ({ event, resolve }) => {
	let response = await resolve(event);
	if (!event.url.pathname.startsWith('/api/') || response.status < 400) return response;
	response = await asProblem(response, event.url.pathname);
	if (response.status === 401 && !response.headers.has('www-authenticate')) response.headers.set('www-authenticate', API_REALM);
	return response;
};
