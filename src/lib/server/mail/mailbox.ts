// Reads the local SMTP sink's folder for the development/demo mailbox page. Never enabled in
// production: only when BURNDOWN_DEMO=1 and MAILBOX_DIR is set. The page shows a signed-in user
// only their own messages: the sink also holds everyone's reset and invitation links.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { demoMode, serverConfig } from '../config';

/** One message as scripts/mail-sink.ts stores it (one JSON file each); tests read the same files. */
export interface StoredMessage {
	id: string;
	/** When the sink received it (ISO 8601, UTC). */
	date: string;
	from: string;
	/** Envelope recipients: everyone it was delivered to, Bcc included. */
	to: string[];
	subject: string;
	text: string;
	html: string | null;
}

export const mailboxEnabled = () => demoMode() && !!serverConfig().MAILBOX_DIR;

/** The newest messages delivered to `address` (compared without regard to case). */
export async function listMailboxFor(address: string, limit = 100): Promise<StoredMessage[]> {
	const wanted = address.toLowerCase();
	return (await listMailbox()).filter((m) => m.to.some((t) => t.toLowerCase() === wanted)).slice(0, limit);
}

async function listMailbox(): Promise<StoredMessage[]> {
	const dir = serverConfig().MAILBOX_DIR;
	if (!dir) return [];
	let names: string[];
	try {
		names = (await readdir(dir)).filter((n) => n.endsWith('.json'));
	} catch {
		return [];
	}
	const messages = await Promise.all(
		names.map(async (n) => {
			try {
				return JSON.parse(await readFile(join(dir, n), 'utf8')) as StoredMessage;
			} catch {
				return null;
			}
		})
	);
	return messages
		.filter((m): m is StoredMessage => m !== null)
		.sort((a, b) => b.date.localeCompare(a.date));
}
