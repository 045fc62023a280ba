// The part of zxcvbn 4's result that src/lib/server/passwords.ts reads (the package ships no types).
declare module 'zxcvbn' {
	interface Match {
		pattern: string;
		token: string;
		dictionary_name?: string;
		rank?: number;
	}
	interface Result {
		score: 0 | 1 | 2 | 3 | 4;
		guesses: number;
		sequence: Match[];
	}
	export default function zxcvbn(password: string, userInputs?: string[]): Result;
}
