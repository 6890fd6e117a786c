import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { boardSummary } from '$lib/server/services/board';
import { boardQuerySchema } from '$lib/validation/board';
import type { RequestHandler } from './$types';

/** Counts by status and expected crossings per week ahead, for the same filters. */
export const GET: RequestHandler = async ({ url }) => {
	const user = requireRole('fleet_manager', 'workshop');
	const query = boardQuerySchema.parse(Object.fromEntries(url.searchParams));
	return json(await boardSummary(user, query, new Date()));
};
