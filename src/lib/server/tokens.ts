// Random secrets shown once (invitations, password resets, recorder and API tokens), stored only
// as SHA-256 hashes so a database leak does not leak usable tokens.
import { createHash, randomBytes } from 'node:crypto';

export function newToken(prefix = ''): string {
	return prefix + randomBytes(24).toString('base64url');
}

export function hashToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}
