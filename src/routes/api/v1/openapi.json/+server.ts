import { json } from '@sveltejs/kit';
import { openApiDocument } from '$lib/server/http/openapi';
import type { RequestHandler } from './$types';

// Public on purpose (listed in tests/unit/guard-coverage.test.ts): integrators read it before they have a token.
export const GET: RequestHandler = ({ url }) =>
	json(openApiDocument(url.origin), { headers: { 'cache-control': 'public, max-age=300' } });
