// The one way an /api/v1 endpoint answers an error: problem(status, detail, …) builds the RFC 9457
// body and headers; apiHandler wraps a handler so that what the access helpers and error() throw
// comes out as a problem too. The api-conventions hook turns any remaining non-problem error
// (the framework's own 405, a 500) into one as a last resort.
import { isHttpError, type RequestEvent } from '@sveltejs/kit';
import type { ApiTokenScope } from '$lib/permissions';
import { PROBLEM_CONTENT_TYPE, PROBLEM_TYPES, problemTypeUri, type FieldError, type Problem, type ProblemType } from '$lib/wire/problem';

export { PROBLEM_CONTENT_TYPE, type Problem };

const KIND_OF_STATUS: Record<number, ProblemType> = {
	400: 'invalid-request',
	401: 'unauthorized',
	403: 'forbidden',
	404: 'not-found',
	405: 'method-not-allowed',
	408: 'timeout',
	409: 'conflict',
	413: 'too-large',
	415: 'unsupported-media-type',
	429: 'busy'
};

export const kindOfStatus = (status: number): ProblemType => KIND_OF_STATUS[status] ?? (status >= 500 ? 'server-error' : 'invalid-request');

export interface ProblemOptions {
	kind?: ProblemType;
	instance?: string;
	errors?: FieldError[];
	headers?: Record<string, string>;
	/** Extension members (RFC 9457 §3.2); they never replace the standard ones. */
	extra?: Record<string, unknown>;
}

export function problemBody(status: number, detail: string, o: Omit<ProblemOptions, 'headers'> = {}): Problem {
	const kind = o.kind ?? kindOfStatus(status);
	return {
		...o.extra,
		type: problemTypeUri(kind),
		title: PROBLEM_TYPES[kind],
		status,
		detail,
		...(o.instance ? { instance: o.instance } : {}),
		...(o.errors?.length ? { errors: o.errors } : {})
	};
}

export function problemResponse(body: Problem, headers: Record<string, string> = {}): Response {
	return new Response(JSON.stringify(body), { status: body.status, headers: { 'content-type': PROBLEM_CONTENT_TYPE, 'cache-control': 'no-store', ...headers } });
}

/** An error answer of the API. */
export function problem(status: number, detail: string, o: ProblemOptions = {}): Response {
	return problemResponse(problemBody(status, detail, o), o.headers);
}

type Handler<E extends Pick<RequestEvent, 'url' | 'locals'>> = (event: E) => Response | Promise<Response>;

/**
 * A +server.ts handler of the API: it declares the personal-token scope it needs (checked by the
 * access helpers, lib/server/access.ts), and its thrown error(…) (access helpers, not found)
 * answers a problem.
 */
export function apiHandler<E extends Pick<RequestEvent, 'url' | 'locals'>>(scope: ApiTokenScope, handler: Handler<E>): Handler<E> {
	return async (event) => {
		event.locals.needScope = scope;
		try {
			return await handler(event);
		} catch (e) {
			if (isHttpError(e)) return problem(e.status, e.body.message, { instance: event.url.pathname });
			throw e;
		}
	};
}
