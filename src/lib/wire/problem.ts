// What every /api/v1 error answers: an RFC 9457 problem details object (application/problem+json).
// `type` names the kind of problem and points at its description on the API page; field errors go
// in the `errors` extension member, each with the query parameter or form field (`field`) or the
// JSON Pointer into the body (`pointer`, RFC 6901) and what is wrong there.

import { z } from 'zod';

export const PROBLEM_CONTENT_TYPE = 'application/problem+json';

/** The kinds of problem, each with the title it always carries (RFC 9457 §3.1.3). */
export const PROBLEM_TYPES = {
	'invalid-request': 'The request is not valid',
	unauthorized: 'Authentication needed',
	forbidden: 'Not allowed',
	'not-found': 'Not found',
	'method-not-allowed': 'Method not allowed',
	conflict: 'Conflicts with what is stored',
	'too-large': 'Body too large',
	'unsupported-media-type': 'Unsupported media type',
	timeout: 'Body too slow',
	busy: 'Too many at once',
	'rows-rejected': 'Rows of the file or batch are not valid',
	'server-error': 'Something went wrong on our side'
} as const;
export type ProblemType = keyof typeof PROBLEM_TYPES;

/** The `type` URI of a kind: a fragment of the API page, which describes each kind. */
export const problemTypeUri = (kind: ProblemType) => `/api-docs#problem-${kind}`;

/** Every error of the API (RFC 9457); the extension members a case adds are listed beside it. */
export const problemSchema = z.looseObject({
	type: z.string().describe('The kind of problem: a link to its description on the API page.'),
	title: z.string().describe('The same for every problem of the kind.'),
	status: z.number().int().min(400).max(599).describe("The answer's HTTP status."),
	detail: z.string().describe('What went wrong with this request, and what to do.'),
	instance: z.string().optional().describe('The path asked for.'),
	errors: z
		.array(
			z.object({
				field: z.string().optional().describe('A query parameter or form field.'),
				pointer: z.string().optional().describe('A JSON Pointer into the body (RFC 6901).'),
				detail: z.string()
			})
		)
		.optional()
		.describe('What is wrong in each field.')
});
export type Problem = z.infer<typeof problemSchema>;
export type FieldError = NonNullable<Problem['errors']>[number];

/** The JSON Pointer of a zod issue path: ['samples', 3, 'flow'] → /samples/3/flow. */
export function jsonPointer(path: readonly PropertyKey[]): string {
	return path.map((p) => '/' + String(p).replace(/~/g, '~0').replace(/\//g, '~1')).join('');
}
