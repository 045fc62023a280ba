// Sign-up, sign-in and password-reset fields; preferences and new API tokens on the account page.
import { z } from 'zod';
import { API_TOKEN_SCOPES } from '$lib/permissions';
import { isTimeZone } from '$lib/format/time';
import { fuelUnits } from '$lib/units';
import { plainText } from './text';

// NIST SP 800-63B: at least 8 characters, and allow at least 64.
export const password = z
	.string()
	.min(8, 'Use at least 8 characters.')
	.max(128, 'Use at most 128 characters.');

export const email = z
	.string()
	.trim()
	.toLowerCase()
	.pipe(z.email('Enter an e-mail address like name@example.org.'));

export const signUpSchema = z.object({
	name: plainText(100, { required: 'Enter your name.' }),
	email,
	password
});

export const signInSchema = z.object({
	email,
	password: z.string().min(1, 'Enter your password.').max(128, 'Use at most 128 characters.')
});

export const resetRequestSchema = z.object({ email });

export const resetPasswordSchema = z
	.object({ password, confirm: z.string() })
	.refine((v) => v.password === v.confirm, { message: 'The two passwords differ.', path: ['confirm'] });

export const changePasswordSchema = z
	.object({ current: z.string().min(1, 'Enter your current password.').max(128, 'Use at most 128 characters.'), password, confirm: z.string() })
	.refine((v) => v.password === v.confirm, { message: 'The two passwords differ.', path: ['confirm'] });

export const preferencesSchema = z.object({
	prefFuelUnit: z.enum(['', ...fuelUnits]).transform((v) => (v === '' ? null : v)),
	// An IANA zone the platform knows (Intl.supportedValuesOf), or '' for the browser's own zone.
	timeZone: z
		.string()
		.max(64, 'Choose a time zone from the list.')
		.default('')
		.refine((v) => v === '' || isTimeZone(v), 'Choose a time zone from the list.')
		.transform((v) => (v === '' ? null : v))
});

/** How long a new API token lasts, in days; '' for until revoked. */
export const API_TOKEN_LIFETIMES_DAYS = [7, 30, 90, 365] as const;

export const apiTokenSchema = z.object({
	name: plainText(60, { required: 'Name the token, e.g. "upload script".' }),
	scope: z.enum(API_TOKEN_SCOPES, 'Choose what the token may do.'),
	expiresInDays: z
		.enum(['', ...API_TOKEN_LIFETIMES_DAYS.map(String)], 'Choose how long the token lasts.')
		.transform((v) => (v === '' ? null : Number(v)))
});
