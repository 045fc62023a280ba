// The server's settings from the environment, parsed with zod in one place: every module reads
// `serverConfig()` instead of process.env, so a variable has one name, one default and one type
// (the table in DEVELOPERS.md, "Configuration"). Parsed at each call — a few dozen string checks —
// so a test or an operator changing a variable sees it at the next request. A value that does not
// parse is an error naming the variable, never a silent NaN. The tunables of limits.ts and
// live/config.ts keep their own readers (each falls back to its default on a bad value, on purpose).
import { z } from 'zod';

/** An unset variable and an empty one mean the same: not set. */
const optional = <T extends z.ZodType>(schema: T) => z.preprocess((v) => (v === '' ? undefined : v), schema);

/**
 * A map tile URL template: http(s), with {z}, {x} and {y}; {s} (a subdomain letter) only as the
 * host's first label, so the content security policy can allow it as one wildcard source.
 */
export function isTileTemplate(v: string): boolean {
	if (!v.includes('{z}') || !v.includes('{x}') || !v.includes('{y}')) return false;
	const host = /^https?:\/\/([^/]*)/.exec(v)?.[1];
	if (host === undefined || /[{}]/.test(host.replace(/^\{s\}\./, ''))) return false;
	try {
		return ['http:', 'https:'].includes(new URL(v.replace(/\{[a-z]+\}/g, 'a')).protocol);
	} catch {
		return false;
	}
}

const envSchema = z.object({
	DATABASE_URL: optional(z.string().optional()),
	DATABASE_POOL_MAX: optional(z.coerce.number().int().min(1).default(10)),
	ORIGIN: optional(z.string().optional()),
	SMTP_HOST: optional(z.string().default('127.0.0.1')),
	SMTP_PORT: optional(z.coerce.number().int().min(1).max(65535).default(2525)),
	SMTP_SECURE: optional(z.string().optional()).transform((v) => v === 'true'),
	SMTP_USER: optional(z.string().optional()),
	SMTP_PASS: optional(z.string().optional()),
	MAIL_FROM: optional(z.string().default('Burndown <no-reply@burndown.invalid>')),
	/** Demo mode: the mailbox page and the demo sign-ins. Never set in production. */
	BURNDOWN_DEMO: optional(z.string().optional()).transform((v) => v === '1'),
	MAILBOX_DIR: optional(z.string().optional()),
	/**
	 * Hours an open live flight stays open after its last batch when that batch ended with the
	 * engine stopped on the ground: a planned stop between legs, not a forgotten recorder. Our
	 * default, 4 h; a link lost with the engine running keeps the shorter idle time of live/config.ts.
	 */
	LIVE_STOP_OPEN_HOURS: optional(z.coerce.number().min(0.1).max(48).default(4)),
	/** Map tiles behind the track; none by default (the track draws on a plain background). */
	MAP_TILE_URL: optional(z.string().refine(isTileTemplate, 'must be an http(s) URL template with {z}, {x} and {y} (and {s} only as the first label of the host)').optional()),
	/** Who the tiles are from, shown on the map as plain text; required with MAP_TILE_URL. */
	MAP_TILE_ATTRIBUTION: optional(z.string().max(300).optional()),
	MAP_TILE_MAX_ZOOM: optional(z.coerce.number().int().min(1).max(22).default(18))
}).superRefine((c, ctx) => {
	if (c.MAP_TILE_URL && !c.MAP_TILE_ATTRIBUTION?.trim())
		ctx.addIssue({ code: 'custom', path: ['MAP_TILE_ATTRIBUTION'], message: 'is required when MAP_TILE_URL is set (the tile provider\'s credit, shown on the map)' });
});

export type ServerConfig = z.infer<typeof envSchema>;

export function serverConfig(env: Record<string, string | undefined> = process.env): ServerConfig {
	const parsed = envSchema.safeParse(env);
	if (!parsed.success) {
		const issue = parsed.error.issues[0];
		throw new Error(`Environment variable ${String(issue.path[0])}: ${issue.message}`);
	}
	return parsed.data;
}

/** The one demo flag. */
export const demoMode = (): boolean => serverConfig().BURNDOWN_DEMO;
