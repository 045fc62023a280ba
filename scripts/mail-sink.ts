// A fake SMTP server for development and tests: accepts every message on loopback (any or no
// login), parses it and stores it as one JSON file per message in MAILBOX_DIR, where the app's
// mailbox page and the tests read it. Never relays anything anywhere.
//
//   tsx scripts/mail-sink.ts [--port 2525] [--host 127.0.0.1] [--dir .data/mailbox]
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import type { StoredMessage } from '../src/lib/server/mail/mailbox';


const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const MAX_BYTES = 25 * 1024 * 1024;

const { values } = parseArgs({
	options: {
		port: { type: 'string' },
		host: { type: 'string' },
		dir: { type: 'string' }
	}
});
const port = Number(values.port ?? process.env.SMTP_SINK_PORT ?? 2525);
const host = values.host ?? '127.0.0.1';
const dir = path.resolve(values.dir ?? process.env.MAILBOX_DIR ?? path.join(root, '.data', 'mailbox'));

if (!Number.isInteger(port) || port < 1 || port > 65535) {
	console.error(`mail sink: --port ${values.port ?? process.env.SMTP_SINK_PORT} is not a TCP port number`);
	process.exit(1);
}

function addressText(value: AddressObject | AddressObject[] | undefined): string {
	if (!value) return '';
	return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(', ');
}

/** Ids sort by arrival: milliseconds, then random bytes against two messages in one millisecond. */
function newId(): string {
	return `${Date.now().toString().padStart(15, '0')}-${randomBytes(4).toString('hex')}`;
}

/** Temp file + rename, so a reader never sees half a message. Dot-files are not messages. */
function store(mail: StoredMessage): void {
	fs.mkdirSync(dir, { recursive: true });
	const tmp = path.join(dir, `.${mail.id}.json.tmp`);
	fs.writeFileSync(tmp, `${JSON.stringify(mail, null, '\t')}\n`);
	fs.renameSync(tmp, path.join(dir, `${mail.id}.json`));
}

async function receive(stream: SMTPServerDataStream, session: SMTPServerSession): Promise<StoredMessage> {
	const parsed = await simpleParser(stream);
	if (stream.sizeExceeded) throw Object.assign(new Error('message exceeds the size limit'), { responseCode: 552 });
	const mail: StoredMessage = {
		id: newId(),
		date: new Date().toISOString(),
		from: addressText(parsed.from) || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
		to: session.envelope.rcptTo.map((r) => r.address),
		subject: parsed.subject ?? '',
		text: parsed.text ?? '',
		html: typeof parsed.html === 'string' ? parsed.html : null
	};
	store(mail);
	return mail;
}

const server = new SMTPServer({
	banner: 'Burndown mail sink (stores messages, delivers nothing)',
	authOptional: true,
	allowInsecureAuth: true,
	disabledCommands: ['STARTTLS'],
	size: MAX_BYTES,
	logger: false,
	closeTimeout: 1000,
	onAuth(auth, _session, callback) {
		callback(null, { user: auth.username ?? 'anyone' });
	},
	onData(stream, session, callback) {
		// The reply waits for the file, so once the sender's sendMail() resolves the message is
		// already in the folder: tests can read it without polling.
		receive(stream, session).then(
			(mail) => {
				console.log(`mail sink: ${mail.subject || '(no subject)'} → ${mail.to.join(', ')}`);
				// The links too: a signed-out demo visitor (finishing a sign-up, say) has no mailbox
				// page to read, and whoever runs the sink can read its folder anyway.
				for (const href of mail.text.match(/https?:\/\/[^\s<>"]+/g) ?? []) console.log(`mail sink:   ${href}`);
				callback();
			},
			(error: Error & { responseCode?: number }) => {
				console.error(`mail sink: could not store a message: ${error.message}`);
				if (!error.responseCode) error.responseCode = 451;
				callback(error);
			}
		);
	}
});

server.on('error', (error: NodeJS.ErrnoException) => {
	if (error.code === 'EADDRINUSE') {
		console.error(`mail sink: ${host}:${port} is already in use (another mail sink still running?)`);
		process.exit(1);
	}
	console.error(`mail sink: ${error.message}`);
});

fs.mkdirSync(dir, { recursive: true });
server.listen(port, host, () => {
	console.log(`mail sink: listening on smtp://${host}:${port}, storing messages in ${dir}`);
});

function shutdown(): void {
	server.close(() => process.exit(0));
	setTimeout(() => process.exit(0), 2000).unref();
}
process.on('SIGINT', shutdown);
process.on('SIGTERM', shutdown);

// Started by scripts/start.mjs or scripts/test.mjs: end with them even if they were killed
// outright, so no orphan keeps the port for the next run.
const parentPid = Number(process.env.BURNDOWN_PARENT_PID);
if (parentPid > 0) {
	setInterval(() => {
		try {
			process.kill(parentPid, 0);
		} catch (error) {
			if ((error as NodeJS.ErrnoException).code === 'ESRCH') shutdown();
		}
	}, 1000).unref();
}
