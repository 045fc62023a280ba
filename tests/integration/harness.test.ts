// Checks the test harness itself: every file runs on its own clone of the migrated template
// (tests/integration/setup.ts), and the mail sink stores what the app sends so tests can read it
// back with tests/helpers/mailbox.ts.
import fs from 'node:fs';
import { randomBytes } from 'node:crypto';
import nodemailer from 'nodemailer';
import pg from 'pg';
import { describe, expect, test } from 'vitest';
import { linksIn, mailTo, readMailbox } from '../helpers/mailbox';

async function query<T extends pg.QueryResultRow>(url: string, sql: string): Promise<T[]> {
	const client = new pg.Client({ connectionString: url });
	await client.connect();
	try {
		return (await client.query<T>(sql)).rows;
	} finally {
		await client.end();
	}
}

describe('per-file database', () => {
	test('DATABASE_URL points at a fresh bt_ clone, not at the template', async () => {
		const url = process.env.DATABASE_URL!;
		const name = decodeURIComponent(new URL(url).pathname.slice(1));
		expect(name).toMatch(/^bt_[a-z0-9]+_[0-9a-f]{8}$/);
		expect(name).not.toBe(process.env.TEST_TEMPLATE_DB);
		const [row] = await query<{ db: string }>(url, 'SELECT current_database() AS db');
		expect(row.db).toBe(name);
	});

	test('the clone carries every committed migration', async () => {
		const journal = JSON.parse(fs.readFileSync('drizzle/meta/_journal.json', 'utf8')) as { entries: unknown[] };
		const [row] = await query<{ n: number }>(process.env.DATABASE_URL!, 'SELECT count(*)::int AS n FROM drizzle.__drizzle_migrations');
		expect(journal.entries.length).toBeGreaterThan(0);
		expect(row.n).toBe(journal.entries.length);
	});

	test('the template accepts no connections, so cloning it never finds it busy', async () => {
		const admin = new URL(process.env.TEST_ADMIN_DATABASE_URL!);
		admin.pathname = `/${process.env.TEST_TEMPLATE_DB}`;
		await expect(query(admin.toString(), 'SELECT 1')).rejects.toThrow(/not currently accepting connections/);
	});
});

describe('mail sink', () => {
	const transport = nodemailer.createTransport({
		host: process.env.SMTP_HOST,
		port: Number(process.env.SMTP_PORT),
		secure: false,
		ignoreTLS: true,
		// The sink takes any login; the app may send one in production-like settings.
		auth: { user: 'whoever', pass: 'anything' }
	});

	test('stores a message before acknowledging it, with every recipient and both parts', async () => {
		const tag = randomBytes(5).toString('hex');
		const to = `Pilot.${tag}@example.org`;
		const bcc = `owner.${tag}@example.org`;
		const link = `http://127.0.0.1:4173/invite/${tag}`;
		await transport.sendMail({
			from: 'Burndown test <no-reply@burndown.invalid>',
			to,
			bcc,
			subject: `Harness check ${tag}`,
			text: `Follow ${link}.\nThanks.`,
			html: `<p>Follow <a href="${link}">the link</a>.</p>`
		});

		// No polling: the file exists once sendMail() has resolved.
		const [mail, ...more] = await mailTo(to.toLowerCase());
		expect(more).toHaveLength(0);
		expect(mail.subject).toBe(`Harness check ${tag}`);
		expect(mail.from).toContain('no-reply@burndown.invalid');
		expect(mail.to).toEqual([to, bcc]);
		expect(mail.text).toContain(link);
		expect(mail.html).toContain(`href="${link}"`);
		expect(Math.abs(mail.date.getTime() - Date.now())).toBeLessThan(60_000);
		expect(linksIn(mail)).toEqual([link]);
		expect((await mailTo(bcc)).map((m) => m.id)).toEqual([mail.id]);
	});

	test('a text-only message is stored with html null', async () => {
		const tag = randomBytes(5).toString('hex');
		await transport.sendMail({ from: 'a@example.org', to: `plain.${tag}@example.org`, subject: 'plain', text: 'just text' });
		const [mail] = await mailTo(`plain.${tag}@example.org`);
		expect(mail.html).toBeNull();
		expect(mail.text.trim()).toBe('just text');
		expect((await readMailbox()).some((m) => m.id === mail.id)).toBe(true);
	});
});
