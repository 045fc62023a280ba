// The map tiles behind the track: the configured source for the pages (none by default), and the
// image source the content security policy must then allow, since tiles are images from another
// origin and kit.csp in svelte.config.js is fixed at build time.
import type { MapTiles } from '$lib/wire/map';
import { serverConfig } from './config';

/** The configured tile source, or null (the default: no tiles, nothing fetched). */
export function mapTiles(env?: Record<string, string | undefined>): MapTiles | null {
	const c = serverConfig(env);
	if (!c.MAP_TILE_URL) return null;
	return { url: c.MAP_TILE_URL, attribution: c.MAP_TILE_ATTRIBUTION!.trim(), maxZoom: c.MAP_TILE_MAX_ZOOM };
}

/** The CSP source for a tile template's origin: "{s}." becomes the wildcard "*.". */
export function tileImageSource(template: string): string {
	const m = /^(https?:\/\/)([^/]*)/.exec(template);
	if (!m) throw new Error('not a tile URL template');
	return m[1] + m[2].replace(/^\{s\}\./, '*.');
}

/** The policy with `source` added to img-src (or an img-src made from default-src when absent). */
export function allowImageSource(policy: string, source: string): string {
	const directives = policy.split(';').map((d) => d.trim()).filter(Boolean);
	const at = directives.findIndex((d) => d.split(/\s+/)[0].toLowerCase() === 'img-src');
	if (at >= 0) {
		if (!directives[at].split(/\s+/).includes(source)) directives[at] += ` ${source}`;
	} else {
		const fallback = directives.find((d) => d.split(/\s+/)[0].toLowerCase() === 'default-src');
		directives.push(`img-src ${fallback ? fallback.split(/\s+/).slice(1).join(' ') + ' ' : ''}${source}`);
	}
	return directives.join('; ');
}
