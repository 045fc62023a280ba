// GET /api/v1/openapi.json: the OpenAPI 3.1 document of the API, generated from its zod schemas
// (lib/server/api/openapi.ts). Public: it describes the API, it holds no data.
import { json } from '@sveltejs/kit';
import { openApiDocument } from '$lib/server/api/openapi';
import type { RequestHandler } from './$types';

let document: ReturnType<typeof openApiDocument> | null = null;

export const GET: RequestHandler = () => json((document ??= openApiDocument()));
