// Property tests over every form schema, through parseForm as the actions call it: whatever a
// browser or a script posts, parsing never throws, and what it lets through holds no NUL byte,
// no control or override character in a name, and no number that is not finite.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { z } from 'zod';
import { parseForm } from './form';
import { preferencesSchema, resetPasswordSchema, resetRequestSchema, signInSchema, signUpSchema } from './account';
import { aircraftFormSchema } from './aircraft';
import { handFactorsFormSchema, receiptFormSchema } from './pump';
import { declarationFormSchema, exportQuerySchema, flightListQuerySchema, fuelEventFormSchema, idFormSchema, noteFormSchema, samplesQuerySchema } from './flight';
import { invitationSchema, memberRemoveSchema, memberRoleSchema, organisationSchema } from './organisation';
import { textProblem } from './text';
import { formOf, hostileText } from '../../../tests/helpers/hostile';

/** Every string and number in a parsed value, however deep. */
function leaves(v: unknown, out: { strings: string[]; numbers: number[] } = { strings: [], numbers: [] }) {
	if (typeof v === 'string') out.strings.push(v);
	else if (typeof v === 'number') out.numbers.push(v);
	else if (v && typeof v === 'object' && !(v instanceof Date)) for (const x of Object.values(v)) leaves(x, out);
	return out;
}

const SCHEMAS: [string, z.ZodType, string[], string[]][] = [
	// name, schema, its fields, the fields that are names/titles/notes (text rule applies)
	['sign-up', signUpSchema, ['name', 'email', 'password'], ['name']],
	['sign-in', signInSchema, ['email', 'password'], []],
	['reset request', resetRequestSchema, ['email'], []],
	['reset password', resetPasswordSchema, ['password', 'confirm'], []],
	['preferences', preferencesSchema, ['prefFuelUnit', 'timeZone'], []],
	['organisation', organisationSchema, ['name'], ['name']],
	['invitation', invitationSchema, ['email', 'role'], []],
	['member role', memberRoleSchema, ['userId', 'role'], []],
	['member remove', memberRemoveSchema, ['userId'], []],
	['aircraft', aircraftFormSchema, ['registration', 'type', 'engine', 'fuelType', 'densityKgPerL', 'displayUnit', 'capacity', 'lowerLevel', 'unusable', 'meterFactor', 'kFactor', 'lowFuel', 'lowEnduranceMin', 'reserveRule', 'reserveCustomMin', 'baselineCruise'], ['type', 'engine']],
	['pump receipt', receiptFormSchema(0.719), ['at', 'airfield', 'amount', 'unit', 'full', 'note'], ['note']],
	['factors by hand', handFactorsFormSchema, ['meterFactor', 'kFactor', 'inForceFrom', 'note'], ['note']],
	['declaration', declarationFormSchema(0.72), ['kind', 'amount', 'unit', 'previous'], []],
	['fuel event', fuelEventFormSchema(0.72), ['kind', 'amount', 'unit', 'at', 'note'], ['note']],
	['id', idFormSchema, ['id'], []],
	['note', noteFormSchema, ['body', 'at'], []],
	['flight list query', flightListQuerySchema, ['aircraft', 'pilot', 'from', 'to', 'sort', 'dir', 'page'], ['pilot']],
	['export query', exportQuerySchema, ['what', 'every', 'unit', 'format'], []],
	['samples query', samplesQuerySchema, ['format'], []]
];

describe('every form schema under arbitrary input', () => {
	for (const [name, schema, fields, textFields] of SCHEMAS)
		it(name, () => {
			fc.assert(
				fc.property(formOf(fields), (form) => {
					const r = parseForm(schema, form);
					if (!r.ok) {
						expect(Object.keys(r.errors).length).toBeGreaterThan(0);
						for (const m of Object.values(r.errors)) expect(typeof m).toBe('string');
						return;
					}
					const { strings, numbers } = leaves(r.data);
					for (const s of strings) expect(s.includes('\u0000'), JSON.stringify(s)).toBe(false);
					for (const n of numbers) expect(Number.isFinite(n)).toBe(true);
					for (const f of textFields) {
						const v = (r.data as Record<string, unknown>)[f];
						if (typeof v === 'string') expect(textProblem(v), `${f}=${JSON.stringify(v)}`).toBeNull();
					}
				}),
				{ numRuns: 300 }
			);
		});

	it('the note body keeps its line breaks but nothing else invisible', () => {
		fc.assert(
			fc.property(hostileText, (body) => {
				const form = new FormData();
				form.set('body', body);
				const r = parseForm(noteFormSchema, form);
				if (r.ok) expect(textProblem(r.data.body, true)).toBeNull();
			}),
			{ numRuns: 500 }
		);
	});
});
