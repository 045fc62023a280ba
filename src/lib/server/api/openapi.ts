// The OpenAPI 3.1 document of /api/v1, generated from the zod schemas the endpoints parse with and
// answer in (zod 4's JSON Schema output, draft 2020-12, which OpenAPI 3.1 uses as it is). The
// paths and their words are written here; every shape comes from a schema, so the document
// cannot describe a field the code does not have. Served at /api/v1/openapi.json, shown at /api-docs.
import { z } from 'zod';
import { aircraftListQuerySchema, aircraftPageSchema, flightListApiQuerySchema, flightPageSchema } from '$lib/schemas/api';
import { exportQuerySchema, samplesQuerySchema } from '$lib/schemas/flight';
import { PROBLEM_CONTENT_TYPE, PROBLEM_TYPES, problemSchema, problemTypeUri } from '$lib/wire/problem';
import { BINARY_CONTENT_TYPE } from '$lib/wire/replay';
import { uploadDuplicateSchema, uploadRefusalSchema, uploadStoredSchema } from '$lib/wire/upload';
import { closeSchema, jsonBatchSchema, openSchema } from '../live/batch';
import { uploadFieldsSchema } from '../ingest/request';

type Json = Record<string, unknown>;

/** A zod schema as a JSON Schema for the document: request side ('input') or answer side ('output'). */
function jsonSchema(schema: z.ZodType, io: 'input' | 'output'): Json {
	const out = z.toJSONSchema(schema, { io, unrepresentable: 'any', target: 'draft-2020-12' }) as Json;
	delete out.$schema;
	return out;
}

/** The properties of a query-string object schema as OpenAPI query parameters. */
function queryParameters(schema: z.ZodObject): Json[] {
	const js = jsonSchema(schema, 'input') as { properties: Record<string, Json>; required?: string[] };
	return Object.entries(js.properties).map(([name, s]) => {
		const { description, ...rest } = s;
		return { name, in: 'query', required: js.required?.includes(name) ?? false, ...(description ? { description } : {}), schema: rest };
	});
}

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const problems = (...statuses: number[]) =>
	Object.fromEntries(statuses.map((s) => [String(s), { $ref: `#/components/responses/Problem${s}` }]));
const STATUS_WORDS: Record<number, string> = {
	400: 'The request is not valid: `errors` names each field.',
	401: 'No valid credential (WWW-Authenticate names the scheme); an expired token says so.',
	403: "The role or the token's scope does not allow it.",
	404: 'Not found, or not in your organisations.',
	409: 'Conflicts with what is stored.',
	413: 'Body too large.',
	415: 'Unsupported media type.',
	429: 'Too many at once: wait Retry-After seconds.'
};
const idParameter = { name: 'id', in: 'path', required: true, schema: { type: 'string', format: 'uuid' }, description: "The flight's id." };
const json = (schema: Json) => ({ 'application/json': { schema } });

