// Free text people type (names, titles, notes): one primitive for every such field, so no
// control character and no bidirectional embedding, override or isolate is ever stored. They hide
// or reorder what the next reader sees (Unicode Technical Report #36, "Bidirectional text
// spoofing"; OWASP Input Validation Cheat Sheet). Multi-line fields keep ordinary line breaks.
import { z } from 'zod';

/**
 * C0 controls (U+0000–U+001F), DEL and C1 controls (U+007F–U+009F), the bidirectional
 * embeddings and overrides (U+202A–U+202E) and isolates (U+2066–U+2069), and lone surrogates.
 */
const FORBIDDEN = /[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/u;
const FORBIDDEN_MULTILINE = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/u;

const NAMES: Record<number, string> = {
	0x00: 'a NUL byte',
	0x09: 'a tab',
	0x0a: 'a line break',
	0x0d: 'a line break',
	0x202a: 'a left-to-right embedding',
	0x202b: 'a right-to-left embedding',
	0x202c: 'a directional formatting pop',
	0x202d: 'a left-to-right override',
	0x202e: 'a right-to-left override',
	0x2066: 'a left-to-right isolate',
	0x2067: 'a right-to-left isolate',
	0x2068: 'a first-strong isolate',
	0x2069: 'a directional isolate pop'
};

const hex = (code: number) => `U+${code.toString(16).toUpperCase().padStart(4, '0')}`;

/**
 * What is wrong with `text` and where (1-based character position), or null when it may be stored.
 * In a multi-line field CR LF and CR count as line breaks and are allowed.
 */
export function textProblem(text: string, multiline = false): string | null {
	const s = multiline ? text.replace(/\r\n?/g, '\n') : text;
	const m = (multiline ? FORBIDDEN_MULTILINE : FORBIDDEN).exec(s);
	if (!m) return null;
	const code = m[0].charCodeAt(0);
	const position = [...s.slice(0, m.index)].length + 1;
	const name = NAMES[code] ?? (code >= 0xd800 && code <= 0xdfff ? 'a broken character (lone surrogate)' : 'a control character');
	return `Remove ${name} (${hex(code)}) at character ${position}: it would be stored invisibly.`;
}

interface TextOptions {
	/** Message when the (trimmed) field is empty; the field is then required. */
	required?: string;
	/** Fewest characters when not blank (with `required`, default 1). */
	min?: number;
	minMessage?: string;
	/** Line breaks allowed (notes); stored with LF only. */
	multiline?: boolean;
}

/**
 * A trimmed text field of at most `max` characters, refusing control and bidirectional-override
 * characters with a message naming the character and its position.
 */
export function plainText(max: number, options: TextOptions = {}) {
	const min = options.min ?? (options.required ? 1 : 0);
	let base = z.string().trim();
	if (min > 0) base = base.min(min, min === 1 ? (options.required ?? `Use at least ${min} characters.`) : (options.minMessage ?? `Use at least ${min} characters.`));
	base = base.max(max, `Use at most ${max} characters.`);
	const multiline = options.multiline ?? false;
	return base
		.superRefine((value, ctx) => {
			const problem = textProblem(value, multiline);
			if (problem) ctx.addIssue({ code: 'custom', message: problem });
		})
		.transform((value) => (multiline ? value.replace(/\r\n?/g, '\n') : value));
}
