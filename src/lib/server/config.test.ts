import { describe, expect, it } from 'vitest';
import { serverConfig } from './config';

describe('serverConfig', () => {
	it('gives the documented defaults for an empty environment (DEVELOPERS.md, Configuration)', () => {
		const c = serverConfig({});
		expect(c).toMatchObject({ DATABASE_POOL_MAX: 10, SMTP_HOST: '127.0.0.1', SMTP_PORT: 2525, SMTP_SECURE: false, MAIL_FROM: 'Burndown <no-reply@burndown.invalid>', BURNDOWN_DEMO: false });
		expect(c.ORIGIN).toBeUndefined();
	});
	it('reads an empty variable as unset, and types what is set', () => {
		const c = serverConfig({ SMTP_PORT: '', SMTP_USER: '', DATABASE_POOL_MAX: '4', SMTP_SECURE: 'true', BURNDOWN_DEMO: '1' });
		expect(c.SMTP_PORT).toBe(2525);
		expect(c.SMTP_USER).toBeUndefined();
		expect(c.DATABASE_POOL_MAX).toBe(4);
		expect(c.SMTP_SECURE).toBe(true);
		expect(c.BURNDOWN_DEMO).toBe(true);
		expect(serverConfig({ BURNDOWN_DEMO: 'yes' }).BURNDOWN_DEMO).toBe(false);
	});
	it('refuses a value that does not parse, naming the variable', () => {
		expect(() => serverConfig({ SMTP_PORT: 'twenty' })).toThrow(/SMTP_PORT/);
		expect(() => serverConfig({ DATABASE_POOL_MAX: '0' })).toThrow(/DATABASE_POOL_MAX/);
	});
});