export function openApiDocument(): Json {
	const paths: Record<string, Json> = {
		'/api/v1/aircraft': {
			get: {
				operationId: 'listAircraft',
				summary: 'The aircraft of your organisations',
				description: 'By registration, a page at a time: follow `next` (or the Link header) until it is null.',
				security: [{ apiToken: [] }, { session: [] }],
				parameters: queryParameters(aircraftListQuerySchema),
				responses: { '200': { description: 'One page.', content: json(ref('AircraftPage')) }, ...problems(400, 401, 404) }
			}
		},
		'/api/v1/flights': {
			get: {
				operationId: 'listFlights',
				summary: 'The flights you may view',
				description: 'Newest engine start first, across your organisations (or one), never the trash; a page at a time.',
				security: [{ apiToken: [] }, { session: [] }],
				parameters: queryParameters(flightListApiQuerySchema),
				responses: { '200': { description: 'One page.', content: json(ref('FlightPage')) }, ...problems(400, 401, 404) }
			},
			post: {
				operationId: 'uploadFlight',
				summary: 'Upload a recorder file',
				description:
					'multipart/form-data with the fields before the file (field `file`), or the file as text/csv with the fields in the query string. Needs a token with the scope "read and upload" and a role that uploads. With Accept: application/x-ndjson the answer is progress lines, then a result line `{ kind: "result", httpStatus, answer }`.',
				security: [{ apiToken: ['upload'] }, { session: [] }],
				parameters: queryParameters(uploadFieldsSchema).map((p) => ({ ...p, description: `${p.description ?? ''} (text/csv uploads; a form field otherwise)`.trim() })),
				requestBody: {
					required: true,
					content: {
						'multipart/form-data': { schema: { type: 'object', properties: { ...(jsonSchema(uploadFieldsSchema, 'input').properties as Json), file: { type: 'string', contentMediaType: 'text/csv' } }, required: ['aircraftId', 'file'] } },
						'text/csv': { schema: { type: 'string' } }
					}
				},
				responses: {
					'201': { description: 'Stored.', content: json(ref('UploadStored')) },
					'200': { description: 'This file was uploaded for this aircraft before: that flight.', content: json(ref('UploadDuplicate')) },
					...Object.fromEntries(
						[400, 401, 403, 404, 408, 409, 413, 429].map((s) => [String(s), { description: `${STATUS_WORDS[s] ?? 'The body stalled or arrived too slowly.'} \`outcome\` names the case.`, content: { [PROBLEM_CONTENT_TYPE]: { schema: ref('UploadRefusal') } } }])
					)
				}
			}
		},
		'/api/v1/flights/{id}/samples': {
			get: {
				operationId: 'flightSamples',
				summary: "A flight's samples in columns, with its fuel setup",
				security: [{ apiToken: [] }, { session: [] }],
				parameters: [idParameter, ...queryParameters(samplesQuerySchema)],
				responses: {
					'200': {
						description: 'JSON arrays (times as ms after t0Ms), or the binary Float64 layout.',
						content: { 'application/json': { schema: { type: 'object' } }, [BINARY_CONTENT_TYPE]: { schema: { type: 'string', contentMediaType: BINARY_CONTENT_TYPE } } }
					},
					...problems(400, 401, 404)
				}
			}
		},
		'/api/v1/flights/{id}/export': {
			get: {
				operationId: 'flightExport',
				summary: "A flight's computed fuel log or summary",
				description: 'CSV (or JSON for the summary) in the fuel unit asked for, else the aircraft\'s display unit; the unit is named in every column or field.',
				security: [{ apiToken: [] }, { session: [] }],
				parameters: [idParameter, ...queryParameters(exportQuerySchema)],
				responses: {
					'200': { description: 'The export, as an attachment.', content: { 'text/csv': { schema: { type: 'string' } }, 'application/json': { schema: { type: 'object' } } } },
					...problems(400, 401, 404, 429)
				}
			}
		},
		'/api/v1/flights/{id}/stream': {
			get: {
				operationId: 'flightStream',
				summary: "A live flight's server-sent events",
				security: [{ apiToken: [] }, { session: [] }],
				parameters: [idParameter, { name: 'after', in: 'query', required: false, schema: { type: 'integer', minimum: -1 }, description: 'The last sequence number held: resume right after it.' }],
				responses: { '200': { description: 'text/event-stream: hello, meta, samples, end.', content: { 'text/event-stream': { schema: { type: 'string' } } } }, ...problems(401, 403, 404) }
			},
			post: {
				operationId: 'flightStreamPost',
				summary: 'The same stream, for clients that connect by POST',
				security: [{ apiToken: [] }, { session: [] }],
				parameters: [idParameter],
				responses: { '200': { description: 'text/event-stream.', content: { 'text/event-stream': { schema: { type: 'string' } } } }, ...problems(401, 403, 404) }
			}
		},
		'/api/v1/live/open': {
			post: {
				operationId: 'recorderOpen',
				summary: 'A recorder starts a flight',
				security: [{ recorderToken: [] }],
				requestBody: { content: json(jsonSchema(openSchema, 'input')) },
				responses: { '201': { description: 'The flight opened: { flightId, firstSeq, declarationConfirmed, closedFlightId }.', content: json({ type: 'object' }) }, ...problems(400, 401, 409, 413) }
			}
		},
		'/api/v1/live/samples': {
			post: {
				operationId: 'recorderSamples',
				summary: "A recorder's batch of samples",
				description: 'JSON, or text/csv lines of the recorder format with a seq column (flightId and firstSeq in the query string). Nothing of a batch with a problem is stored.',
				security: [{ recorderToken: [] }],
				requestBody: { content: { ...json(jsonSchema(jsonBatchSchema, 'input')), 'text/csv': { schema: { type: 'string' } } } },
				responses: { '200': { description: 'The acknowledgement: what is stored.', content: json({ type: 'object' }) }, ...problems(400, 401, 409, 413, 415) }
			}
		},
		'/api/v1/live/close': {
			post: {
				operationId: 'recorderClose',
				summary: 'A recorder ends its flight',
				security: [{ recorderToken: [] }],
				requestBody: { content: json(jsonSchema(closeSchema, 'input')) },
				responses: { '200': { description: '{ flightId, closed }.', content: json({ type: 'object' }) }, ...problems(400, 401, 409) }
			}
		},
		'/api/v1/openapi.json': {
			get: {
				operationId: 'openApi',
				summary: 'This document',
				security: [],
				responses: { '200': { description: 'OpenAPI 3.1.', content: json({ type: 'object' }) } }
			}
		}
	};

	return {
		openapi: '3.1.0',
		info: {
			title: 'Burndown API',
			version: '1',
			description:
				'Read aircraft and flights, upload recorder files, follow live flights. Errors are RFC 9457 problems (application/problem+json). Burndown is advisory: never a substitute for checking the tanks, the flight manual or the pilot in command\'s judgement.'
		},
		servers: [{ url: '/' }],
		paths,
		components: {
			securitySchemes: {
				apiToken: { type: 'http', scheme: 'bearer', description: 'A personal API token (bdk_…) from the account page; scope "read" or "read and upload", optionally expiring.' },
				session: { type: 'apiKey', in: 'cookie', name: 'burndown_session', description: 'The browser session; writes must come from the same origin.' },
				recorderToken: { type: 'http', scheme: 'bearer', description: "A recorder's token (bdr_…), for /api/v1/live/* only." }
			},
			schemas: {
				Problem: jsonSchema(problemSchema, 'output'),
				AircraftPage: jsonSchema(aircraftPageSchema, 'output'),
				FlightPage: jsonSchema(flightPageSchema, 'output'),
				UploadStored: jsonSchema(uploadStoredSchema, 'output'),
				UploadDuplicate: jsonSchema(uploadDuplicateSchema, 'output'),
				UploadRefusal: jsonSchema(uploadRefusalSchema, 'output')
			},
			responses: Object.fromEntries(Object.entries(STATUS_WORDS).map(([s, description]) => [`Problem${s}`, { description, content: { [PROBLEM_CONTENT_TYPE]: { schema: ref('Problem') } } }]))
		},
		'x-problem-types': Object.entries(PROBLEM_TYPES).map(([kind, title]) => ({ type: problemTypeUri(kind as keyof typeof PROBLEM_TYPES), title }))
	};
}
