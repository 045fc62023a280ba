// New passwords (sign-up, reset) are checked against zxcvbn's bundled list of the most common
// passwords (about 30,000, with case, reversal and l33t variants), offline. OWASP ASVS 5.0 V6.2.4
// (from memory) asks for at least the top 3,000; V6.2.5 forbids composition rules, so length and
// this check are all we ask. zxcvbn runs on the server only: its lists weigh about 800 kB.
import zxcvbn from 'zxcvbn';

export const COMMON_PASSWORD_MESSAGE = 'This is one of the most common passwords, the first ones guessed. Choose another, e.g. a few unrelated words.';

/** Why a new password is refused, or null when it may be used. */
export function commonPasswordError(password: string): string | null {
	const result = zxcvbn(password.slice(0, 128));
	const whole = result.sequence.length === 1 ? result.sequence[0] : null;
	const listed = whole?.pattern === 'dictionary' && whole.dictionary_name === 'passwords';
	// Score 0 is "too guessable" (fewer than 10^3 guesses): a listed password, or one like it.
	return listed || result.score === 0 ? COMMON_PASSWORD_MESSAGE : null;
}
