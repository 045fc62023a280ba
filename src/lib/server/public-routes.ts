// The routes anyone may reach without an authorization helper: the one list, read by the
// authorization guard (hooks/authorized-guard.ts) and by the access matrix test. Every other
// route's load, action and handler must pass a helper of access.ts, or the guard refuses its answer.
// No imports, so the end-to-end tests can read it as it is.

export const PUBLIC_ROUTES: ReadonlyMap<string, string> = new Map([
	['/', 'the product page; members are sent on to their organisation'],
	['/sign-in', 'signing in'],
	['/sign-up', 'creating an account'],
	['/sign-up/[token]', 'confirming a sign-up: the e-mailed link is the credential'],
	['/sign-out', 'ends the current session, if any'],
	['/reset-password', 'asking for a reset link'],
	['/reset-password/[token]', 'the link itself is the credential'],
	['/invite/[token]', 'the link shows whom it invites; accepting calls requireUser'],
	['/share/[token]', 'the read-only link to a debrief: the token is the credential (stored only as a hash)'],
	['/caution', 'what Burndown is and is not: advisory only'],
	['/dev/mailbox', 'demo mode only (404 otherwise); its own rule in its load'],
	['/api/health', 'liveness for the harness and load balancers; reveals only "up"'],
	['/api/v1/openapi.json', 'the OpenAPI document: describes the API, holds no data'],
	['/api-docs', 'the API page: renders the OpenAPI document'],
	['/api/[...rest]', 'the JSON 404 for an /api/ path no endpoint serves; reveals only that path']
]);

export const isPublicRoute = (routeId: string) => PUBLIC_ROUTES.has(routeId);
