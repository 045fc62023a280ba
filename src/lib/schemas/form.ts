// Turns FormData into a zod-validated object, or field errors plus the user's input to echo back.
import { fail } from '@sveltejs/kit';
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;
export type FormResult<T> =
	| { ok: true; data: T; values: Record<string, string> }
	| { ok: false; errors: FieldErrors; values: Record<string, string> };

export function formValues(form: FormData): Record<string, string> {
	const values: Record<string, string> = {};
	for (const [k, v] of form.entries()) if (typeof v === 'string') values[k] = v;
	return values;
}

export function parseForm<S extends z.ZodType>(schema: S, form: FormData): FormResult<z.output<S>> {
	const values = formValues(form);
	// PostgreSQL text cannot hold a NUL byte; refused here for every field, whatever its schema,
	// so it never reaches a query (where it would fail as a server error).
	const nul = nulErrors(values);
	if (nul) return { ok: false, errors: nul, values: stripNul(values) };
	const result = schema.safeParse(values);
	if (result.success) return { ok: true, data: result.data, values };
	return { ok: false, errors: fieldErrors(result.error), values };
}

function nulErrors(values: Record<string, string>): FieldErrors | null {
	let errors: FieldErrors | null = null;
	for (const [k, v] of Object.entries(values)) {
		const at = v.indexOf('\u0000');
		if (at !== -1) (errors ??= {})[k] = `Remove the NUL byte (U+0000) at character ${[...v.slice(0, at)].length + 1}.`;
	}
	return errors;
}

/** The input echoed back without its NUL bytes, so the page can show it. */
const stripNul = (values: Record<string, string>) => Object.fromEntries(Object.entries(values).map(([k, v]) => [k, v.replaceAll('\u0000', '')]));

export function fieldErrors(error: z.ZodError): FieldErrors {
	const errors: FieldErrors = {};
	for (const issue of error.issues) {
		const key = issue.path.join('.') || 'form';
		errors[key] ??= issue.message;
	}
	return errors;
}

/** Passwords are never echoed back into a form. */
export function withoutSecrets(values: Record<string, string>): Record<string, string> {
	const { password: _p, confirm: _c, ...rest } = values;
	return rest;
}

/** The one shape every failed form action answers with, so pages read errors the same way. */
export function failForm(status: number, errors: FieldErrors, values: Record<string, string>, action?: string) {
	return fail(status, { action, errors, values });
}
