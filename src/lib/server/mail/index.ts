// Every e-mail Burndown sends goes through here (nodemailer over SMTP). In development and tests
// SMTP points at the local sink (scripts/mail-sink.ts); in production at the SMTP_* servers.
import nodemailer, { type Transporter } from 'nodemailer';
import { serverConfig } from '../config';

let transport: Transporter | undefined;

function transporter(): Transporter {
	const c = serverConfig();
	transport ??= nodemailer.createTransport({
		host: c.SMTP_HOST,
		port: c.SMTP_PORT,
		secure: c.SMTP_SECURE,
		auth: c.SMTP_USER ? { user: c.SMTP_USER, pass: c.SMTP_PASS ?? '' } : undefined,
		// The local sink speaks plain SMTP on loopback; a real server negotiates STARTTLS.
		ignoreTLS: !c.SMTP_USER && c.SMTP_HOST === '127.0.0.1'
	});
	return transport;
}

export interface Message {
	to: string;
	subject: string;
	text: string;
	html?: string;
}

export async function sendMail(message: Message): Promise<void> {
	await transporter().sendMail({
		from: serverConfig().MAIL_FROM,
		...message
	});
}

/** Absolute link for e-mails, from ORIGIN (adapter-node's setting) or the request's origin. */
export function link(path: string, fallbackOrigin?: string): string {
	return new URL(path, serverConfig().ORIGIN ?? fallbackOrigin ?? 'http://127.0.0.1:5180').toString();
}

const pending = new Set<Promise<void>>();

/**
 * Runs work (look-ups, writes, sending) after the caller has answered, so a response takes the
 * same time whether or not there was anything to send. Failures are logged, never thrown.
 */
export function inBackground(label: string, work: () => Promise<void>): void {
	const task: Promise<void> = new Promise<void>((resolve) => setImmediate(resolve))
		.then(work)
		.catch((error) => console.error(`[mail] ${label} failed:`, error))
		.finally(() => pending.delete(task));
	pending.add(task);
}

/** Resolves once every background task started so far (and any they started) has finished. */
export async function backgroundSettled(): Promise<void> {
	while (pending.size > 0) await Promise.allSettled([...pending]);
}

/**
 * Words someone else chose (a name, an organisation's name) as they may appear in a message we
 * send: one line of plain text, control and format characters gone, at most `max` characters.
 */
export function plainLine(value: string, max = 60): string {
	const flat = value
		.replace(/[\p{Cc}\p{Cf}\p{Zl}\p{Zp}]+/gu, ' ')
		.replace(/\s+/g, ' ')
		.trim();
	const chars = [...flat];
	return chars.length <= max ? flat : chars.slice(0, max - 1).join('').trimEnd() + '…';
}
