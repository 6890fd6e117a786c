import { requireRole } from '$lib/server/auth/guards';
import { boardSummary, listBoard, visibleDepots } from '$lib/server/services/board';
import { boardQuerySchema } from '$lib/validation/board';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('fleet_manager');
	const query = boardQuerySchema.parse(Object.fromEntries(url.searchParams));
	const [board, summary, depots] = await Promise.all([
		listBoard(user, query),
		boardSummary(user, query, new Date()),
		visibleDepots(user)
	]);
	return { board, summary, depots, params: url.searchParams.toString() };
};
