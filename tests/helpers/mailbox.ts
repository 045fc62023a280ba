// Reads the messages the test mail sink (scripts/mail-sink.ts) stored in MAILBOX_DIR, for tests
// that follow an invitation or password-reset e-mail, and pulls the links out of them.
import fs from 'node:fs/promises';
import path from 'node:path';

export interface Mail {
	id: string;
	date: Date;
	from: string;
	to: string[];
	subject: string;
	text: string;
	html: string | null;
}

function mailboxDir(dir?: string): string {
	const resolved = dir ?? process.env.MAILBOX_DIR;
	if (!resolved) throw new Error('MAILBOX_DIR is not set (npm test sets it for the test mail sink)');
	return resolved;
}

/** Every stored message, oldest first. Dot-files are the sink's half-written temporaries. */
export async function readMailbox(dir?: string): Promise<Mail[]> {
	const folder = mailboxDir(dir);
	let names: string[];
	try {
		names = await fs.readdir(folder);
	} catch (error) {
		if ((error as NodeJS.ErrnoException).code === 'ENOENT') return [];
		throw error;
	}
	const mails: Mail[] = [];
	for (const name of names.filter((n) => n.endsWith('.json') && !n.startsWith('.')).sort()) {
		const raw = JSON.parse(await fs.readFile(path.join(folder, name), 'utf8'));
		mails.push({ ...raw, date: new Date(raw.date) });
	}
	return mails.sort((a, b) => a.date.getTime() - b.date.getTime() || a.id.localeCompare(b.id));
}

/** Messages delivered to `address` (compared without regard to case), oldest first. */
export async function mailTo(address: string, dir?: string): Promise<Mail[]> {
	const wanted = address.toLowerCase();
	return (await readMailbox(dir)).filter((m) => m.to.some((t) => t.toLowerCase() === wanted));
}

/**
 * Waits for the newest message to `address` that matches `predicate`, polling the folder. The
 * sink stores a message before it acknowledges it, so this is for mail the app sends in the
 * background (after a response), not right after an awaited send.
 */
export async function waitForMail(
	address: string,
	{ predicate = () => true, timeoutMs = 10_000, dir }: { predicate?: (m: Mail) => boolean; timeoutMs?: number; dir?: string } = {}
): Promise<Mail> {
	const deadline = Date.now() + timeoutMs;
	for (;;) {
		const found = (await mailTo(address, dir)).filter(predicate).at(-1);
		if (found) return found;
		if (Date.now() > deadline) throw new Error(`no mail to ${address} within ${timeoutMs} ms`);
		await new Promise((r) => setTimeout(r, 100));
	}
}

/** The http(s) links in a message's text part, in order, trailing punctuation removed. */
export function linksIn(mail: Pick<Mail, 'text'>): string[] {
	return (mail.text.match(/https?:\/\/[^\s<>"')\]]+/g) ?? []).map((link) => link.replace(/[.,;:!?]+$/, ''));
}
