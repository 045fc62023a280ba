// The zone local times are shown in beside UTC: the user's preference when the account has one
// (known on the server too, so both render the same), otherwise the browser's own zone, which
// only the browser knows: it is filled in after mount, so the server's HTML and the first
// client render both show UTC alone and hydration never disagrees.
import { page } from '$app/state';

let browserZone = $state<string | null>(null);

/** Called once from the root layout's onMount. Never on the server: this module's state is shared there. */
export function detectBrowserZone(): void {
	try {
		browserZone = Intl.DateTimeFormat().resolvedOptions().timeZone || null;
	} catch {
		browserZone = null;
	}
}

/** The zone to show local times in now, or null (UTC alone) until the browser's is known. */
export function readerZone(): string | null {
	const pref = (page.data as { user?: { timeZone?: string | null } | null }).user?.timeZone ?? null;
	return pref ?? browserZone;
}

/** The browser's own zone once mounted (for the account page's "browser's zone" choice). */
export const browserTimeZone = (): string | null => browserZone;
