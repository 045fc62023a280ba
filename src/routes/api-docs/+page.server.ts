// The API page: the OpenAPI document, read here so the page renders it (no script needed to read
// it). Public, like the document itself.
import { openApiDocument } from '$lib/server/api/openapi';
import type { PageServerLoad } from './$types';

export const load = (() => ({ doc: openApiDocument() })) satisfies PageServerLoad;
