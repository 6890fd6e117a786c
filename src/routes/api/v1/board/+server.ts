import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { listBoard } from '$lib/server/services/board';
import { boardQuerySchema } from '$lib/validation/board';
import type { RequestHandler } from './$types';

/** One page of the risk board for the signed-in fleet manager or workshop. */
export const GET: RequestHandler = async ({ url }) => {
	const user = requireRole('fleet_manager', 'workshop');
	const query = boardQuerySchema.parse(Object.fromEntries(url.searchParams));
	return json(await listBoard(user, query));
};
