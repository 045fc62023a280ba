// See https://svelte.dev/docs/kit/types#app.d.ts
import type { AuthSession, AuthUser } from '$lib/server/auth';

declare global {
	namespace App {
		interface Locals {
			user: AuthUser | null;
			session: AuthSession | null;
			/** How the request was authenticated: a browser session or a personal API token. */
			authVia: 'session' | 'token' | null;
		}
		interface Error {
			message: string;
		}
	}
}

export {};
