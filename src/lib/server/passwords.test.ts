// The common-password check (OWASP ASVS 5.0 V6.2.4, from memory: at least the top 3,000 refused).
import { describe, expect, it } from 'vitest';
import { commonPasswordError } from './passwords';

describe('commonPasswordError', () => {
	it.each(['password', '12345678', 'Password1', 'p@ssw0rd', 'qwertyuiop', 'iloveyou', 'drowssap', 'aaaaaaaa'])('refuses %j', (pw) => {
		expect(commonPasswordError(pw)).toMatch(/common/);
	});

	it.each(['a good passphrase', 'burndown-demo', 'correct horse battery staple', 'first passphrase here', 'x'.repeat(128)])('accepts %j', (pw) => {
		expect(commonPasswordError(pw)).toBeNull();
	});
});
