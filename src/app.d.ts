// See https://svelte.dev/docs/kit/types#app.d.ts
import type { AuthSession, AuthUser } from '$lib/server/auth';
import type { ApiTokenScope } from '$lib/permissions';

declare global {
	namespace App {
		interface Locals {
			user: AuthUser | null;
			session: AuthSession | null;
			/** How the request was authenticated: a browser session or a personal API token. */
			authVia: 'session' | 'token' | null;
			/** The personal API token the request came with (authVia 'token'): what it may do. */
			apiToken?: { id: string; scope: ApiTokenScope } | null;
			/** The token scope the endpoint needs (set by apiHandler; by default from the method). */
			needScope?: ApiTokenScope;
			/** Why a bearer credential was not accepted (expired), for the 401's detail. */
			authProblem?: string | null;
			/**
			 * Set by the helpers of $lib/server/access.ts: 'granted' when one let the request through,
			 * 'refused' when one answered 401/403/404 or sent to sign-in. The authorization guard
			 * (hooks/authorized-guard.ts) refuses any answer of a non-public route where it stayed null.
			 */
			access?: 'granted' | 'refused' | null;
		}
		interface Error {
			message: string;
		}
	}
}

export {};
